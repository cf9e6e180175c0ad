// The first admin of a production database, which never gets the demo's: from `npm run admin:create` or from
// ADMIN_EMAIL, ADMIN_NAME and ADMIN_PASSWORD at start (created once, when no admin exists yet).
import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { passwordSchema } from '@shared/api/auth'
import { emailSchema, personNameSchema } from '@shared/api/common'
import { z } from 'zod'
import { AuditEntryEntity, UserEntity, type UserRow } from '../entities'
import { nowIso } from '../infrastructure/clock'
import type { Logger } from '../infrastructure/logging'
import type { PasswordHasher } from '../infrastructure/security/passwords'

export const adminAccountSchema = z.object({
  email: emailSchema,
  name: personNameSchema,
  password: passwordSchema,
})
export type AdminAccount = z.input<typeof adminAccountSchema>

export class AdminAccountError extends Error {}

export async function hasActiveAdmin(ds: DataSource): Promise<boolean> {
  return (await ds.getRepository(UserEntity).countBy({ role: 'admin', active: true })) > 0
}

/** Creates an admin account (audited); refuses an address that already has an account. */
export async function createAdminAccount(
  ds: DataSource,
  passwords: PasswordHasher,
  account: AdminAccount,
  how: string,
): Promise<UserRow> {
  const parsed = adminAccountSchema.safeParse(account)
  if (!parsed.success) {
    throw new AdminAccountError(
      parsed.error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`).join('\n'),
    )
  }
  const { email, name, password } = parsed.data
  const passwordHash = await passwords.hash(password)
  return ds.transaction(async (manager) => {
    const users = manager.getRepository(UserEntity)
    if (await users.countBy({ email })) throw new AdminAccountError(`${email} already has an account`)
    const now = nowIso()
    const user: UserRow = {
      id: randomUUID(),
      email,
      name,
      role: 'admin',
      passwordHash,
      active: true,
      tokenVersion: 0,
      createdAt: now,
      updatedAt: now,
      lastSignInAt: null,
    }
    await users.insert(user)
    await manager.getRepository(AuditEntryEntity).insert({
      id: randomUUID(),
      actorId: null,
      action: 'account.created',
      entityType: 'user',
      entityId: user.id,
      fromValue: null,
      toValue: JSON.stringify({ role: 'admin' }),
      reason: how,
      createdAt: now,
    })
    return user
  })
}

/** At start: the admin from the environment, if one is given and the database has no active admin yet. */
export async function ensureFirstAdmin(
  ds: DataSource,
  passwords: PasswordHasher,
  account: AdminAccount | undefined,
  log: Logger,
): Promise<void> {
  if (!account || (await hasActiveAdmin(ds))) return
  try {
    const user = await createAdminAccount(ds, passwords, account, 'First admin, from ADMIN_EMAIL at start')
    log.info(
      { email: user.email },
      'first admin account created from ADMIN_EMAIL; ADMIN_PASSWORD may now be removed',
    )
  } catch (error) {
    // An address that already has an account (say, a deactivated admin's): start anyway, and say what to do.
    if (!(error instanceof AdminAccountError)) throw error
    log.warn(
      `no admin created from ADMIN_EMAIL: ${error.message}; use npm run admin:create with another address`,
    )
  }
}

/** What to do when there is no admin: printed at start and by the command's help. */
export const FIRST_ADMIN_HELP = [
  'No admin account exists yet. Create the first one with either:',
  '  npm run admin:create -- --email you@example.org --name "Your Name"   (asks for the password)',
  '  or set ADMIN_EMAIL, ADMIN_NAME and ADMIN_PASSWORD and start again (created once; then remove them).',
].join('\n')
