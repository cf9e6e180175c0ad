// Gradebook: a cohort's apprentices × assignments, paged, sorted and filtered on the server. Statuses and
// averages follow shared/progress (late, missed, excused; average over everything graded or past due).
import { z } from 'zod'
import { LATE_POLICIES, WORK_STATUSES } from '../progress/standing'
import { idSchema, isoDateTimeSchema, pageQuerySchema, sortOrderSchema } from './common'

export const gradebookCellStatusSchema = z.enum(WORK_STATUSES)
export type GradebookCellStatus = z.infer<typeof gradebookCellStatusSchema>
export const latePolicySchema = z.enum(LATE_POLICIES)

export const GRADEBOOK_SORTS = ['name', 'email', 'lastActivity', 'average', 'completion'] as const

export const gradebookQuerySchema = pageQuerySchema.extend({
  // A column name, or an assignment's id to sort by that assignment's scores.
  sort: z.union([z.enum(GRADEBOOK_SORTS), idSchema]).default('name'),
  order: sortOrderSchema,
  q: z.string().trim().max(120).optional(), // name or e-mail contains
  status: gradebookCellStatusSchema.optional(), // rows with a cell in this status …
  assignmentId: idSchema.optional(), // … in this assignment's column (else in any column)
})
export type GradebookQuery = z.input<typeof gradebookQuerySchema>

// A cell names no assignment: cells are in the order of the page's `assignments`, which keeps a page of
// 50 apprentices × 8 assignments a third smaller than repeating the id in every cell.
export const gradebookCellSchema = z.object({
  status: gradebookCellStatusSchema,
  /** The score that counts: best attempt, late penalty applied; 0 for missed work never graded. */
  bestScore: z.number().nullable(),
  attempts: z.number().int().nonnegative(),
  lastActivity: isoDateTimeSchema.nullable(),
  /** Their own due date; null when it passed before they enrolled (no due date for them). */
  dueAt: isoDateTimeSchema.nullable(),
  /** An instructor moved their due date. */
  extended: z.boolean(),
  /** Graded at or above the pass mark but not passed: a required objective was missed. */
  requiredMissed: z.boolean(),
  /** The reason of the latest grade override on this work; null when no grade was changed. */
  overrideReason: z.string().nullable(),
})
export type GradebookCell = z.infer<typeof gradebookCellSchema>

export const gradebookRowSchema = z.object({
  userId: idSchema,
  name: z.string(),
  email: z.string(),
  /** Over everything graded or past due; missed work counts 0; excused work is left out. */
  average: z.number().nullable(),
  /** Passed (on time or late) of everything set for them and not excused. */
  completion: z.object({ passed: z.number().int().nonnegative(), assigned: z.number().int().nonnegative() }),
  lastActivity: isoDateTimeSchema.nullable(),
  cells: z.array(gradebookCellSchema), // same order as `assignments`
})
export type GradebookRow = z.infer<typeof gradebookRowSchema>

export const gradebookAssignmentSchema = z.object({
  id: idSchema,
  title: z.string(),
  opensAt: isoDateTimeSchema,
  dueAt: isoDateTimeSchema,
  /** The pass mark as a score out of 100 (null when the scenario cannot be read). */
  passMark: z.number().nullable(),
  requiredObjectives: z.number().int().nonnegative(),
  latePolicy: latePolicySchema,
  latePenalty: z.number().int().min(0).max(100),
  /** Set for selected apprentices only. */
  targeted: z.boolean(),
})
export type GradebookAssignment = z.infer<typeof gradebookAssignmentSchema>

export const gradebookSchema = z.object({
  cohortId: idSchema,
  assignments: z.array(gradebookAssignmentSchema),
  rows: z.array(gradebookRowSchema),
  total: z.number().int().nonnegative(),
  page: z.number().int().min(1),
  pageSize: z.number().int().min(1),
})
export type Gradebook = z.infer<typeof gradebookSchema>
