// A cohort row → the API's Cohort (with its owner's name and head count); an enrolment → a CohortMember.
import type { Cohort, CohortMember } from '@shared/api/cohorts'
import type { CohortRow, EnrollmentRow, UserRow } from '../entities'
import { shownEmail } from '@shared/api/users'

export const presentCohort = (
  row: CohortRow,
  related: { ownerName: string; memberCount: number },
): Cohort => ({
  id: row.id,
  name: row.name,
  description: row.description,
  ownerId: row.ownerId,
  ownerName: related.ownerName,
  archived: Boolean(row.archived),
  memberCount: related.memberCount,
  createdAt: row.createdAt,
})

export const presentCohortMember = (enrollment: EnrollmentRow, user: UserRow): CohortMember => ({
  userId: user.id,
  name: user.name,
  email: shownEmail(user.email),
  active: Boolean(user.active),
  enrolledAt: enrollment.createdAt,
})
