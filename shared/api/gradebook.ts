// Gradebook: a cohort's apprentices × assignments, paged, sorted and filtered on the server.
import { z } from 'zod'
import { idSchema, isoDateTimeSchema, pageQuerySchema, sortOrderSchema } from './common'

export const gradebookCellStatusSchema = z.enum(['notStarted', 'inProgress', 'passed', 'failed'])
export type GradebookCellStatus = z.infer<typeof gradebookCellStatusSchema>

export const gradebookQuerySchema = pageQuerySchema.extend({
  sort: z.enum(['name', 'email', 'lastActivity', 'average']).default('name'),
  order: sortOrderSchema,
  q: z.string().trim().max(120).optional(), // name or e-mail contains
  status: gradebookCellStatusSchema.optional(), // rows with a cell in this status …
  assignmentId: idSchema.optional(), // … in this assignment's column (else in any column)
})
export type GradebookQuery = z.input<typeof gradebookQuerySchema>

// A cell names no assignment: cells are in the order of the page's `assignments`, which keeps a page of
// 50 apprentices × 8 assignments a third smaller than repeating the id in every cell.
export const gradebookCellSchema = z.object({
  bestScore: z.number().nullable(),
  attempts: z.number().int().nonnegative(),
  lastActivity: isoDateTimeSchema.nullable(),
  status: gradebookCellStatusSchema,
})
export type GradebookCell = z.infer<typeof gradebookCellSchema>

export const gradebookRowSchema = z.object({
  userId: idSchema,
  name: z.string(),
  email: z.string(),
  average: z.number().nullable(), // of best scores over attempted assignments
  lastActivity: isoDateTimeSchema.nullable(),
  cells: z.array(gradebookCellSchema), // same order as `assignments`
})
export type GradebookRow = z.infer<typeof gradebookRowSchema>

export const gradebookSchema = z.object({
  cohortId: idSchema,
  assignments: z.array(z.object({ id: idSchema, title: z.string(), dueAt: isoDateTimeSchema })),
  rows: z.array(gradebookRowSchema),
  total: z.number().int().nonnegative(),
  page: z.number().int().min(1),
  pageSize: z.number().int().min(1),
})
export type Gradebook = z.infer<typeof gradebookSchema>
