// The scenario file format: the zod schema every scenario file (shipped or uploaded) must satisfy.
import { z } from 'zod'
import { DIGITAL_INPUT_NUMBERS, OUTPUT_PHASES } from '../model/points'
import { SETTING_KEYS } from '../model/settings'
import {
  CONTACT_TYPES,
  LOAD_KINDS,
  motorNameplateSchema,
  strictMotorCableSchema,
  WIRE_COLOURS,
} from '../model/setup'
import { objectiveSchema } from './objectiveSchema'

const slug = z
  .string()
  .regex(
    /^[a-z0-9]+(?:-[a-z0-9]+)*$/,
    'Use lower-case letters and digits, joined by single hyphens (for example night-shift-pump)',
  )

const idSchema = z
  .string()
  .regex(/^[a-zA-Z][a-zA-Z0-9_-]*$/, 'must start with a letter and use only letters, digits, - and _')

export const contactTypeSchema = z.enum(CONTACT_TYPES)

/** A point is `drive.<terminal>` or `<deviceId>.<terminal>`; existence is checked by checkScenario. */
export const pointIdSchema = z
  .string()
  .regex(/^[a-zA-Z][a-zA-Z0-9_-]*\.[a-zA-Z0-9]+$/, 'Not a terminal: choose one from the list')

export const deviceSpecSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    id: idSchema,
    kind: z.literal('pushbutton'),
    label: z.string().min(1),
    contact: contactTypeSchema,
  }),
  z.strictObject({
    id: idSchema,
    kind: z.literal('selector'),
    label: z.string().min(1),
    contact: contactTypeSchema,
    position: z.union([z.literal(0), z.literal(1)]).optional(),
  }),
  z.strictObject({
    id: idSchema,
    kind: z.literal('potentiometer'),
    label: z.string().min(1),
    ohms: z.number().positive(),
    position: z.number().min(0).max(1).optional(),
  }),
])

export const wireSpecSchema = z.strictObject({
  id: idSchema,
  from: pointIdSchema,
  to: pointIdSchema,
  colour: z.enum(WIRE_COLOURS),
})

export const injectedFaultSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('brokenWire'), wireId: idSchema }),
  z.strictObject({ kind: z.literal('contactFailedOpen'), device: idSchema }),
  z.strictObject({ kind: z.literal('contactWelded'), device: idSchema }),
  z.strictObject({ kind: z.literal('wrongContactType'), device: idSchema }),
  z.strictObject({ kind: z.literal('blownFuse') }),
  z.strictObject({ kind: z.literal('motorConductorOpen'), conductor: z.enum(OUTPUT_PHASES) }),
  /** The drive reads this input (1–6) OFF whatever its terminal sees (model: setup.ts). */
  z.strictObject({ kind: z.literal('inputUnresponsive'), input: z.literal(DIGITAL_INPUT_NUMBERS) }),
  /** The setting starts at `value` instead of the starting settings' value (changed behind their back). */
  z.strictObject({
    kind: z.literal('settingChanged'),
    key: z.enum(SETTING_KEYS),
    value: z.union([z.number(), z.string().max(80), z.boolean()]),
  }),
])

export const settingValueSchema = z.union([z.string(), z.number(), z.boolean()])

export const startingStateSchema = z.strictObject({
  devices: z.array(deviceSpecSchema),
  wires: z.array(wireSpecSchema),
  /** Saved (active) values; anything not listed starts at the catalogue default. */
  settings: z.record(z.string(), settingValueSchema),
  power: z.strictObject({
    on: z.boolean(),
    /** The apprentice's own lock is already on (a story that says so). */
    locked: z.boolean(),
    /** A supervisor's lock from the story: the apprentice cannot remove it, only ask its owner to. */
    supervisorLock: z.strictObject({ name: z.string().trim().min(1).max(80) }).optional(),
  }),
  /** Incoming line voltage, line to line RMS (model default 400 V). */
  lineVolts: z.number().min(100).max(690).optional(),
  machine: z
    .strictObject({
      name: z.string().min(1).optional(),
      coastSeconds: z.number().positive().optional(),
      minDecelSeconds: z.number().positive().optional(),
      /** variableTorque (fan, centrifugal pump) or constantTorque (conveyor, feeder). */
      loadKind: z.enum(LOAD_KINDS).optional(),
      /** Torque the machine needs at rated speed, as a fraction of the motor's rated torque. */
      loadFraction: z.number().min(0).max(1.5).optional(),
    })
    .optional(),
  /** The motor's nameplate (the model's own schema; its figures are checked to agree by checkScenario). */
  motor: z.strictObject(motorNameplateSchema.shape).optional(),
  /** How the motor cable is landed at the start (default straight through). */
  motorCable: strictMotorCableSchema.optional(),
})

export const hintSchema = z.strictObject({
  id: idSchema,
  text: z.string().min(1),
  /** Points taken off the score (same units as objective weights) when the hint is revealed. */
  cost: z.number().min(0),
})

export const scenarioSchema = z.strictObject({
  id: slug,
  version: z.number().int().min(1),
  title: z.string().min(3).max(120),
  site: z.strictObject({
    name: z.string().min(1),
    machine: z.string().min(1),
    people: z.array(z.string().min(1)),
  }),
  story: z.string().min(20),
  learningOutcomes: z.array(z.string().min(1)).min(1),
  difficulty: z.enum(['introductory', 'intermediate', 'advanced']),
  estimatedMinutes: z.number().int().min(1).max(480),
  start: startingStateSchema,
  faults: z.array(injectedFaultSchema),
  hints: z.array(hintSchema),
  safetyNotes: z.array(z.string().min(1)).min(1),
  objectives: z.array(objectiveSchema).min(1),
  /** Points needed to pass, in the same units as the weights (the score itself is 0–100). */
  passMark: z.number().min(0),
})

export type Scenario = z.infer<typeof scenarioSchema>
export type ScenarioDevice = z.infer<typeof deviceSpecSchema>
export type ScenarioWire = z.infer<typeof wireSpecSchema>
export type ScenarioFault = z.infer<typeof injectedFaultSchema>
export type ScenarioHint = z.infer<typeof hintSchema>
export type StartingState = z.infer<typeof startingStateSchema>
