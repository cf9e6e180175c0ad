// /api/invitations/:token — public: preview an invitation and accept it by choosing a password.
import { randomUUID } from 'node:crypto'
import { Router } from 'express'
import { IsNull } from 'typeorm'
import {
  acceptInvitationRequestSchema,
  invitationTokenParamsSchema,
  type AcceptInvitationRequest,
} from '@shared/api/invitations'
import type { AppContext } from '../context'
import { CohortEntity, EnrollmentEntity, InvitationEntity, UserEntity, type UserRow } from '../entities'
import { HttpError, conflict } from '../http-error'
import { validate } from '../middleware/validate'
import { nowIso } from '../infrastructure/clock'
import { startSession } from '../auth/sessions.service'
import { hashToken } from '../infrastructure/security/tokens'

const invalid = () =>
  new HttpError(404, 'invitation_invalid', 'This invitation has expired, was replaced or was already used')

export function invitationsRouter(ctx: AppContext): Router {
  const router = Router()
  const ds = ctx.dataSource
  const limit = ctx.limits.invitations

  async function pending(token: string) {
    const row = await ds
      .getRepository(InvitationEntity)
      .findOneBy({ tokenHash: hashToken(token), acceptedAt: IsNull() })
    if (!row || row.expiresAt <= nowIso()) throw invalid()
    return row
  }

  router.get('/:token', limit, validate({ params: invitationTokenParamsSchema }), async (req, res) => {
    const row = await pending(String(req.params.token))
    const cohort = row.cohortId ? await ds.getRepository(CohortEntity).findOneBy({ id: row.cohortId }) : null
    const inviter = await ds.getRepository(UserEntity).findOneBy({ id: row.invitedById })
    res.json({
      email: row.email,
      name: row.name,
      role: row.role,
      cohortName: cohort?.name ?? null,
      invitedByName: inviter?.name ?? '',
      expiresAt: row.expiresAt,
    })
  })

  router.post(
    '/:token/accept',
    limit,
    validate({ params: invitationTokenParamsSchema, body: acceptInvitationRequestSchema }),
    async (req, res) => {
      const body = req.body as AcceptInvitationRequest
      const invitation = await pending(String(req.params.token))
      const passwordHash = await ctx.passwords.hash(body.password)
      const user = await ds.transaction(async (manager) => {
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
      res.status(201).json(await startSession(ctx, res, user))
    },
  )

  return router
}
