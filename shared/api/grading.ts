// The grader's result (shared/scenario grade), as stored with an attempt and returned by the API.
// The grader's TypeScript types are inferred from these schemas: one definition of the shape.
// Grades stored since the first release parse: fields added later are optional.
import { z } from 'zod'
import { OBJECTIVE_KINDS } from '../scenario/objectiveSchema'

export const objectiveKindSchema = z.enum(OBJECTIVE_KINDS)

export const objectiveResultSchema = z.object({
  id: z.string(),
  kind: objectiveKindSchema,
  title: z.string(),
  required: z.boolean(),
  /** A safe-practice objective (its failures are also listed as safety violations). */
  safety: z.boolean(),
  met: z.boolean(),
  pointsEarned: z.number().min(0),
  pointsPossible: z.number().min(0),
  /** Plain words: the simulated time and the values that met or missed the objective. */
  evidence: z.string(),
  /** Simulated ms the evidence refers to, when it is one moment. */
  at: z.number().min(0).optional(),
  /**
   * Live classroom: the objective belongs to a fault an instructor put in (which one in order, from 0;
   * when, in simulated ms; the instructor's name). Absent for the scenario's own objectives.
   */
  injection: z
    .object({ id: z.string(), index: z.number().int().min(0), at: z.number().min(0), by: z.string() })
    .optional(),
})
export type ObjectiveResult = z.infer<typeof objectiveResultSchema>

export const SAFETY_VIOLATION_KINDS = [
  'workWhileEnergised',
  'workWithoutLock',
  'workWithoutProvingDead',
  /** The meter on resistance or continuity across a live circuit. */
  'ohmmeterOnLiveCircuit',
] as const
export const safetyViolationKindSchema = z.enum(SAFETY_VIOLATION_KINDS)

export const safetyViolationSchema = z.object({
  kind: safetyViolationKindSchema,
  /** Simulated ms of the unsafe moment. */
  t: z.number().min(0),
  /** Plain words: what happened and the values at the time. */
  text: z.string(),
})
export type SafetyViolation = z.infer<typeof safetyViolationSchema>

export const hintUseSchema = z.object({
  id: z.string(),
  /** Simulated ms of the first reveal. */
  t: z.number().min(0),
  cost: z.number().min(0),
  /** The hint as the apprentice read it (grades stored before it was recorded lack it). */
  text: z.string().optional(),
})
export type HintUse = z.infer<typeof hintUseSchema>

export const gradePointsSchema = z.object({
  earned: z.number().min(0),
  hintCost: z.number().min(0),
  net: z.number().min(0),
  possible: z.number().min(0),
  passMark: z.number().min(0),
})

export const gradeResultSchema = z.object({
  scenarioId: z.string(),
  scenarioVersion: z.number().int(),
  /** 0–100. */
  score: z.number().min(0).max(100),
  passed: z.boolean(),
  points: gradePointsSchema,
  objectives: z.array(objectiveResultSchema),
  /** Unsafe moments, whatever the objectives (work on live terminals, without a lock, unproved). */
  safetyViolations: z.array(safetyViolationSchema),
  hintsUsed: z.array(hintUseSchema),
  /** Ids of the required objectives that were missed (any one fails the attempt). */
  missedRequired: z.array(z.string()),
  /** Simulated ms at which the attempt was judged. */
  endedAt: z.number().min(0),
  summary: z.string(),
})
export type GradeResult = z.infer<typeof gradeResultSchema>
