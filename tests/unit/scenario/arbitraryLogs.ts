// Generated attempt logs for property tests of the grader: the stored fixture logs with events
// inserted, dropped and retimed, and logs made from scratch out of each scenario's own devices,
// terminals, settings and hints. Events come at the same millisecond, a little later, or minutes
// later (so the DC bus charges and discharges), in every order an apprentice could make them.
import fc from 'fast-check'
import {
  DIAGNOSIS_FINDINGS,
  DIGITAL_INPUT_NUMBERS,
  CONTACT_TYPES,
  DRIVE_CONTROL_POINTS,
  DRIVE_POWER_POINTS,
  METER_MODES,
  MOTOR_POINTS,
  MOTOR_TERMINALS,
  OUTPUT_PHASES,
  PROVER_POINTS,
  SETTINGS,
  WIRE_COLOURS,
  controlPointsFor,
  type AttemptEvent,
  type SettingDef,
} from '@shared/model'
import type { Scenario } from '@shared/scenario'

/** An event without its time. */
export type EventBody = AttemptEvent extends infer E ? (E extends AttemptEvent ? Omit<E, 't'> : never) : never

const settingValue = (def: SettingDef): fc.Arbitrary<string | number | boolean> => {
  if (def.kind === 'boolean') return fc.boolean()
  if (def.kind === 'choice') return fc.constantFrom(...def.options.map((o) => o.value))
  return fc.oneof(
    fc.constantFrom(def.min, def.max, def.default),
    fc.integer({ min: Math.ceil(def.min), max: Math.floor(def.max) }),
  )
}

