// Database rows → API shapes (shared/api). Nothing secret (hashes, tokens) ever passes through.
import type { User } from '@shared/api/auth'
import type { Invitation } from '@shared/api/invitations'
import type { ScenarioSummary, ScenarioDetail } from '@shared/api/scenarios'
import type { MailMessage } from '@shared/api/admin'
import type { InvitationRow, MailMessageRow, ScenarioRow, UserRow } from '../entities'

export const presentUser = (row: UserRow): User => ({
  id: row.id,
  email: row.email,
  name: row.name,
  role: row.role,
  active: Boolean(row.active),
  createdAt: row.createdAt,
  lastSignInAt: row.lastSignInAt,
})

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

export function presentScenario(row: ScenarioRow): ScenarioSummary {
  const document = JSON.parse(row.document) as {
    story?: string
    difficulty?: string
    estimatedMinutes?: number
  }
  return {
    id: row.id,
    key: row.key,
    version: row.version,
    title: row.title,
    story: document.story ?? '',
    difficulty: document.difficulty ?? 'introductory',
    estimatedMinutes: document.estimatedMinutes ?? 0,
    status: row.status,
    createdById: row.createdById,
    createdAt: row.createdAt,
  }
}

export const presentScenarioDetail = (row: ScenarioRow): ScenarioDetail => ({
  ...presentScenario(row),
  document: JSON.parse(row.document),
})

export const presentMail = (row: MailMessageRow): MailMessage => ({
  id: row.id,
  from: row.fromAddress,
  to: row.toAddress,
  subject: row.subject,
  text: row.text,
  html: row.html,
  receivedAt: row.receivedAt,
})
