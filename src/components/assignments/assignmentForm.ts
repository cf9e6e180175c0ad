// The assign-a-scenario form's values and their check against the shared request schema.
import { createAssignmentRequestSchema, type CreateAssignmentRequest, type ScorePolicy } from '@shared/api'
import { fromLocalInput, toLocalInput } from '@/composables/format'
import { issuesByField } from '@/composables/validation'

export interface AssignmentFormValues {
  scenarioId: string | null
  title: string
  opensAt: string // datetime-local value
  dueAt: string // datetime-local value
  limitAttempts: boolean
  attemptLimit: number | string | null
  hintsAllowed: boolean
  /** Which score a learning platform's gradebook receives. */
  scorePolicy: ScorePolicy
}

export function defaultAssignmentForm(now = new Date()): AssignmentFormValues {
  const due = new Date(now.getTime() + 7 * 24 * 3600 * 1000)
  due.setHours(17, 0, 0, 0)
  return {
    scenarioId: null,
    title: '',
    opensAt: toLocalInput(now.toISOString()),
    dueAt: toLocalInput(due.toISOString()),
    limitAttempts: true,
    attemptLimit: 3,
    hintsAllowed: true,
    scorePolicy: 'best',
  }
}

export type AssignmentFormResult =
  { ok: true; body: CreateAssignmentRequest } | { ok: false; errors: Record<string, string> }

export function checkAssignmentForm(v: AssignmentFormValues): AssignmentFormResult {
  const candidate = {
    scenarioId: v.scenarioId ?? '',
    title: v.title.trim() || undefined,
    opensAt: fromLocalInput(v.opensAt),
    dueAt: fromLocalInput(v.dueAt),
    attemptLimit: v.limitAttempts ? Number(v.attemptLimit) : null,
    hintsAllowed: v.hintsAllowed,
    scorePolicy: v.scorePolicy,
  }
  const parsed = createAssignmentRequestSchema.safeParse(candidate)
  if (parsed.success) return { ok: true, body: parsed.data }
  const errors = issuesByField(parsed.error)
  if (!v.scenarioId) errors.scenarioId = 'Choose a scenario'
  if (!candidate.opensAt) errors.opensAt = 'Enter the opening date and time'
  if (!candidate.dueAt) errors.dueAt = 'Enter the due date and time'
  return { ok: false, errors }
}