/** Any event that makes sense on this scenario's bench (and a few that the model refuses). */
export function eventBody(scenario: Scenario): fc.Arbitrary<EventBody> {
  const devices = scenario.start.devices
  const controlPoints = controlPointsFor(devices)
  const probePoints = [
    ...DRIVE_POWER_POINTS,
    ...MOTOR_POINTS,
    ...PROVER_POINTS,
    ...DRIVE_CONTROL_POINTS.slice(0, 4),
  ]
  const deviceOf = (kinds: string[]) => {
    const ids = devices.filter((d) => kinds.includes(d.kind)).map((d) => d.id)
    return ids.length ? fc.constantFrom(...ids) : fc.constant('noSuchDevice')
  }
  const wireIds = [...scenario.start.wires.map((w) => w.id), 'w1', 'w2', 'w3', 'w4']
  const settings = SETTINGS.filter((s) =>
    /^(stop|control|reference|inputs|raiseLower|ramp|speed)\./.test(s.key),
  ) as SettingDef[]
  const hintIds = [...scenario.hints.map((h) => h.id), 'no-such-hint']
  const pair = fc.constantFrom(
    ['drive.l1', 'drive.l2'],
    ['drive.l2', 'drive.l3'],
    ['drive.l3', 'drive.l1'],
    ['drive.dcp', 'drive.dcn'],
    ['prover.pos', 'prover.neg'],
    ['prover.ac', 'prover.neg'],
    ['drive.p24', 'drive.0v'],
    ['drive.u', 'motor.u1'],
  )
  return fc.oneof(
    { weight: 3, arbitrary: fc.constantFrom<EventBody>({ type: 'power.on' }, { type: 'power.off' }) },
    { weight: 2, arbitrary: fc.constantFrom<EventBody>({ type: 'lock.applied' }, { type: 'lock.removed' }) },
    {
      weight: 4,
      arbitrary: fc.oneof(
        pair.map(([red, black]) => ({ type: 'meter.probes', red, black }) as EventBody),
        fc
          .record({
            red: fc.option(fc.constantFrom(...probePoints), { nil: null }),
            black: fc.option(fc.constantFrom(...probePoints), { nil: null }),
          })
          .map(({ red, black }) => ({ type: 'meter.probes', red, black }) as EventBody),
      ),
    },
    // The voltage ranges most: a dead test counts only on the pair's own range.
    {
      weight: 3,
      arbitrary: fc
        .constantFrom<(typeof METER_MODES)[number]>('acVolts', 'dcVolts', ...METER_MODES)
        .map((mode) => ({ type: 'meter.mode', mode }) as EventBody),
    },
    {
      weight: 1,
      arbitrary: fc.oneof(
        fc
          .record({
            conductor: fc.constantFrom(...OUTPUT_PHASES),
            terminal: fc.option(fc.constantFrom(...MOTOR_TERMINALS), { nil: null }),
          })
          .map((c) => ({ type: 'motor.conductorLanded', ...c }) as EventBody),
        fc.constant<EventBody>({ type: 'motor.cableReplaced' }),
      ),
    },
    {
      weight: 3,
      arbitrary: fc
        .record({
          id: fc.constantFrom(...wireIds),
          from: fc.constantFrom(...controlPoints),
          to: fc.constantFrom(...controlPoints),
          colour: fc.constantFrom(...WIRE_COLOURS),
        })
        .map((w) => ({ type: 'wire.added', ...w }) as EventBody),
    },
    {
      weight: 2,
      arbitrary: fc.constantFrom(...wireIds).map((id) => ({ type: 'wire.removed', id }) as EventBody),
    },
    {
      weight: 4,
      arbitrary: deviceOf(['pushbutton']).chain((device) =>
        fc.constantFrom<EventBody>({ type: 'device.pressed', device }, { type: 'device.released', device }),
      ),
    },
    {
      weight: 2,
      arbitrary: fc
        .record({ device: deviceOf(['selector']), position: fc.constantFrom(0 as const, 1 as const) })
        .map((d) => ({ type: 'device.switched', ...d }) as EventBody),
    },
    {
      weight: 1,
      arbitrary: fc
        .record({ device: deviceOf(['potentiometer']), position: fc.double({ min: 0, max: 1, noNaN: true }) })
        .map((d) => ({ type: 'device.turned', ...d }) as EventBody),
    },
    {
      weight: 1,
      arbitrary: fc
        .record({ device: deviceOf(['pushbutton', 'selector']), contact: fc.constantFrom(...CONTACT_TYPES) })
        .map((d) => ({ type: 'device.contactFitted', ...d }) as EventBody),
    },
    { weight: 1, arbitrary: fc.constant<EventBody>({ type: 'fuse.replaced' }) },
    {
      weight: 1,
      arbitrary: fc
        .record({
          target: fc.oneof(
            fc.constantFrom(...wireIds).map((wire) => ({ kind: 'wire' as const, wire })),
            deviceOf(['pushbutton', 'selector']).map((device) => ({ kind: 'device' as const, device })),
            fc.constant({ kind: 'controlFuse' as const }),
            fc.constantFrom(...controlPoints).map((point) => ({ kind: 'terminal' as const, point })),
          ),
          finding: fc.constantFrom(...DIAGNOSIS_FINDINGS),
        })
        .map((d) => ({ type: 'diagnosis.recorded', ...d }) as EventBody),
    },
    {
      weight: 3,
      arbitrary: fc
        .constantFrom(...settings)
        .chain((def) =>
          settingValue(def).map((value) => ({ type: 'setting.changed', key: def.key, value }) as EventBody),
        ),
    },
    { weight: 2, arbitrary: fc.constant<EventBody>({ type: 'settings.saved' }) },
    {
      weight: 3,
      arbitrary: fc
        .constantFrom('run', 'stop', 'reset', 'up', 'down', 'enter')
        .map((key) => ({ type: 'keypad.key', key }) as EventBody),
    },
    {
      weight: 1,
      arbitrary: fc
        .constantFrom(...hintIds)
        .map((hintId) => ({ type: 'hint.revealed', hintId }) as EventBody),
    },
    // Live classroom: an instructor's fault (some on parts the bench does not have) and messages.
    {
      weight: 1,
      arbitrary: fc
        .record({
          injectionId: fc.uuid({ version: 4 }),
          fault: fc.oneof(
            fc.constantFrom(...wireIds).map((wireId) => ({ kind: 'brokenWire' as const, wireId })),
            deviceOf(['pushbutton', 'selector']).chain((device) =>
              fc.constantFrom(
                { kind: 'contactFailedOpen' as const, device },
                { kind: 'contactWelded' as const, device },
                { kind: 'wrongContactType' as const, device },
              ),
            ),
            fc.constant({ kind: 'blownFuse' as const }),
            fc
              .constantFrom(...OUTPUT_PHASES)
              .map((conductor) => ({ kind: 'motorConductorOpen' as const, conductor })),
            fc
              .constantFrom(...DIGITAL_INPUT_NUMBERS)
              .map((input) => ({ kind: 'inputUnresponsive' as const, input })),
            fc
              .constantFrom(...settings)
              .chain((def) =>
                settingValue(def).map((value) => ({ kind: 'settingChanged' as const, key: def.key, value })),
              ),
          ),
        })
        .map((i) => ({ type: 'fault.injected', ...i, by: INSTRUCTOR }) as EventBody),
    },
    {
      weight: 1,
      arbitrary: fc
        .record({
          messageId: fc.uuid({ version: 4 }),
          kind: fc.constantFrom('hint' as const, 'message' as const),
        })
        .map(
          (m) =>
            ({
              type: 'message.received',
              ...m,
              text: 'Look again at the inputs.',
              from: INSTRUCTOR,
            }) as EventBody,
        ),
    },
  )
}

