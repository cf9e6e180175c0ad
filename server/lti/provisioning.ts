// People and courses coming in from a platform: a platform user (issuer + subject) becomes a Slipway account
// on first sight, a course (context) becomes a cohort, a learner is enrolled in it. Shared by launches and
// roster pulls. Accounts are never matched by e-mail: a platform vouches for its own users, not for whoever
// holds an address in Slipway, so an existing Slipway account with the same address stays separate.
import { createHash, randomUUID } from 'node:crypto'
import type { EntityManager } from 'typeorm'
import { PLACEHOLDER_EMAIL_DOMAIN } from '@shared/api/users'
import type { AppContext } from '../context'
import {
  CohortEntity,
  EnrollmentEntity,
  LtiContextEntity,
  LtiIdentityEntity,
  UserEntity,
  type CohortRow,
  type LtiContextRow,
  type LtiPlatformRow,
  type UserRow,
} from '../entities'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import { refuse } from './refusal'

/** What a platform tells about a person (launch claims or an NRPS member). */
export interface PlatformPerson {
  subject: string
  role: 'apprentice' | 'instructor'
  name?: string
  givenName?: string
  familyName?: string
  email?: string
}

const NAME_NOT_SHARED = 'Course member (name not shared)'
const EMAIL_SHAPE = /^[^\s@]+@[^\s@]+\.[^\s@]+$/

function displayName(person: PlatformPerson): string | undefined {
  const name = person.name?.trim() || [person.givenName, person.familyName].filter(Boolean).join(' ').trim()
  return name ? name.slice(0, 120) : undefined
}

/**
 * users.email is unique and required; when the platform shares no address, or one another account holds,
 * the account gets an address under the reserved `.invalid` top-level domain (RFC 2606), which the mailer
 * never sends to.
 */
function placeholderEmail(issuer: string, subject: string): string {
  const digest = createHash('sha256').update(`${issuer}\n${subject}`).digest('hex').slice(0, 20)
  return `lti-${digest}${PLACEHOLDER_EMAIL_DOMAIN}`
}

async function emailFree(manager: EntityManager, email: string, exceptUserId?: string) {
  const holder = await manager.getRepository(UserEntity).findOneBy({ email })
  return !holder || holder.id === exceptUserId
}

/** An unguessable password hash for accounts that sign in through their platform (made once per process). */
const unusableHashes = new WeakMap<AppContext, Promise<string>>()
function unusablePasswordHash(ctx: AppContext): Promise<string> {
  let hash = unusableHashes.get(ctx)
  if (!hash) unusableHashes.set(ctx, (hash = ctx.passwords.hash(randomUUID() + randomUUID())))
  return hash
}

/**
 * The Slipway account of a platform user: found by issuer + subject, else created. The name and a shared
 * address follow the platform; a learner who later teaches is promoted to instructor, never the reverse,
 * and an admin stays an admin.
 */
export async function accountFor(
  ctx: AppContext,
  platform: LtiPlatformRow,
  person: PlatformPerson,
): Promise<UserRow> {
  const ds = ctx.dataSource
  const passwordHash = await unusablePasswordHash(ctx)
  const name = displayName(person)
  const sharedEmail =
    person.email && EMAIL_SHAPE.test(person.email) ? person.email.trim().toLowerCase() : undefined
  const findOrCreate = () =>
    ds.transaction(async (manager) => {
      const identities = manager.getRepository(LtiIdentityEntity)
      const users = manager.getRepository(UserEntity)
      const identity = await identities.findOneBy({ issuer: platform.issuer, subject: person.subject })
      const now = nowIso()
      if (identity) {
        const user = await users.findOneByOrFail({ id: identity.userId })
        const changes: Partial<UserRow> = {}
        if (name && name !== user.name) changes.name = name
        if (sharedEmail && sharedEmail !== user.email && (await emailFree(manager, sharedEmail, user.id))) {
          changes.email = sharedEmail
        }
        if (user.role === 'apprentice' && person.role === 'instructor') changes.role = 'instructor'
        if (Object.keys(changes).length) {
          await users.update({ id: user.id }, { ...changes, updatedAt: now })
          return { ...user, ...changes }
        }
        return user
      }
      const user: UserRow = {
        id: randomUUID(),
        email:
          sharedEmail && (await emailFree(manager, sharedEmail))
            ? sharedEmail
            : placeholderEmail(platform.issuer, person.subject),
        name: name ?? NAME_NOT_SHARED,
        role: person.role,
        passwordHash,
        active: true,
        tokenVersion: 0,
        createdAt: now,
        updatedAt: now,
        lastSignInAt: null,
      }
      await users.insert(user)
      await identities.insert({
        id: randomUUID(),
        platformId: platform.id,
        issuer: platform.issuer,
        subject: person.subject,
        userId: user.id,
        createdAt: now,
      })
      return user
    })
  try {
    return await findOrCreate()
  } catch (error) {
    // Two first launches of one person at once: the other created the account; this one finds it.
    if (
      await ds.getRepository(LtiIdentityEntity).countBy({ issuer: platform.issuer, subject: person.subject })
    ) {
      return findOrCreate()
    }
    throw error
  }
}

