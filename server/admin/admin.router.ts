// /api/admin: accounts (list, role, deactivate, end sessions), instructor invitations, the outbox, backups.
import { randomUUID } from 'node:crypto'
import { createReadStream, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { Router } from 'express'
import { ILike } from 'typeorm'
import { idParamsSchema } from '@shared/api/common'
import { inviteRequestSchema, type InviteRequest } from '@shared/api/invitations'
import { outboxQuerySchema } from '@shared/api/admin'
import { updateUserRequestSchema, userListQuerySchema, type UpdateUserRequest } from '@shared/api/users'
import type { Role } from '@shared/api/auth'
import type { AppContext } from '../context'
import { AuditEntryEntity, MailMessageEntity, UserEntity } from '../entities'
import { HttpError, conflict, notFound } from '../http-error'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { writeBackup } from '../infrastructure/database/backup'
import { nowIso } from '../infrastructure/clock'
import { invite } from '../invitations/invitations.service'
import { presentMail, presentUser } from '../services/presenters'
import { endAllSessions } from '../auth/sessions.service'

export function adminRouter(ctx: AppContext): Router {
  const router = Router()
  const ds = ctx.dataSource
  router.use(authenticate(ctx), requireRole('admin'))

  router.get('/users', validate({ query: userListQuerySchema }), async (req, res) => {
    const { page, pageSize, role, q, active } = req.query as unknown as {
      page: number
      pageSize: number
      role?: Role
      q?: string
      active?: boolean
    }
    const base = { ...(role ? { role } : {}), ...(active === undefined ? {} : { active }) }
    const where = q
      ? [
          // ILike: case-insensitive on PostgreSQL too (SQLite's LIKE already is, for ASCII).
          { ...base, name: ILike(`%${q}%`) },
          { ...base, email: ILike(`%${q.toLowerCase()}%`) },
        ]
      : base
    const [rows, total] = await ds.getRepository(UserEntity).findAndCount({
      where,
      order: { name: 'ASC' },
      skip: (page - 1) * pageSize,
      take: pageSize,
    })
    res.json({ items: rows.map(presentUser), total, page, pageSize })
  })

  router.patch(
    '/users/:id',
    validate({ params: idParamsSchema, body: updateUserRequestSchema }),
    async (req, res) => {
      const admin = currentUser(req)
      const changes = req.body as UpdateUserRequest
      const updated = await ds.transaction(async (manager) => {
        const users = manager.getRepository(UserEntity)
        const user = await users.findOneBy({ id: String(req.params.id) })
        if (!user) throw notFound('User')
        if (
          user.id === admin.id &&
          (changes.active === false || (changes.role && changes.role !== 'admin'))
        ) {
          throw conflict('conflict', 'You cannot demote or deactivate your own account')
        }
        const next = {
          ...user,
          role: changes.role ?? user.role,
          active: changes.active ?? Boolean(user.active),
        }
        await users.update({ id: user.id }, { role: next.role, active: next.active, updatedAt: nowIso() })
        await manager.getRepository(AuditEntryEntity).insert({
          id: randomUUID(),
          actorId: admin.id,
          action: 'account.changed',
          entityType: 'user',
          entityId: user.id,
          fromValue: JSON.stringify({ role: user.role, active: Boolean(user.active) }),
          toValue: JSON.stringify({ role: next.role, active: next.active }),
          reason: '',
          createdAt: nowIso(),
        })
        // A new role or a deactivation takes effect at once: outstanding tokens stop working.
        if (next.role !== user.role || next.active !== Boolean(user.active))
          await endAllSessions(manager, user.id)
        return users.findOneByOrFail({ id: user.id })
      })
      res.json({ user: presentUser(updated) })
    },
  )

  router.post('/users/:id/sign-out', validate({ params: idParamsSchema }), async (req, res) => {
    const user = await ds.getRepository(UserEntity).findOneBy({ id: String(req.params.id) })
    if (!user) throw notFound('User')
    await ds.transaction((manager) => endAllSessions(manager, user.id))
    res.status(204).end()
  })

  router.post(
    '/invitations',
    ctx.limits.invitations,
    validate({ body: inviteRequestSchema }),
    async (req, res) => {
      const { email, name } = req.body as Required<InviteRequest>
      const { outcome, mail } = await ds.transaction((manager) =>
        invite(ctx, manager, { email, name, role: 'instructor', cohort: null, inviter: currentUser(req) }),
      )
      if (mail) ctx.mailer.send(mail)
      res.status(201).json(outcome)
    },
  )

  router.get('/outbox', validate({ query: outboxQuerySchema }), async (req, res) => {
    const { page, pageSize, to } = req.query as unknown as { page: number; pageSize: number; to?: string }
    const [rows, total] = await ds.getRepository(MailMessageEntity).findAndCount({
      where: to ? { toAddress: ILike(`%${to}%`) } : {},
      order: { receivedAt: 'DESC' },
      skip: (page - 1) * pageSize,
      take: pageSize,
    })
    res.json({ items: rows.map(presentMail), total, page, pageSize })
  })

  // A consistent SQLite copy made while the app keeps running (from PostgreSQL too: services/backup.ts).
  router.get('/backup', async (_req, res) => {
    const dir = mkdtempSync(join(tmpdir(), 'slipway-backup-'))
    const file = join(dir, 'slipway.sqlite')
    try {
      await writeBackup(ds, file)
    } catch (err) {
      rmSync(dir, { recursive: true, force: true })
      ctx.log.error({ err }, 'backup failed')
      throw new HttpError(500, 'internal_error', 'The backup could not be made')
    }
    const stamp = nowIso().replace(/[:.]/g, '-')
    res.setHeader('Content-Type', 'application/vnd.sqlite3')
    res.setHeader('Content-Disposition', `attachment; filename="slipway-backup-${stamp}.sqlite"`)
    const stream = createReadStream(file)
    stream.on('close', () => rmSync(dir, { recursive: true, force: true }))
    stream.pipe(res)
  })

  return router
}
