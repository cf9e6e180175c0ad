// The objective kinds a scenario can ask for, as zod schemas (the evaluators live in evaluators/).
import { z } from 'zod'
import { DIAGNOSIS_FINDINGS, diagnosisTargetSchema } from '../model/diagnosis'

/** Below this many volts a conductor counts as de-energised: NEC 460.6 (capacitors to 50 V or less). */
export const SAFE_VOLTS = 50

const common = {
  id: z
    .string()
    .regex(/^[a-zA-Z][a-zA-Z0-9_-]*$/, 'must start with a letter and use only letters, digits, - and _'),
  /** What the apprentice sees, in plain words. */
  title: z.string().min(3),
  /** Points possible. */
  weight: z.number().positive(),
  /** A required objective must be met for the attempt to pass, whatever the score. */
  required: z.boolean().optional(),
  /** Ids of the scenario's hints that help with this objective (the panel offers them beside it). */
  hints: z.array(z.string()).optional(),
}

const inputFunctionName = z.string().min(1)
const point = z
  .string()
  .regex(/^[a-zA-Z][a-zA-Z0-9_-]*\.[a-zA-Z0-9]+$/, 'Not a terminal: choose one from the list')

/** Which input a wiring condition looks at: the input(s) assigned to a function, or a fixed point. */
export const inputSelectorSchema = z.union([
  z.strictObject({ function: inputFunctionName }),
  z.strictObject({ point }),
])

/** The field-device situation in which a wiring condition is judged. */
export const deviceConditionSchema = z.strictObject({
  /** Momentary devices that must be held. */
  held: z.array(z.string()).optional(),
  /** Momentary devices that must be released. */
  released: z.array(z.string()).optional(),
  /** Selector positions (0/1) or potentiometer positions (0..1) that must hold. */
  positions: z.record(z.string(), z.number().min(0).max(1)).optional(),
  /** Every momentary device released. */
  nothingHeld: z.boolean().optional(),
})

export const settingEqualsSchema = z.strictObject({
  ...common,
  kind: z.literal('settingEquals'),
  key: z.string().min(1),
  value: z.union([z.string(), z.number(), z.boolean()]),
})

export const settingInRangeSchema = z.strictObject({
  ...common,
  kind: z.literal('settingInRange'),
  key: z.string().min(1),
  min: z.number(),
  max: z.number(),
})

export const wiringConditionSchema = z.strictObject({
  ...common,
  kind: z.literal('wiringCondition'),
  while: deviceConditionSchema,
  input: inputSelectorSchema,
  /** A digital state, or a voltage window for an analog point. */
  expect: z.union([z.enum(['on', 'off']), z.strictObject({ minVolts: z.number(), maxVolts: z.number() })]),
})

export const functionalCheckSchema = z.strictObject({
  ...common,
  kind: z.literal('functionalCheck'),
  /** The momentary device held while the drive runs. */
  device: z.string().min(1),
  effect: z.enum(['raises', 'lowers']),
  /** Also require that, once released, the reference stays put for `holdSeconds`. */
  thenHolds: z.boolean(),
  holdSeconds: z.number().positive().optional(),
})

export const speedHeldSchema = z.strictObject({
  ...common,
  kind: z.literal('speedHeld'),
  target: z.number().positive(),
  unit: z.enum(['rpm', 'Hz']),
  tolerance: z.number().positive(),
  holdSeconds: z.number().positive(),
})

export const stoppedBySchema = z.strictObject({
  ...common,
  kind: z.literal('stoppedBy'),
  mode: z.enum(['ramp', 'coast']),
  /** The stop only counts when it begins at or above this output frequency. */
  fromAtLeastHz: z.number().min(0).optional(),
})

export const restartedWithRememberedReferenceSchema = z.strictObject({
  ...common,
  kind: z.literal('restartedWithRememberedReference'),
  /** Require a power-off between the stop and the restart. */
  acrossPowerLoss: z.boolean().optional(),
  /** The remembered reference must be at least this (so that "remembered minimum" does not count). */
  minReferenceHz: z.number().min(0).optional(),
  toleranceHz: z.number().positive().optional(),
})

export const noWiringWhileEnergisedSchema = z.strictObject({
  ...common,
  kind: z.literal('noWiringWhileEnergised'),
  thresholdVolts: z.number().positive().optional(),
})

export const lockBeforeWiringSchema = z.strictObject({
  ...common,
  kind: z.literal('lockBeforeWiring'),
})

export const absenceOfVoltageProvedSchema = z.strictObject({
  ...common,
  kind: z.literal('absenceOfVoltageProved'),
  thresholdVolts: z.number().positive().optional(),
  /** Probe pairs that must each read below the threshold; default: the three line pairs and the DC bus. */
  pairs: z
    .array(z.tuple([point, point]))
    .min(1)
    .optional(),
  /** NFPA 70E 120.5(7): prove the meter on a known live source before (and after) the dead test. */
  proveMeterBefore: z.boolean().optional(),
  proveMeterAfter: z.boolean().optional(),
})

