// What staff do with an invitation still waiting for an answer: send it again, hand over a new link another
// way (copy it), withdraw it; and the admins' list of everyone still invited. Only a token's hash is stored,
// so "resend" and "copy link" both make a new token: the earlier link stops working, which is what the
// screens say. An instructor acts on the invitations of cohorts they manage, an admin on any.
import { In, IsNull, MoreThan, type EntityManager } from 'typeorm'
import type { Page, PageQuery } from '@shared/api/common'
import type { Invitation, InvitationLink, PendingInvitation } from '@shared/api/invitations'
import { cohortFor } from '../access/access.service'
import type { AppContext } from '../context'
import { CohortEntity, InvitationEntity, UserEntity, type InvitationRow, type UserRow } from '../entities'
import { HttpError, notFound } from '../http-error'
import { isoIn, nowIso } from '../infrastructure/clock'
import { newOpaqueToken } from '../infrastructure/security/tokens'
import { presentInvitation } from './invitation.presenter'
import { INVITATION_TTL_MS, invitationUrl, queueInvitationMail } from './invitations.service'

/** Which invitations the caller may act on: one cohort's (checked as its manager), or any (admins). */
export type InvitationScope = { cohortId: string } | 'any'

async function pendingRow(
  ctx: AppContext,
  manager: EntityManager,
  user: UserRow,
  scope: InvitationScope,
  invitationId: string,
  /** Withdrawing is allowed in an archived cohort; sending is not. */
  sending = true,
): Promise<InvitationRow> {
  let cohortId: string | undefined
  if (scope !== 'any') {
    const cohort = await cohortFor(ctx.dataSource, user, scope.cohortId, 'manage')
    if (cohort.archived && sending)
      throw new HttpError(409, 'cohort_archived', 'This cohort is archived; restore it first')
    cohortId = cohort.id
  }
  const row = await manager.getRepository(InvitationEntity).findOneBy({
    id: invitationId,
    acceptedAt: IsNull(),
    ...(cohortId ? { cohortId } : {}),
  })
  if (!row || row.expiresAt <= nowIso()) throw notFound('Pending invitation')
  return row
}

/** A new token and a fresh week for the invitation; returns the row as changed and the token. */
async function renew(manager: EntityManager, row: InvitationRow) {
  const { token, hash } = newOpaqueToken()
  const changed: InvitationRow = { ...row, tokenHash: hash, expiresAt: isoIn(INVITATION_TTL_MS) }
  await manager
    .getRepository(InvitationEntity)
    .update({ id: row.id }, { tokenHash: changed.tokenHash, expiresAt: changed.expiresAt })
  return { row: changed, token }
}

/** Sends the invitation again, with a new link valid for another week. */
export async function resendInvitation(
  ctx: AppContext,
  user: UserRow,
  scope: InvitationScope,
  invitationId: string,
): Promise<Invitation> {
  return ctx.dataSource.transaction(async (manager) => {
    const { row, token } = await renew(manager, await pendingRow(ctx, manager, user, scope, invitationId))
    const inviter = await manager.getRepository(UserEntity).findOneBy({ id: row.invitedById })
    const cohort = row.cohortId
      ? await manager.getRepository(CohortEntity).findOneBy({ id: row.cohortId })
      : null
    await queueInvitationMail(ctx, manager, row, token, {
      inviterName: inviter?.name ?? user.name,
      cohortName: cohort?.name ?? null,
    })
    return presentInvitation(row)
  })
}

/** A new link to hand over another way (no mail); the one sent before stops working. */
export async function newInvitationLink(
  ctx: AppContext,
  user: UserRow,
  scope: InvitationScope,
  invitationId: string,
): Promise<InvitationLink> {
  return ctx.dataSource.transaction(async (manager) => {
    const { row, token } = await renew(manager, await pendingRow(ctx, manager, user, scope, invitationId))
    return { url: invitationUrl(ctx, token), expiresAt: row.expiresAt }
  })
}

/** Withdrawn = expired now; the link stops working and the record stays for the history. */
export async function revokeInvitation(
  ctx: AppContext,
  user: UserRow,
  scope: InvitationScope,
  invitationId: string,
): Promise<void> {
  await ctx.dataSource.transaction(async (manager) => {
    const row = await pendingRow(ctx, manager, user, scope, invitationId, false)
    await manager.getRepository(InvitationEntity).update({ id: row.id }, { expiresAt: nowIso() })
  })
}

/** Invitations still waiting for an answer, a page at a time, newest first, with cohort and inviter in names (admins). */
export async function pendingInvitationPage(
  ctx: AppContext,
  query: PageQuery,
): Promise<Page<PendingInvitation>> {
  const ds = ctx.dataSource
  const [rows, total] = await ds.getRepository(InvitationEntity).findAndCount({
    where: { acceptedAt: IsNull(), expiresAt: MoreThan(nowIso()) },
    // The id breaks ties so a roster's invitations (one timestamp) keep their place between pages.
    order: { createdAt: 'DESC', id: 'ASC' },
    skip: (query.page - 1) * query.pageSize,
    take: query.pageSize,
  })
  const cohortIds = [...new Set(rows.map((r) => r.cohortId).filter((id): id is string => id !== null))]
  const inviterIds = [...new Set(rows.map((r) => r.invitedById))]
  const cohorts = new Map(
    (cohortIds.length ? await ds.getRepository(CohortEntity).findBy({ id: In(cohortIds) }) : []).map((c) => [
      c.id,
      c,
    ]),
  )
  const inviters = new Map(
    (inviterIds.length ? await ds.getRepository(UserEntity).findBy({ id: In(inviterIds) }) : []).map((u) => [
      u.id,
      u,
    ]),
  )
  const items = rows.map((row) => ({
    ...presentInvitation(row),
    cohortName: row.cohortId ? (cohorts.get(row.cohortId)?.name ?? null) : null,
    invitedByName: inviters.get(row.invitedById)?.name ?? '',
  }))
  return { items, total, page: query.page, pageSize: query.pageSize }
}
