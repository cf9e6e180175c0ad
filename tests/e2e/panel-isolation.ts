// Isolation as a fault-finder does it on the panel, shared by the browser tests that repair a fault:
// off, own lock, the DC bus let down, proved dead live–dead–live; and back on afterwards.
import type { Page } from 'playwright-core'
import { expect } from 'vitest'
import type { PanelDriver } from './panel-driver'

/**
 * Live–dead–live (NFPA 70E 120.5(7)): the meter shown working on the bench's proving unit, on each range
 * the dead test uses (230 V AC and 110 V DC, shared/model/points.ts).
 */
export async function meterProvedOnKnownSource(page: Page, panel: PanelDriver) {
  const reading = () => page.getByTestId('live-meter').textContent()
  await panel.meterMode('acVolts')
  await panel.probe('red', 'prover.ac')
  await panel.probe('black', 'prover.neg')
  await expect.poll(reading).toMatch(/\b2[23]\d(\.\d+)? V/)
  await panel.meterMode('dcVolts')
  await panel.probe('red', 'prover.pos')
  await expect.poll(reading).toMatch(/\b1[01]\d(\.\d+)? V/)
}

/** Off, own lock on, the bus discharged, and proved dead between two proofs of the meter. */
export async function lockedAndProvedDead(page: Page, panel: PanelDriver) {
  await panel.isolateAndDischarge()
  await meterProvedOnKnownSource(page, panel)
  await panel.proveDead()
  await meterProvedOnKnownSource(page, panel)
}

/** Probes back on the meter, own lock off, switched on, until the drive is ready. */
export async function backOn(panel: PanelDriver) {
  await panel.probe('red', null)
  await panel.probe('black', null)
  await panel.removeLock()
  await panel.switchDisconnect('on')
  await panel.waitFor((s) => s.includes('drive ready'))
}
