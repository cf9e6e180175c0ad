// Where an attempt's result is read: the apprentice's own result page, or the instructor's review.
import type { Role } from '@shared/api'

export function attemptResultPath(attemptId: string, role: Role | null): string {
  return role === 'apprentice' ? `/learn/attempts/${attemptId}` : `/teach/attempts/${attemptId}`
}