export interface CourseClaims {
  contextId: string
  title?: string
  label?: string
  membershipsUrl?: string
  lineItemsUrl?: string
  agsScopes?: string[]
}

/**
 * The cohort of a platform course: found by platform + context id, else created with the launching
 * instructor as its owner. A learner cannot be first: a cohort needs its instructor.
 */
export async function cohortForCourse(
  ctx: AppContext,
  platform: LtiPlatformRow,
  course: CourseClaims,
  launchedBy: UserRow,
): Promise<{ cohort: CohortRow; context: LtiContextRow }> {
  const ds = ctx.dataSource
  const contexts = ds.getRepository(LtiContextEntity)
  const title = (course.title || course.label || `Course from ${platform.name}`).slice(0, 120)
  const now = nowIso()
  const services = {
    ...(course.membershipsUrl ? { membershipsUrl: course.membershipsUrl } : {}),
    ...(course.lineItemsUrl ? { lineItemsUrl: course.lineItemsUrl } : {}),
    ...(course.agsScopes ? { agsScopes: JSON.stringify(course.agsScopes) } : {}),
  }
  const existing = await contexts.findOneBy({ platformId: platform.id, contextId: course.contextId })
  if (existing) {
    const changes = { ...services, ...(title !== existing.title ? { title } : {}) }
    if (Object.keys(changes).length)
      await contexts.update({ id: existing.id }, { ...changes, updatedAt: now })
    const cohort = await findById(ds, CohortEntity, existing.cohortId)
    if (!cohort) throw new Error(`LTI context ${existing.id} names a missing cohort`)
    return { cohort, context: { ...existing, ...changes } }
  }
  if (launchedBy.role === 'apprentice') {
    throw refuse(
      'not_allowed',
      'This course is not set up in Slipway yet. Your instructor opens a Slipway activity once from the course first.',
      403,
    )
  }
  return ds.transaction(async (manager) => {
    const cohort: CohortRow = {
      id: randomUUID(),
      name: title,
      description: '', // the cohort page names its course (components/lti/CourseLinkCard.vue)
      ownerId: launchedBy.id,
      archived: false,
      createdAt: now,
    }
    await manager.getRepository(CohortEntity).insert(cohort)
    const context: LtiContextRow = {
      id: randomUUID(),
      platformId: platform.id,
      contextId: course.contextId,
      cohortId: cohort.id,
      title,
      membershipsUrl: course.membershipsUrl ?? null,
      lineItemsUrl: course.lineItemsUrl ?? null,
      agsScopes: JSON.stringify(course.agsScopes ?? []),
      lastRosterPullAt: null,
      createdAt: now,
      updatedAt: now,
    }
    await manager.getRepository(LtiContextEntity).insert(context)
    return { cohort, context }
  })
}

/** Enrols an apprentice once; true when newly enrolled. */
export async function enrol(ctx: AppContext, cohortId: string, userId: string): Promise<boolean> {
  const enrollments = ctx.dataSource.getRepository(EnrollmentEntity)
  if (await enrollments.countBy({ cohortId, userId })) return false
  try {
    await enrollments.insert({ id: randomUUID(), cohortId, userId, createdAt: nowIso() })
    return true
  } catch (error) {
    // Two launches of one learner at once: the other one enrolled them.
    if (await enrollments.countBy({ cohortId, userId })) return false
    throw error
  }
}
