// Invitations: a new address gets an e-mail with a one-time link; an existing apprentice is enrolled at once.
// Staff invite one address or a roster; the person invited previews the invitation and accepts it.
import { randomUUID } from 'node:crypto'
import type { EntityManager } from 'typeorm'
import { IsNull } from 'typeorm'
import type { z } from 'zod'
import type { Role } from '@shared/api/auth'
import {
  ROSTER_MAX_BYTES,
  type acceptInvitationRequestSchema,
  type Invitation,
  type InvitationPreview,
  type InviteOutcome,
  type RosterImportMode,
  type RosterImportResult,
  type RosterRowError,
} from '@shared/api/invitations'
import { cohortFor } from '../access/access.service'
import { startSession, type IssuedSession } from '../auth/sessions.service'
import { appLink, type AppContext } from '../context'
import {
  CohortEntity,
  EnrollmentEntity,
  InvitationEntity,
  UserEntity,
  type CohortRow,
  type InvitationRow,
  type UserRow,
} from '../entities'
import { HttpError, conflict } from '../http-error'
import { DAY, isoIn, nowIso } from '../infrastructure/clock'
import { centreTimeZone } from '../centre/centre.service'
import { queueMail } from '../infrastructure/mail/mail-job'
import { invitationMail } from '../infrastructure/mail/templates'
import { hashToken, newOpaqueToken } from '../infrastructure/security/tokens'
import { inTransactionWithUpload, uploadedText, type UploadKind } from '../infrastructure/storage/uploads'
import { presentInvitation, presentInvitationPreview } from './invitation.presenter'
import { readRoster } from './roster'

export const INVITATION_TTL_MS = 7 * DAY

export interface InviteInput {
  email: string
  name: string
  role: Role
  cohort: CohortRow | null
  inviter: UserRow
}

/** Runs inside the caller's transaction, and queues the invitation mail in it. */
async function invite(ctx: AppContext, manager: EntityManager, input: InviteInput): Promise<InviteOutcome> {
  const existing = await manager.getRepository(UserEntity).findOneBy({ email: input.email })
  if (existing) {
    if (existing.role !== 'apprentice' || input.role !== 'apprentice' || !input.cohort) {
      throw conflict('email_taken', `${input.email} already has an account`, {
        fields: { email: ['Already has an account'] },
      })
    }
    const enrollments = manager.getRepository(EnrollmentEntity)
    if (await enrollments.countBy({ cohortId: input.cohort.id, userId: existing.id })) {
      return { outcome: 'alreadyMember', email: input.email, invitation: null }
    }
    await enrollments.insert({
      id: randomUUID(),
      cohortId: input.cohort.id,
      userId: existing.id,
      createdAt: nowIso(),
    })
    return { outcome: 'enrolled', email: input.email, invitation: null }
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
  await queueInvitationMail(ctx, manager, row, token, {
    inviterName: input.inviter.name,
    cohortName: input.cohort?.name ?? null,
  })
  return { outcome: 'invited', email: input.email, invitation: presentInvitation(row) }
}

/** The invitation mail with its one-time link (a fresh token: only its hash is stored). */
export async function queueInvitationMail(
  ctx: AppContext,
  manager: EntityManager,
  row: InvitationRow,
  token: string,
  names: { inviterName: string; cohortName: string | null },
) {
  await queueMail(
    manager,
    invitationMail({
      to: row.email,
      name: row.name,
      invitedBy: names.inviterName,
      cohortName: names.cohortName,
      role: row.role,
      url: invitationUrl(ctx, token),
      expiresAt: row.expiresAt,
      // The expiry date in the mail is on the centre's clock.
      timeZone: await centreTimeZone(manager),
    }),
  )
}

export const invitationUrl = (ctx: AppContext, token: string) =>
  appLink(ctx, `/invitation?token=${encodeURIComponent(token)}`)

export const ROSTER_UPLOAD: UploadKind = {
  purpose: 'roster',
  field: 'roster',
  maxBytes: ROSTER_MAX_BYTES,
  extensions: ['.csv'],
  mimeTypes: ['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel'],
  label: 'roster',
}
type AcceptInvitation = z.output<typeof acceptInvitationRequestSchema>

const invalid = () =>
  new HttpError(404, 'invitation_invalid', 'This invitation has expired, was replaced or was already used')

/** Invites an instructor (admins only; no cohort). */
export async function inviteInstructor(
  ctx: AppContext,
  inviter: UserRow,
  person: { email: string; name: string },
): Promise<InviteOutcome> {
  return ctx.dataSource.transaction((manager) =>
    invite(ctx, manager, { ...person, role: 'instructor', cohort: null, inviter }),
  )
}

/** A cohort its instructor may invite into: managed by the inviter, not archived. */
async function openCohortFor(ctx: AppContext, user: UserRow, cohortId: string): Promise<CohortRow> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  if (cohort.archived)
    throw new HttpError(409, 'cohort_archived', 'This cohort is archived; restore it first')
  return cohort
}

export async function inviteToCohort(
  ctx: AppContext,
  inviter: UserRow,
  cohortId: string,
  person: { email: string; name: string },
): Promise<InviteOutcome> {
  const cohort = await openCohortFor(ctx, inviter, cohortId)
  return ctx.dataSource.transaction((manager) =>
    invite(ctx, manager, { ...person, role: 'apprentice', cohort, inviter }),
  )
}

