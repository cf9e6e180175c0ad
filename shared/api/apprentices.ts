// One apprentice's record for their instructors: every assignment and attempt (practice too), scores over
// time, learning outcomes met, safety violations, time spent, feedback.
import { z } from 'zod'
import { WORK_STATUSES } from '../progress/standing'
import { idSchema, isoDateTimeSchema } from './common'

export const apprenticeAssignmentSchema = z.object({
  assignmentId: idSchema,
  cohortId: idSchema,
  cohortName: z.string(),
  title: z.string(),
  opensAt: isoDateTimeSchema,
  dueAt: isoDateTimeSchema,
  /** Their own due date (an extension; null: it passed before they enrolled). */
  ownDueAt: isoDateTimeSchema.nullable(),
  extended: z.boolean(),
  attemptLimit: z.number().int().nullable(),
  status: z.enum(WORK_STATUSES),
  score: z.number().nullable(),
  attempts: z.number().int().nonnegative(),
})
export type ApprenticeAssignment = z.infer<typeof apprenticeAssignmentSchema>

export const apprenticeAttemptSchema = z.object({
  id: idSchema,
  /** null: free practice. */
  assignmentId: idSchema.nullable(),
  assignmentTitle: z.string().nullable(),
  scenarioTitle: z.string(),
  status: z.enum(['inProgress', 'submitted']),
  startedAt: isoDateTimeSchema,
  submittedAt: isoDateTimeSchema.nullable(),
  score: z.number().nullable(),
  passed: z.boolean().nullable(),
  late: z.boolean(),
  overridden: z.boolean(),
  reviewed: z.boolean(),
  /** Wall-clock minutes from starting to submitting (or to the last save). */
  minutes: z.number().nonnegative(),
  violations: z.array(z.object({ kind: z.string(), text: z.string() })),
})
export type ApprenticeAttempt = z.infer<typeof apprenticeAttemptSchema>

export const apprenticeRecordSchema = z.object({
  apprentice: z.object({ id: idSchema, name: z.string(), email: z.string(), active: z.boolean() }),
  /** The cohorts of theirs the viewer teaches. */
  cohorts: z.array(
    z.object({ id: idSchema, name: z.string(), enrolledAt: isoDateTimeSchema, archived: z.boolean() }),
  ),
  summary: z.object({
    average: z.number().nullable(),
    passed: z.number().int().nonnegative(),
    assigned: z.number().int().nonnegative(),
    practiceAttempts: z.number().int().nonnegative(),
  }),
  assignments: z.array(apprenticeAssignmentSchema),
  /** Newest first. */
  attempts: z.array(apprenticeAttemptSchema),
  /** Each scenario's learning outcomes, with when they were first met (a passed attempt), else null. */
  outcomes: z.array(
    z.object({
      text: z.string(),
      scenarioTitle: z.string(),
      metAt: isoDateTimeSchema.nullable(),
      attemptId: idSchema.nullable(),
    }),
  ),
  feedback: z.array(
    z.object({
      attemptId: idSchema,
      exercise: z.string(),
      authorName: z.string(),
      body: z.string(),
      createdAt: isoDateTimeSchema,
    }),
  ),
})
export type ApprenticeRecord = z.infer<typeof apprenticeRecordSchema>

/** From one attempt's review to the same assignment's attempt by the apprentice before or after, by name. */
export const attemptNeighboursSchema = z.object({
  position: z.number().int().min(0),
  of: z.number().int().nonnegative(),
  previous: z.object({ attemptId: idSchema, userName: z.string() }).nullable(),
  next: z.object({ attemptId: idSchema, userName: z.string() }).nullable(),
})
export type AttemptNeighbours = z.infer<typeof attemptNeighboursSchema>
