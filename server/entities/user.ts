import { EntitySchema } from 'typeorm'
import type { Role } from '@shared/api/auth'
import {
  bool,
  integer,
  nullableBool,
  nullableTimestamp,
  text,
  timestamp,
  uuidPrimary,
  varchar,
} from './columns'

export interface UserRow {
  id: string
  email: string
  name: string
  role: Role
  passwordHash: string
  active: boolean
  /** Bumped to invalidate every access token at once (sign-out everywhere, password change). */
  tokenVersion: number
  createdAt: string
  updatedAt: string
  lastSignInAt: string | null
  /** Reminders before due dates (migration 1765400000000); null: never chosen, so on. */
  dueReminders?: boolean | null
  /** The instructors' daily digest; null: never chosen, so on. */
  dailyDigest?: boolean | null
}

export const UserEntity = new EntitySchema<UserRow>({
  name: 'User',
  tableName: 'users',
  columns: {
    id: uuidPrimary,
    email: { ...varchar(254), unique: true },
    name: varchar(120),
    role: varchar(16),
    passwordHash: text,
    active: bool,
    tokenVersion: integer,
    createdAt: timestamp,
    updatedAt: timestamp,
    lastSignInAt: nullableTimestamp,
    dueReminders: nullableBool,
    dailyDigest: nullableBool,
  },
})
