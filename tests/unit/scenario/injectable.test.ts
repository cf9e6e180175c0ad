// The catalogue an instructor picks from in the live classroom: what is on this bench now, in words, and
// nothing already faulted.
import { describe, expect, it } from 'vitest'
import { applyEvent, createSimulation, type AttemptEvent, type SimState } from '@shared/model'
import { INJECTABLE_GROUPS, injectableFaults, toSimulationSetup } from '@shared/scenario'
import { shippedScenario } from './helpers'

const conveyor = () => createSimulation(toSimulationSetup(shippedScenario('reference-memory')))
const deadFan = () => createSimulation(toSimulationSetup(shippedScenario('dead-control-circuit')))
const run = (s: SimState, events: AttemptEvent[]) => events.reduce(applyEvent, s)
const labels = (s: SimState) => injectableFaults(s).map((f) => f.label)

describe('injectableFaults', () => {
  it('offers each fitted wire by its marker number and ends, each contact, the fuse and each cable conductor', () => {
    const list = injectableFaults(conveyor())
    const wires = list.filter((f) => f.group === INJECTABLE_GROUPS.wiring)
    expect(wires).toHaveLength(7)
    // wRunOut is the third wire fitted: marker W3, from the run switch's 14 to DI1.
    expect(wires[2]).toEqual({
      fault: { kind: 'brokenWire', wireId: 'wRunOut' },
      label: 'Break wire W3 (Conveyor run / stop terminal 14 to DI1)',
      group: 'Wiring',
    })
    const devices = list.filter((f) => f.group === INJECTABLE_GROUPS.devices)
    expect(devices.map((f) => f.fault.kind)).toEqual([
      ...['contactFailedOpen', 'contactWelded', 'wrongContactType'],
      ...['contactFailedOpen', 'contactWelded', 'wrongContactType'],
      ...['contactFailedOpen', 'contactWelded', 'wrongContactType'],
    ])
    expect(devices[2].label).toBe(
      'Fit a wrong contact block: Conveyor run / stop, contact 13–14 (labelled normally open, works normally closed)',
    )
    expect(list.filter((f) => f.group === INJECTABLE_GROUPS.supply).map((f) => f.label)).toEqual([
      'Blow the control fuse',
    ])
    expect(list.filter((f) => f.group === INJECTABLE_GROUPS.motorCable).map((f) => f.label)).toEqual([
      'Break conductor U inside the motor cable',
      'Break conductor V inside the motor cable',
      'Break conductor W inside the motor cable',
    ])
  })

  it('leaves out what is already faulted: the dead fan’s blown fuse and broken W3', () => {
    const list = labels(deadFan())
    expect(list).not.toContain('Blow the control fuse')
    expect(list.some((l) => l.startsWith('Break wire W3'))).toBe(false)
    expect(list.some((l) => l.startsWith('Break wire W2'))).toBe(true)
  })

  it('follows the bench as it is now: a wire removed is gone, a wire added appears with its new number', () => {
    const s = run(conveyor(), [
      { t: 0, type: 'power.off' },
      { t: 100, type: 'wire.removed', id: 'wLowerOut' },
      { t: 200, type: 'wire.added', id: 'w9', from: 'drive.p24', to: 'drive.di4', colour: 'blue' },
    ])
    const wires = injectableFaults(s).filter((f) => f.group === INJECTABLE_GROUPS.wiring)
    expect(wires.map((f) => f.fault)).not.toContainEqual({ kind: 'brokenWire', wireId: 'wLowerOut' })
    expect(wires.at(-1)?.label).toBe('Break wire W9 (+24 to DI4)')
  })

  it('drops an injected fault from the list once it is in, and offers it again after the repair', () => {
    const by = { id: '00000000-0000-4000-8000-000000000001', name: 'Rhoswen Tally' }
    const injected = run(conveyor(), [
      {
        t: 1000,
        type: 'fault.injected',
        injectionId: '00000000-0000-4000-8000-000000000002',
        fault: { kind: 'contactWelded', device: 'raiseButton' },
        by,
      },
    ])
    const kinds = injectableFaults(injected)
      .filter((f) => 'device' in f.fault && f.fault.device === 'raiseButton')
      .map((f) => f.fault.kind)
    expect(kinds).toEqual([])
    const repaired = run(injected, [
      { t: 2000, type: 'power.off' },
      { t: 3000, type: 'device.contactFitted', device: 'raiseButton', contact: 'NO' },
    ])
    expect(
      injectableFaults(repaired).filter((f) => 'device' in f.fault && f.fault.device === 'raiseButton'),
    ).toHaveLength(3)
  })

  it('never shows an internal id in a label', () => {
    for (const s of [conveyor(), deadFan()]) {
      for (const { label } of injectableFaults(s)) {
        expect(label).not.toMatch(/wRun|wRaise|wLower|wCom|raiseButton|runSwitch|drive\.|motorConductor/)
      }
    }
  })
})
