// A user row → the API's User: never the password hash or the token version.
import type { User } from '@shared/api/auth'
import type { UserRow } from '../entities'
import { shownEmail } from '@shared/api/users'

export const presentUser = (row: UserRow): User => ({
  id: row.id,
  email: shownEmail(row.email),
  name: row.name,
  role: row.role,
  active: Boolean(row.active),
  createdAt: row.createdAt,
  lastSignInAt: row.lastSignInAt,
})
