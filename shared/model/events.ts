// Attempt events: the log an attempt is made of. Validated at the edge with these schemas.
import { z } from 'zod'
import { DIAGNOSIS_FINDINGS, diagnosisTargetSchema } from './diagnosis'
import { METER_MODES } from './meterModes'
import { MOTOR_TERMINALS, OUTPUT_PHASES } from './points'
import { CONTACT_TYPES, WIRE_COLOURS, injectedFaultSchema, lockTagSchema, pointIdSchema } from './setup'
import { SETTING_KEYS } from './settings'

const t = z
  .number()
  .int()
  .min(0)
  .max(7 * 24 * 3600 * 1000)
const id = z.string().min(1).max(64)

export const KEYPAD_KEYS = ['run', 'stop', 'reset', 'up', 'down', 'left', 'right', 'enter', 'back'] as const
export type KeypadKey = (typeof KEYPAD_KEYS)[number]

export const attemptEventSchema = z.discriminatedUnion('type', [
  z.object({
    t,
    type: z.literal('wire.added'),
    id: id.regex(/^[A-Za-z0-9_-]+$/),
    from: pointIdSchema,
    to: pointIdSchema,
    colour: z.enum(WIRE_COLOURS),
  }),
  z.object({ t, type: z.literal('wire.removed'), id }),
  z.object({ t, type: z.literal('device.pressed'), device: id }),
  z.object({ t, type: z.literal('device.released'), device: id }),
  z.object({
    t,
    type: z.literal('device.switched'),
    device: id,
    position: z.union([z.literal(0), z.literal(1)]),
  }),
  z.object({ t, type: z.literal('device.turned'), device: id, position: z.number().min(0).max(1) }),
  z.object({ t, type: z.literal('device.contactFitted'), device: id, contact: z.enum(CONTACT_TYPES) }),
  z.object({ t, type: z.literal('fuse.replaced') }),
  z.object({
    t,
    type: z.literal('setting.changed'),
    key: z.enum(SETTING_KEYS),
    value: z.union([z.number().finite(), z.string().max(32), z.boolean()]),
  }),
  z.object({ t, type: z.literal('settings.saved') }),
  z.object({ t, type: z.literal('power.on') }),
  z.object({ t, type: z.literal('power.off') }),
  // The tag is optional so logs from before tags stay valid; the panel always writes one.
  z.object({ t, type: z.literal('lock.applied'), tag: lockTagSchema.optional() }),
  // `whose: 'supervisor'`: the apprentice tried to remove the story's supervisor lock (always refused).
  z.object({ t, type: z.literal('lock.removed'), whose: z.enum(['mine', 'supervisor']).optional() }),
  // The apprentice asked the supervisor, who came and removed their own lock.
  z.object({ t, type: z.literal('supervisorLock.removed') }),
  z.object({
    t,
    type: z.literal('meter.probes'),
    red: pointIdSchema.nullable(),
    black: pointIdSchema.nullable(),
  }),
  z.object({ t, type: z.literal('meter.mode'), mode: z.enum(METER_MODES) }),
  /** Land one motor-cable conductor on a motor terminal, or lift it off (terminal null). Terminal work. */
  z.object({
    t,
    type: z.literal('motor.conductorLanded'),
    conductor: z.enum(OUTPUT_PHASES),
    terminal: z.enum(MOTOR_TERMINALS).nullable(),
  }),
  /** A new motor cable, landed straight through (U1, V1, W1); clears a broken conductor. Terminal work. */
  z.object({ t, type: z.literal('motor.cableReplaced') }),
  z.object({ t, type: z.literal('keypad.key'), key: z.enum(KEYPAD_KEYS) }),
  z.object({ t, type: z.literal('hint.revealed'), hintId: id }),
  /** What the apprentice says is wrong, before a repair. No model effect (the grader judges it). */
  z.object({
    t,
    type: z.literal('diagnosis.recorded'),
    target: diagnosisTargetSchema,
    finding: z.enum(DIAGNOSIS_FINDINGS),
  }),
  /**
   * Live classroom: an instructor put a fault into the running bench. The apprentice's panel appends it when
   * the server hands it over; the server refuses a log whose injections it did not record. `by` names the
   * instructor for the replay (a name, never shown as an id).
   */
  z.object({
    t,
    type: z.literal('fault.injected'),
    injectionId: z.uuid(),
    fault: injectedFaultSchema,
    by: z.object({ id: z.uuid(), name: z.string().min(1).max(120) }),
  }),
  /** Live classroom: a hint or message from an instructor, recorded where the apprentice saw it. No model effect. */
  z.object({
    t,
    type: z.literal('message.received'),
    messageId: z.uuid(),
    kind: z.enum(['hint', 'message']),
    text: z.string().min(1).max(1000),
    from: z.object({ id: z.uuid(), name: z.string().min(1).max(120) }),
  }),
  z.object({ t, type: z.literal('attempt.ended') }),
])
export type AttemptEvent = z.infer<typeof attemptEventSchema>
export type AttemptEventType = AttemptEvent['type']

/** A whole log: events in time order (equal times keep their order). */
export const attemptLogSchema = z
  .array(attemptEventSchema)
  .max(200_000)
  .superRefine((events, ctx) => {
    for (let i = 1; i < events.length; i++) {
      if (events[i].t < events[i - 1].t) {
        ctx.addIssue({
          code: 'custom',
          path: [i, 't'],
          message: `event ${i} at ${events[i].t} ms is earlier than the event before it (${events[i - 1].t} ms)`,
        })
        return
      }
    }
  })