export const isolatedSchema = z.strictObject({
  ...common,
  kind: z.literal('isolated'),
  /** Also require the DC bus below this at the end. */
  thresholdVolts: z.number().positive().optional(),
})

export const noFaultTripsSchema = z.strictObject({
  ...common,
  kind: z.literal('noFaultTrips'),
})

export const noAlarmsSchema = z.strictObject({
  ...common,
  kind: z.literal('noAlarms'),
})

export const faultFoundAndClearedSchema = z.strictObject({
  ...common,
  kind: z.literal('faultFoundAndCleared'),
  /** Index into the scenario's `faults`. */
  fault: z.number().int().min(0),
})

/**
 * The diagnosis recorded last before the repair named the right part and what was wrong with it. Either
 * for an injected fault (`fault`: the repair is the moment that fault first goes; the right answer comes
 * from the fault), or for a problem built into the start (`expect`: the repair is the first work on that
 * part — a wire changed at that terminal, that setting saved, that part replaced).
 */
export const diagnosisCorrectSchema = z.strictObject({
  ...common,
  kind: z.literal('diagnosisCorrect'),
  /** Index into the scenario's `faults` (give this or `expect`, not both: checkScenario says so). */
  fault: z.number().int().min(0).optional(),
  expect: z
    .strictObject({
      target: diagnosisTargetSchema,
      /** Every finding accepted as right (a loose and a broken conductor read alike on a meter). */
      findings: z.array(z.enum(DIAGNOSIS_FINDINGS)).min(1),
    })
    .optional(),
})

/**
 * Before the injected fault `faults[fault]` was first put right, the meter showed something with the fault
 * present that it would not have shown with that fault alone cleared (same moment, same probes, same
 * selector): see README "A measurement that tells a fault apart".
 */
export const discriminatingMeasurementSchema = z.strictObject({
  ...common,
  kind: z.literal('discriminatingMeasurement'),
  fault: z.number().int().min(0),
})

/**
 * No healthy part replaced: a fuse that was not blown, a contact block that was right, a wire taken off
 * and made again between the same terminals when it was not broken, a healthy motor cable. Each costs
 * `costEach` points of the weight (never below zero); the evidence names each.
 */
export const noNeedlessReplacementsSchema = z.strictObject({
  ...common,
  kind: z.literal('noNeedlessReplacements'),
  costEach: z.number().positive(),
})

export const finishedWithinSchema = z.strictObject({
  ...common,
  kind: z.literal('finishedWithin'),
  minutes: z.number().positive(),
})

export const objectiveSchema = z.discriminatedUnion('kind', [
  settingEqualsSchema,
  settingInRangeSchema,
  wiringConditionSchema,
  functionalCheckSchema,
  speedHeldSchema,
  stoppedBySchema,
  restartedWithRememberedReferenceSchema,
  noWiringWhileEnergisedSchema,
  lockBeforeWiringSchema,
  absenceOfVoltageProvedSchema,
  isolatedSchema,
  noFaultTripsSchema,
  noAlarmsSchema,
  faultFoundAndClearedSchema,
  finishedWithinSchema,
  diagnosisCorrectSchema,
  discriminatingMeasurementSchema,
  noNeedlessReplacementsSchema,
])

export type Objective = z.infer<typeof objectiveSchema>
export type ObjectiveKind = Objective['kind']
export type ObjectiveOf<K extends ObjectiveKind> = Extract<Objective, { kind: K }>
/** Every kind, in the order of the schema (the grade result's schema in shared/api enumerates them). */
export const OBJECTIVE_KINDS = [
  'settingEquals',
  'settingInRange',
  'wiringCondition',
  'functionalCheck',
  'speedHeld',
  'stoppedBy',
  'restartedWithRememberedReference',
  'noWiringWhileEnergised',
  'lockBeforeWiring',
  'absenceOfVoltageProved',
  'isolated',
  'noFaultTrips',
  'noAlarms',
  'faultFoundAndCleared',
  'finishedWithin',
  'diagnosisCorrect',
  'discriminatingMeasurement',
  'noNeedlessReplacements',
] as const satisfies readonly ObjectiveKind[]
// A compile-time check that the list names every kind of the schema.
export const OBJECTIVE_KINDS_COMPLETE: [Exclude<ObjectiveKind, (typeof OBJECTIVE_KINDS)[number]>] extends [
  never,
]
  ? true
  : never = true

export type DeviceCondition = z.infer<typeof deviceConditionSchema>
export type InputSelector = z.infer<typeof inputSelectorSchema>

/** Kinds about safe practice: their failures are also listed as safety violations. */
export const SAFETY_KINDS: readonly ObjectiveKind[] = [
  'noWiringWhileEnergised',
  'lockBeforeWiring',
  'absenceOfVoltageProved',
  'isolated',
]
