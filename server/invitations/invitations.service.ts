// Inviting people: a new address gets an e-mail with a one-time link; an existing apprentice is enrolled at once.
import { randomUUID } from 'node:crypto'
import type { EntityManager } from 'typeorm'
import { IsNull } from 'typeorm'
import type { Role } from '@shared/api/auth'
import type { InviteOutcome } from '@shared/api/invitations'
import { appLink, type AppContext } from '../context'
import { EnrollmentEntity, InvitationEntity, UserEntity, type CohortRow, type UserRow } from '../entities'
import { conflict } from '../http-error'
import { DAY, isoIn, nowIso } from '../infrastructure/clock'
import { invitationMail } from '../infrastructure/mail/templates'
import type { OutgoingMail } from '../infrastructure/mail/mailer'
import { presentInvitation } from '../services/presenters'
import { newOpaqueToken } from '../infrastructure/security/tokens'

export const INVITATION_TTL_MS = 7 * DAY

export interface InviteInput {
  email: string
  name: string
  role: Role
  cohort: CohortRow | null
  inviter: UserRow
}

/** Runs inside the caller's transaction; returns the mail to send once it has committed. */
export async function invite(
  ctx: AppContext,
  manager: EntityManager,
  input: InviteInput,
): Promise<{ outcome: InviteOutcome; mail?: OutgoingMail }> {
  const existing = await manager.getRepository(UserEntity).findOneBy({ email: input.email })
  if (existing) {
    if (existing.role !== 'apprentice' || input.role !== 'apprentice' || !input.cohort) {
      throw conflict('email_taken', `${input.email} already has an account`, {
        fields: { email: ['Already has an account'] },
      })
    }
    const enrollments = manager.getRepository(EnrollmentEntity)
    if (await enrollments.countBy({ cohortId: input.cohort.id, userId: existing.id })) {
      return { outcome: { outcome: 'alreadyMember', email: input.email, invitation: null } }
    }
    await enrollments.insert({
      id: randomUUID(),
      cohortId: input.cohort.id,
      userId: existing.id,
      createdAt: nowIso(),
    })
    return { outcome: { outcome: 'enrolled', email: input.email, invitation: null } }
  }
  const invitations = manager.getRepository(InvitationEntity)
  // A fresh invitation replaces an older pending one for the same address and cohort.
  await invitations.update(
    { email: input.email, cohortId: input.cohort ? input.cohort.id : IsNull(), acceptedAt: IsNull() },
    { expiresAt: nowIso() },
  )
  const { token, hash } = newOpaqueToken()
  const row = {
    id: randomUUID(),
    email: input.email,
    name: input.name,
    role: input.role,
    cohortId: input.cohort?.id ?? null,
    invitedById: input.inviter.id,
    tokenHash: hash,
    expiresAt: isoIn(INVITATION_TTL_MS),
    acceptedAt: null,
    createdAt: nowIso(),
  }
  await invitations.insert(row)
  const mail = invitationMail({
    to: input.email,
    name: input.name,
    invitedBy: input.inviter.name,
    cohortName: input.cohort?.name ?? null,
    role: input.role,
    url: appLink(ctx, `/invitation?token=${encodeURIComponent(token)}`),
    expiresAt: row.expiresAt,
  })
  return { outcome: { outcome: 'invited', email: input.email, invitation: presentInvitation(row) }, mail }
}
