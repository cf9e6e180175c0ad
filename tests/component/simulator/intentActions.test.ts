// What the panel records for an intent. The meter is the apprentice's to set: placing probes never turns
// its selector for them (choosing V AC for line terminals and V DC for the bus is part of proving dead).
import { describe, expect, it } from 'vitest'
import { createSimulation } from '@shared/model'
import { actionsFor } from '@/simulator/scene/intentActions'

const sim = createSimulation({
  devices: [],
  wires: [],
  settings: {},
  power: { on: false, locked: true },
  faults: [],
})

describe('panel intents → recorded actions', () => {
  it('records only the probes when both are placed, whatever the meter is set to', () => {
    const red = { ...sim, meter: { red: 'drive.l1', black: null, mode: 'off' as const } }
    expect(actionsFor({ type: 'probe.place', probe: 'black', point: 'drive.l2' }, red, 'blue')).toEqual([
      { type: 'meter.probes', red: 'drive.l1', black: 'drive.l2' },
    ])
    const onBus = { ...sim, meter: { red: 'drive.dcp', black: null, mode: 'acVolts' as const } }
    expect(actionsFor({ type: 'probe.place', probe: 'black', point: 'drive.dcn' }, onBus, 'blue')).toEqual([
      { type: 'meter.probes', red: 'drive.dcp', black: 'drive.dcn' },
    ])
  })

  it('turns the selector when asked, and records nothing when it is already there', () => {
    expect(actionsFor({ type: 'meter.mode', mode: 'acVolts' }, sim, 'blue')).toEqual([
      { type: 'meter.mode', mode: 'acVolts' },
    ])
    const onAc = { ...sim, meter: { ...sim.meter, mode: 'acVolts' as const } }
    expect(actionsFor({ type: 'meter.mode', mode: 'acVolts' }, onAc, 'blue')).toEqual([])
  })
})
