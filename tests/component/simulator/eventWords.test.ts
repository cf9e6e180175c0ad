// Every attempt event reads in plain words, naming things as the panel shows them; no internal id.
import { describe, expect, it } from 'vitest'
import { attemptEventSchema, type AttemptEvent } from '@shared/model/events'
import { scenarioSchema } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import { eventWords } from '@/simulator/scene/eventWords'
import { layoutPanel } from '@/simulator/scene/layout'
import reference from '../../fixtures/attempts/raise-lower-commissioning--reference.json'

const scenario = scenarioSchema.parse(scenarioFile)
const layout = layoutPanel(scenario.start.devices)

describe('events in plain words', () => {
  it('names wires, terminals and probes as the panel does', () => {
    const words = (e: AttemptEvent) => eventWords(e, layout)
    expect(
      words({ t: 0, type: 'wire.added', id: 'w4', from: 'runSwitch.b', to: 'drive.di1', colour: 'blue' }),
    ).toBe('Wire W4 BU added from Infeed run / stop 14 to DI1')
    expect(words({ t: 0, type: 'wire.removed', id: 'w4' })).toBe('Wire W4 removed')
    expect(words({ t: 0, type: 'meter.probes', red: 'drive.di1', black: 'drive.dcom' })).toBe(
      'Meter probes on DI1 and DIC',
    )
    expect(words({ t: 0, type: 'meter.probes', red: 'drive.l1', black: null })).toBe(
      'Red probe on L1, black probe on the meter',
    )
    expect(words({ t: 0, type: 'setting.changed', key: 'di2.function', value: 'raise' })).toMatch(
      /^DI2 function set to .*raise/i,
    )
    expect(words({ t: 0, type: 'keypad.key', key: 'enter' })).toBe('Keypad OK pressed')
    expect(words({ t: 0, type: 'lock.applied', tag: { name: 'Sam Apprentice', date: '2026-12-03' } })).toBe(
      'Lock applied to the disconnect, tagged Sam Apprentice, 2026-12-03',
    )
    expect(words({ t: 0, type: 'lock.applied' })).toBe('Lock applied to the disconnect')
    expect(words({ t: 0, type: 'lock.removed', whose: 'supervisor' })).toBe(
      'Tried to remove the supervisor’s lock from the disconnect',
    )
    expect(words({ t: 0, type: 'supervisorLock.removed' })).toMatch(/^Asked the supervisor to remove/)
    expect(words({ t: 0, type: 'device.pressed', device: 'raiseButton' })).toBe('Faster pressed')
    expect(words({ t: 0, type: 'meter.mode', mode: 'acVolts' })).toBe('Meter turned to V AC')
    expect(words({ t: 0, type: 'motor.conductorLanded', conductor: 'u', terminal: null })).toBe(
      'Motor-cable conductor U lifted',
    )
    expect(words({ t: 0, type: 'motor.cableReplaced' })).toBe('Motor cable replaced')
    expect(words({ t: 0, type: 'motor.conductorLanded', conductor: 'v', terminal: 'v1' })).toBe(
      'Motor-cable conductor V landed on motor terminal V1',
    )
  })

  it('names a diagnosis by the part as the panel shows it and the finding in words', () => {
    const words = (
      target: Extract<AttemptEvent, { type: 'diagnosis.recorded' }>['target'],
      marker?: string,
    ) => eventWords({ t: 0, type: 'diagnosis.recorded', target, finding: 'open' }, layout, marker)
    expect(words({ kind: 'wire', wire: 'wRunOut' }, 'W3 BU')).toBe(
      'Diagnosis recorded: wire W3 BU: open circuit',
    )
    expect(words({ kind: 'device', device: 'raiseButton' })).toBe('Diagnosis recorded: Faster: open circuit')
    expect(words({ kind: 'controlFuse' })).toBe('Diagnosis recorded: control fuse: open circuit')
    expect(words({ kind: 'terminal', point: 'drive.dcom' })).toBe(
      'Diagnosis recorded: terminal DIC: open circuit',
    )
    expect(
      eventWords(
        {
          t: 0,
          type: 'diagnosis.recorded',
          target: { kind: 'setting', key: 'inputs.logic' },
          finding: 'wrongSetting',
        },
        layout,
      ),
    ).toMatch(/^Diagnosis recorded: setting [A-Z][a-z ]+: set wrong$/)
  })

  it('shows no internal identifier for any event of a real attempt', () => {
    const events = (reference as { events: unknown[] }).events.map((e) => attemptEventSchema.parse(e))
    const ids = [
      /\b[a-z]+\.[a-z]+\b/, // wire.added, drive.di1, runSwitch.a
      /\bw\d+\b/, // w4
      /raiseButton|lowerButton|runSwitch|raiseLower|reference\.remoteSource/,
    ]
    for (const e of events) {
      const text = eventWords(e, layout)
      for (const id of ids) expect(text, `"${text}" for ${e.type}`).not.toMatch(id)
    }
  })
})
