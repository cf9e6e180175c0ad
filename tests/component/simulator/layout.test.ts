// The panel layout: every terminal of the model contract is on the panel, labelled as the contract says.
import { describe, expect, it } from 'vitest'
import {
  DRIVE_CONTROL_POINTS,
  DRIVE_POWER_POINTS,
  POINT_LABELS,
  PROVER_POINTS,
  controlPointsFor,
} from '@shared/model/points'
import { deviceTerminalLabels, layoutPanel } from '@/simulator/scene/layout'
import type { PanelDevice } from '@/simulator/scene/types'

const devices: PanelDevice[] = [
  { id: 'runSwitch', kind: 'selector', label: 'Run / stop', contact: 'NO' },
  { id: 'raise', kind: 'pushbutton', label: 'Faster', contact: 'NO' },
  { id: 'lower', kind: 'pushbutton', label: 'Slower', contact: 'NC' },
  { id: 'pot', kind: 'potentiometer', label: 'Speed pot' },
]

describe('the panel layout', () => {
  const layout = layoutPanel(devices)

  it('places every drive terminal with the label from the model contract', () => {
    for (const id of [...DRIVE_CONTROL_POINTS, ...DRIVE_POWER_POINTS]) {
      expect(layout.terminals[id]?.label).toBe(POINT_LABELS[id])
    }
  })

  it('places every control-network point of the devices, and only wireable ones take wires', () => {
    for (const id of controlPointsFor(devices)) expect(layout.terminals[id]?.wireable).toBe(true)
    for (const id of DRIVE_POWER_POINTS) expect(layout.terminals[id].wireable).toBe(false)
  })

  it('keeps terminals far enough apart that their labels do not overlap', () => {
    const strip = Object.values(layout.terminals).filter((t) => t.wireable)
    const xs = strip.map((t) => t.x).sort((a, b) => a - b)
    for (let i = 1; i < xs.length; i++) expect(xs[i] - xs[i - 1]).toBeGreaterThanOrEqual(22)
    expect(new Set(strip.map((t) => t.y)).size).toBe(1)
  })

  it('has the meter proving unit: every output the model knows, reachable by a probe, never by a wire', () => {
    const { rect } = layout.prover
    for (const id of PROVER_POINTS) {
      const t = layout.terminals[id]
      expect(t?.wireable).toBe(false)
      expect(t.x).toBeGreaterThan(rect.x)
      expect(t.x).toBeLessThan(rect.x + rect.w)
      expect(t.y).toBeGreaterThan(rect.y)
      expect(t.y).toBeLessThan(rect.y + rect.h)
      expect(t.name).toMatch(/^Meter proving unit terminal/)
    }
    // Clear of the motor's nameplate above it and inside the scene.
    expect(rect.y).toBeGreaterThan(layout.motor.nameplate.y + layout.motor.nameplate.h)
    expect(rect.y + rect.h).toBeLessThanOrEqual(layout.height)
  })

  it('keeps everything inside the scene', () => {
    for (const t of Object.values(layout.terminals)) {
      expect(t.x).toBeGreaterThan(0)
      expect(t.x).toBeLessThan(layout.width)
      expect(t.y).toBeLessThan(layout.height)
    }
  })

  it('marks contact blocks with the IEC 60947-5-1 terminal numbers (NO 13-14, NC 11-12)', () => {
    // IEC 60947-5-1 Annex M terminal marking (clause from memory): function digit 3-4 = NO, 1-2 = NC.
    expect(deviceTerminalLabels(devices[1])).toEqual({ a: '13', b: '14' })
    expect(deviceTerminalLabels(devices[2])).toEqual({ a: '11', b: '12' })
  })
})
