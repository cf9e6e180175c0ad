// An invitation row → the API's Invitation (staff lists) or InvitationPreview (the public acceptance page).
import type { Invitation, InvitationPreview } from '@shared/api/invitations'
import type { InvitationRow } from '../entities'

export const presentInvitation = (row: InvitationRow): Invitation => ({
  id: row.id,
  email: row.email,
  name: row.name,
  role: row.role,
  cohortId: row.cohortId,
  invitedById: row.invitedById,
  expiresAt: row.expiresAt,
  acceptedAt: row.acceptedAt,
  createdAt: row.createdAt,
})

/** What the person invited sees before choosing a password: names, not ids. */
export const presentInvitationPreview = (
  row: InvitationRow,
  names: { cohortName: string | null; invitedByName: string },
): InvitationPreview => ({
  email: row.email,
  name: row.name,
  role: row.role,
  cohortName: names.cohortName,
  invitedByName: names.invitedByName,
  expiresAt: row.expiresAt,
})
