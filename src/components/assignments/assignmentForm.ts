// The assign-a-scenario form's values and their check against the shared request schema.
import { createAssignmentRequestSchema, type CreateAssignment, type ScorePolicy } from '@shared/api'
import type { LatePolicy } from '@shared/progress'
import { DEFAULT_ASSISTANCE_LEVEL, type AssistanceLevel } from '@shared/scenario/assistance'
import { fromLocalInput, toLocalInput } from '@/composables/format'
import { issuesByField } from '@/composables/validation'

export interface AssignmentFormValues {
  scenarioId: string | null
  title: string
  opensAt: string // datetime-local value
  dueAt: string // datetime-local value
  limitAttempts: boolean
  attemptLimit: number | string | null
  /** How much help an attempt gets; hints follow from it (none in an assessment). */
  assistanceLevel: AssistanceLevel
  /** Which score a learning platform's gradebook receives. */
  scorePolicy: ScorePolicy
  latePolicy: LatePolicy
  latePenalty: number | string
}

export function defaultAssignmentForm(now = new Date()): AssignmentFormValues {
  // A week today at five in the afternoon, on the centre's clock.
  const inAWeek = toLocalInput(new Date(now.getTime() + 7 * 24 * 3600 * 1000).toISOString())
  return {
    scenarioId: null,
    title: '',
    opensAt: toLocalInput(now.toISOString()),
    dueAt: `${inAWeek.slice(0, 10)}T17:00`,
    limitAttempts: true,
    attemptLimit: 3,
    assistanceLevel: DEFAULT_ASSISTANCE_LEVEL,
    scorePolicy: 'best',
    latePolicy: 'acceptLate',
    latePenalty: 10,
  }
}

export type AssignmentFormResult =
  { ok: true; body: CreateAssignment } | { ok: false; errors: Record<string, string> }

export function checkAssignmentForm(v: AssignmentFormValues): AssignmentFormResult {
  const candidate = {
    scenarioId: v.scenarioId ?? '',
    title: v.title.trim() || undefined,
    opensAt: fromLocalInput(v.opensAt),
    dueAt: fromLocalInput(v.dueAt),
    attemptLimit: v.limitAttempts ? Number(v.attemptLimit) : null,
    assistanceLevel: v.assistanceLevel,
    scorePolicy: v.scorePolicy,
    latePolicy: v.latePolicy,
    latePenalty: v.latePolicy === 'acceptLate' ? Number(v.latePenalty) : 0,
  }
  const parsed = createAssignmentRequestSchema.safeParse(candidate)
  if (parsed.success) return { ok: true, body: parsed.data }
  const errors = issuesByField(parsed.error)
  if (!v.scenarioId) errors.scenarioId = 'Choose a scenario'
  if (!candidate.opensAt) errors.opensAt = 'Enter the opening date and time'
  if (!candidate.dueAt) errors.dueAt = 'Enter the due date and time'
  return { ok: false, errors }
}