const INSTRUCTOR = { id: '00000000-0000-4000-8000-0000000000f1', name: 'Ottilie Marsh' }

/** A gap between two events (ms): the same moment, a moment later, seconds, or minutes. */
export const gap: fc.Arbitrary<number> = fc.oneof(
  { weight: 3, arbitrary: fc.constant(0) },
  { weight: 3, arbitrary: fc.integer({ min: 1, max: 400 }) },
  { weight: 4, arbitrary: fc.integer({ min: 400, max: 8000 }) },
  { weight: 1, arbitrary: fc.integer({ min: 8000, max: 180_000 }) },
)

export function timed(bodies: readonly EventBody[], gaps: readonly number[]): AttemptEvent[] {
  let t = 0
  return bodies.map((body, i) => {
    t += gaps[i] ?? 0
    return { ...body, t } as AttemptEvent
  })
}

/** A log made from scratch for the scenario. */
export function freshLog(scenario: Scenario, maxLength = 40): fc.Arbitrary<AttemptEvent[]> {
  return fc.array(fc.tuple(eventBody(scenario), gap), { maxLength }).map((steps) =>
    timed(
      steps.map(([body]) => body),
      steps.map(([, g]) => g),
    ),
  )
}

/**
 * A stored log with changes: some events dropped, others inserted (at the same moment as a
 * neighbour or between two), some gaps stretched or squeezed.
 */
export function mutatedLog(scenario: Scenario, base: readonly AttemptEvent[]): fc.Arbitrary<AttemptEvent[]> {
  const edit = fc.record({
    at: fc.nat(),
    action: fc.constantFrom('insert', 'insert', 'drop', 'stretch', 'squeeze'),
    body: eventBody(scenario),
    gap,
  })
  return fc.array(edit, { maxLength: 12 }).map((edits) => {
    const bodies: EventBody[] = base.map(({ t: _t, ...body }) => body as EventBody)
    const gaps = base.map((e, i) => e.t - (i > 0 ? base[i - 1]!.t : 0))
    for (const { at, action, body, gap: g } of edits) {
      const i = bodies.length === 0 ? 0 : at % (bodies.length + (action === 'insert' ? 1 : 0))
      if (action === 'insert') {
        bodies.splice(i, 0, body)
        gaps.splice(i, 0, g)
      } else if (bodies.length > 0 && action === 'drop') {
        bodies.splice(i, 1)
        gaps.splice(i, 1)
      } else if (bodies.length > 0) {
        gaps[i] = action === 'stretch' ? gaps[i]! + g : Math.floor(gaps[i]! / 3)
      }
    }
    return timed(bodies, gaps)
  })
}