/**
 * Invites the rows of a roster CSV. `all` (the default): every row or nobody — any problem is reported per
 * row and nothing is kept. `valid`: the rows that can be invited are, and the others come back as `skipped`
 * with their reasons (a file that cannot be read at all is still refused).
 */
export async function inviteRoster(
  ctx: AppContext,
  inviter: UserRow,
  cohortId: string,
  upload: Express.Multer.File | undefined,
  mode: RosterImportMode = 'all',
): Promise<RosterImportResult> {
  const cohort = await openCohortFor(ctx, inviter, cohortId)
  const { file, text } = uploadedText({ file: upload }, ROSTER_UPLOAD)
  const { rows, errors } = readRoster(text)
  const fileErrors = errors.filter((e) => e.field.startsWith('('))
  if (fileErrors.length || (errors.length && mode === 'all')) {
    throw new HttpError(
      400,
      'roster_invalid',
      `The roster has ${errors.length} problem(s); nothing was imported`,
      { rows: errors },
    )
  }
  const skipped: RosterRowError[] = [...errors]
  const result = await inTransactionWithUpload(ctx, inviter.id, ROSTER_UPLOAD, file, async (manager) => {
    const done: InviteOutcome[] = []
    for (const row of rows) {
      try {
        done.push(
          await invite(ctx, manager, {
            email: row.email,
            name: row.name,
            role: 'apprentice',
            cohort,
            inviter,
          }),
        )
      } catch (error) {
        // invite() refuses before it writes anything, so the transaction stays usable for the next row.
        if (error instanceof HttpError && mode === 'valid') {
          skipped.push({ row: row.line, field: 'email', message: error.message })
          continue
        }
        if (error instanceof HttpError) {
          throw new HttpError(400, 'roster_invalid', 'The roster has 1 problem(s); nothing was imported', {
            rows: [{ row: row.line, field: 'email', message: error.message }],
          })
        }
        throw error
      }
    }
    if (!done.length) {
      throw new HttpError(400, 'roster_invalid', 'No row of the roster can be imported; nothing was', {
        rows: skipped,
      })
    }
    return done
  })
  return { items: result, skipped: skipped.sort((a, b) => a.row - b.row) }
}

/** The cohort's invitations still waiting for an answer (not accepted, not expired). */
export async function pendingCohortInvitations(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<Invitation[]> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const rows = await ctx.dataSource.getRepository(InvitationEntity).find({
    where: { cohortId: cohort.id, acceptedAt: IsNull() },
    order: { createdAt: 'DESC' },
  })
  return rows.filter((r) => r.expiresAt > nowIso()).map(presentInvitation)
}

async function pending(ctx: AppContext, token: string) {
  const row = await ctx.dataSource
    .getRepository(InvitationEntity)
    .findOneBy({ tokenHash: hashToken(token), acceptedAt: IsNull() })
  if (!row || row.expiresAt <= nowIso()) throw invalid()
  return row
}

export async function previewInvitation(ctx: AppContext, token: string): Promise<InvitationPreview> {
  const ds = ctx.dataSource
  const row = await pending(ctx, token)
  const cohort = row.cohortId ? await ds.getRepository(CohortEntity).findOneBy({ id: row.cohortId }) : null
  const inviter = await ds.getRepository(UserEntity).findOneBy({ id: row.invitedById })
  return presentInvitationPreview(row, {
    cohortName: cohort?.name ?? null,
    invitedByName: inviter?.name ?? '',
  })
}

/** Creates the account the invitation is for, enrols it, and signs it in. */
export async function acceptInvitation(
  ctx: AppContext,
  token: string,
  body: AcceptInvitation,
): Promise<IssuedSession> {
  const invitation = await pending(ctx, token)
  const passwordHash = await ctx.passwords.hash(body.password)
  const user = await ctx.dataSource.transaction(async (manager) => {
    const users = manager.getRepository(UserEntity)
    if (await users.countBy({ email: invitation.email })) {
      throw conflict('email_taken', 'An account with this e-mail already exists; sign in instead')
    }
    // Marking it accepted only if still pending makes a double submit fail cleanly.
    const claimed = await manager
      .getRepository(InvitationEntity)
      .update({ id: invitation.id, acceptedAt: IsNull() }, { acceptedAt: nowIso() })
    if (!claimed.affected) throw invalid()
    const now = nowIso()
    const row: UserRow = {
      id: randomUUID(),
      email: invitation.email,
      name: body.name ?? invitation.name,
      role: invitation.role,
      passwordHash,
      active: true,
      tokenVersion: 0,
      createdAt: now,
      updatedAt: now,
      lastSignInAt: now,
    }
    await users.insert(row)
    // Other pending invitations of the same address (other cohorts) are honoured at once.
    const others = await manager
      .getRepository(InvitationEntity)
      .findBy({ email: invitation.email, acceptedAt: IsNull() })
    const cohortIds = new Set(
      [invitation, ...others.filter((o) => o.expiresAt > now && o.role === invitation.role)]
        .map((i) => i.cohortId)
        .filter((id): id is string => id !== null),
    )
    for (const cohortId of cohortIds) {
      await manager
        .getRepository(EnrollmentEntity)
        .insert({ id: randomUUID(), cohortId, userId: row.id, createdAt: now })
    }
    await manager
      .getRepository(InvitationEntity)
      .update({ email: invitation.email, acceptedAt: IsNull() }, { acceptedAt: now })
    return row
  })
  return startSession(ctx, user)
}
