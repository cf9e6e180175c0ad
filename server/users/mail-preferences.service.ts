// A user's choice of optional mail (reminders, digest), read and changed on their own profile.
import type { MailPreferences, UpdateMailPreferencesRequest } from '@shared/api/mail-preferences'
import type { AppContext } from '../context'
import { UserEntity, type UserRow } from '../entities'
import { nowIso } from '../infrastructure/clock'

/** Null (never chosen) means on. */
export const presentMailPreferences = (
  row: Pick<UserRow, 'dueReminders' | 'dailyDigest'>,
): MailPreferences => ({
  dueReminders: row.dueReminders !== false,
  dailyDigest: row.dailyDigest !== false,
})

export async function getMailPreferences(ctx: AppContext, user: UserRow): Promise<MailPreferences> {
  const row = await ctx.dataSource
    .getRepository(UserEntity)
    .findOneOrFail({ where: { id: user.id }, select: { id: true, dueReminders: true, dailyDigest: true } })
  return presentMailPreferences(row)
}

export async function updateMailPreferences(
  ctx: AppContext,
  user: UserRow,
  changes: UpdateMailPreferencesRequest,
): Promise<MailPreferences> {
  const set: Partial<UserRow> = {}
  if (changes.dueReminders !== undefined) set.dueReminders = changes.dueReminders
  if (changes.dailyDigest !== undefined) set.dailyDigest = changes.dailyDigest
  if (Object.keys(set).length)
    await ctx.dataSource.getRepository(UserEntity).update({ id: user.id }, { ...set, updatedAt: nowIso() })
  return getMailPreferences(ctx, user)
}
