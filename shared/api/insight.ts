// Class insight: where a class struggles on one assignment, or across a cohort's assignments. Words only:
// objectives by their titles, safety violations by their kind in words.
import { z } from 'zod'
import { idSchema } from './common'

export const objectiveMissSchema = z.object({
  title: z.string(),
  required: z.boolean(),
  /** Submitted, graded attempts that judged it, and those that missed it. */
  graded: z.number().int().nonnegative(),
  missed: z.number().int().nonnegative(),
  /** missed ÷ graded (null: nobody has been graded on it). */
  missRate: z.number().min(0).max(1).nullable(),
  /** Apprentices graded on it who have never met it. */
  notMetBy: z.number().int().nonnegative(),
})
export type ObjectiveMiss = z.infer<typeof objectiveMissSchema>

export const safetyKindCountSchema = z.object({
  /** The kind in words ("Work before proving dead"). */
  label: z.string(),
  violations: z.number().int().nonnegative(),
  attempts: z.number().int().nonnegative(),
  apprentices: z.number().int().nonnegative(),
})
export type SafetyKindCount = z.infer<typeof safetyKindCountSchema>

/** How many submitted attempts apprentices needed to pass, and the wall-clock time those attempts took. */
export const toPassSchema = z.object({
  passed: z.number().int().nonnegative(),
  /** Submitted at least once, not passed yet. */
  notYet: z.number().int().nonnegative(),
  /** Nothing submitted. */
  notAttempted: z.number().int().nonnegative(),
  medianAttempts: z.number().nullable(),
  /** Median total minutes from opening to submitting, over the attempts up to the first pass. */
  medianMinutes: z.number().nullable(),
  /** Apprentices who passed at their 1st, 2nd, 3rd, 4th, 5th-or-later attempt. */
  byAttempts: z.array(z.object({ label: z.string(), apprentices: z.number().int().nonnegative() })),
})
export type ToPass = z.infer<typeof toPassSchema>

export const assignmentInsightSchema = z.object({
  assignmentId: idSchema,
  title: z.string(),
  /** Apprentices it is set for (excused ones left out). */
  apprentices: z.number().int().nonnegative(),
  submittedAttempts: z.number().int().nonnegative(),
  /** Most missed first. */
  objectives: z.array(objectiveMissSchema),
  /** Most frequent first; kinds nobody committed are left out. */
  safety: z.array(safetyKindCountSchema),
  /** Submitted attempts with at least one safety violation. */
  unsafeAttempts: z.number().int().nonnegative(),
  toPass: toPassSchema,
})
export type AssignmentInsight = z.infer<typeof assignmentInsightSchema>

export const cohortInsightSchema = z.object({
  cohortId: idSchema,
  /** In due-date order. */
  assignments: z.array(
    assignmentInsightSchema.pick({
      assignmentId: true,
      title: true,
      apprentices: true,
      submittedAttempts: true,
      unsafeAttempts: true,
      toPass: true,
    }),
  ),
  /** The most missed objectives over every assignment (at most 10), each with its assignment. */
  objectives: z.array(objectiveMissSchema.extend({ assignmentTitle: z.string() })),
  safety: z.array(safetyKindCountSchema),
  submittedAttempts: z.number().int().nonnegative(),
  unsafeAttempts: z.number().int().nonnegative(),
})
export type CohortInsight = z.infer<typeof cohortInsightSchema>
