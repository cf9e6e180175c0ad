// sameDriveReading: two states may share one drive reading only when readDrive gives equal readings.
// Readers of a replay (the grader) share readings between the states of one moment on the strength of it.
import { describe, expect, it } from 'vitest'
import {
  advance,
  applyEvent,
  readDrive,
  replay,
  sameDriveReading,
  type AttemptEvent,
  type SimState,
} from '../../../shared/model/index'
import { benchSetup, mixedLog } from '../../bench/model.bench'
import { raiseLowerSetup, start } from './fixtures'

/** Every state a grader samples: just before each event (time advanced to it) and just after it. */
function momentsOf(events: AttemptEvent[]): SimState[] {
  const timeline = replay(benchSetup, events)
  const states: SimState[] = [timeline.segments[0].state]
  events.forEach((event, index) => {
    const after = timeline.segments[index].state
    states.push(advance(after, event.t - after.t), timeline.segments[index + 1].state)
  })
  return states
}

/** A state with every part readDrive does not read changed: the reading must stay as it is. */
function withUnreadPartsChanged(state: SimState): SimState {
  const devices = Object.fromEntries(
    Object.entries(state.devices).map(([id, d]) => [
      id,
      { ...d, pressed: !d.pressed, position: 1 - d.position, fault: 'welded' as const },
    ]),
  )
  return {
    ...state,
    devices,
    deviceOrder: [...state.deviceOrder].reverse(),
    wires: [],
    brokenWires: ['c1'],
    fuseBlown: !state.fuseBlown,
    settings: { active: state.settings.active, pending: { 'speed.max': 12 } },
    meter:
      state.meter.red === 'drive.l1'
        ? { red: null, black: null, mode: 'off' }
        : { red: 'drive.l1', black: 'drive.l2', mode: 'acVolts' },
    raiseLowerFirst: state.raiseLowerFirst === 'raise' ? 'lower' : 'raise',
  }
}

describe('sameDriveReading', () => {
  const log = mixedLog(1500, 600_000, 11)
  const moments = momentsOf(log)

  it('holds only for states whose drive readings are equal', () => {
    let shared = 0
    for (let i = 1; i < moments.length; i++) {
      if (!sameDriveReading(moments[i - 1], moments[i])) continue
      shared++
      expect(readDrive(moments[i])).toEqual(readDrive(moments[i - 1]))
    }
    // The mixed log moves the probes, edits settings and presses navigation keys: many moments read alike.
    expect(shared).toBeGreaterThan(100)
  })

  it('holds for a meter probe move and an unsaved setting edit, not for a button press or time passing', () => {
    const ready = start(raiseLowerSetup())
    const probed = applyEvent(ready, { t: 0, type: 'meter.probes', red: 'drive.p24', black: 'drive.0v' })
    const edited = applyEvent(probed, { t: 0, type: 'setting.changed', key: 'speed.max', value: 40 })
    const pressed = applyEvent(edited, { t: 0, type: 'device.switched', device: 'runSel', position: 1 })
    expect(sameDriveReading(ready, probed)).toBe(true)
    expect(sameDriveReading(probed, edited)).toBe(true)
    expect(sameDriveReading(edited, pressed)).toBe(false)
    expect(sameDriveReading(pressed, advance(pressed, 1))).toBe(false)
  })

  it('keeps in step with readDrive: the parts it does not compare never change a reading', () => {
    // If readDrive ever comes to read one of these parts, the readings differ here and
    // sameDriveReading must learn to compare it.
    for (let i = 0; i < moments.length; i += 7) {
      const changed = withUnreadPartsChanged(moments[i])
      expect(sameDriveReading(moments[i], changed)).toBe(true)
      expect(readDrive(changed)).toEqual(readDrive(moments[i]))
    }
  })
})
