// Accounts as an admin manages them: the searchable list, a change of role or active flag (audited, and
// ending the account's sessions), and signing an account out everywhere.
import { randomUUID } from 'node:crypto'
import { ILike } from 'typeorm'
import type { z } from 'zod'
import type { User } from '@shared/api/auth'
import type { UpdateUserRequest, UserPage, userListQuerySchema } from '@shared/api/users'
import { endAllSessions } from '../auth/sessions.service'
import type { AppContext } from '../context'
import { AuditEntryEntity, UserEntity, type UserRow } from '../entities'
import { conflict, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { presentUser } from './user.presenter'

type UserListQuery = z.output<typeof userListQuerySchema>

export async function listUsers(
  ctx: AppContext,
  { page, pageSize, role, q, active }: UserListQuery,
): Promise<UserPage> {
  const base = { ...(role ? { role } : {}), ...(active === undefined ? {} : { active }) }
  const where = q
    ? [
        // ILike: case-insensitive on PostgreSQL too (SQLite's LIKE already is, for ASCII).
        { ...base, name: ILike(`%${q}%`) },
        { ...base, email: ILike(`%${q.toLowerCase()}%`) },
      ]
    : base
  const [rows, total] = await ctx.dataSource.getRepository(UserEntity).findAndCount({
    where,
    order: { name: 'ASC' },
    skip: (page - 1) * pageSize,
    take: pageSize,
  })
  return { items: rows.map(presentUser), total, page, pageSize }
}

/** A new role or a deactivation takes effect at once: the account's outstanding tokens stop working. */
export async function changeUser(
  ctx: AppContext,
  admin: UserRow,
  userId: string,
  changes: UpdateUserRequest,
): Promise<User> {
  const updated = await ctx.dataSource.transaction(async (manager) => {
    const users = manager.getRepository(UserEntity)
    const user = await users.findOneBy({ id: userId })
    if (!user) throw notFound('User')
    if (user.id === admin.id && (changes.active === false || (changes.role && changes.role !== 'admin'))) {
      throw conflict('conflict', 'You cannot demote or deactivate your own account')
    }
    const next = { role: changes.role ?? user.role, active: changes.active ?? Boolean(user.active) }
    await users.update({ id: user.id }, { ...next, updatedAt: nowIso() })
    await manager.getRepository(AuditEntryEntity).insert({
      id: randomUUID(),
      actorId: admin.id,
      action: 'account.changed',
      entityType: 'user',
      entityId: user.id,
      fromValue: JSON.stringify({ role: user.role, active: Boolean(user.active) }),
      toValue: JSON.stringify(next),
      reason: '',
      createdAt: nowIso(),
    })
    if (next.role !== user.role || next.active !== Boolean(user.active))
      await endAllSessions(manager, user.id)
    return users.findOneByOrFail({ id: user.id })
  })
  return presentUser(updated)
}

export async function signOutUser(ctx: AppContext, userId: string): Promise<void> {
  const user = await ctx.dataSource.getRepository(UserEntity).findOneBy({ id: userId })
  if (!user) throw notFound('User')
  await ctx.dataSource.transaction((manager) => endAllSessions(manager, user.id))
}
