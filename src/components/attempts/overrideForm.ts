// The grade-override form checked with the shared schema before sending.
import { gradeOverrideRequestSchema, type GradeOverrideRequest } from '@shared/api'
import { issuesByField } from '@/composables/validation'

export interface OverrideValues {
  score: number | string
  passed: boolean
  reason: string
}

export function checkOverride(
  v: OverrideValues,
): { ok: true; body: GradeOverrideRequest } | { ok: false; errors: Record<string, string> } {
  const score = v.score === '' ? NaN : Number(v.score)
  const parsed = gradeOverrideRequestSchema.safeParse({ score, passed: v.passed, reason: v.reason })
  if (parsed.success) return { ok: true, body: parsed.data }
  const errors = issuesByField(parsed.error)
  if (errors.score) errors.score = 'Enter a score from 0 to 100'
  return { ok: false, errors }
}
