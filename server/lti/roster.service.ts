// Rosters in (Names and Role Provisioning Services 2.0): an instructor pulls the course's membership from the
// platform into the cohort. Active learners get their account (matched by issuer + subject, as at launch)
// and are enrolled; staff and inactive members are counted, not enrolled. Apprentices the course no longer
// lists stay in the cohort (their attempts matter) and are named, for the instructor to decide.
import { In } from 'typeorm'
import type { CohortLink, RosterPullResult } from '@shared/api/lti'
import { cohortFor } from '../access/access.service'
import type { AppContext } from '../context'
import {
  EnrollmentEntity,
  LtiContextEntity,
  LtiIdentityEntity,
  LtiPlatformEntity,
  UserEntity,
  type UserRow,
} from '../entities'
import { HttpError } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import { MEDIA, membershipContainerSchema, SCOPE, type Member } from './claims'
import { callPlatform, PlatformServiceError, serviceFailure } from './platform-client'
import { accountFor, enrol } from './provisioning'
import { isActiveMember, slipwayRoleOf } from './roles'
import { ltiRuntime } from './runtime'

/** A roster longer than this many pages is cut short (NRPS pages are typically 100 members or more). */
const MAX_PAGES = 100

/** The `next` link of an NRPS page (RFC 8288 Link header), if any. */
export function nextPageUrl(linkHeader: string | null): string | undefined {
  if (!linkHeader) return undefined
  for (const part of linkHeader.split(',')) {
    const match = /<([^>]+)>\s*;(.*)/.exec(part.trim())
    if (match && /rel="?([^"]*\s)?next(\s[^"]*)?"?/i.test(match[2]!)) return match[1]
  }
  return undefined
}

export async function cohortLink(ctx: AppContext, user: UserRow, cohortId: string): Promise<CohortLink> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const context = await ctx.dataSource.getRepository(LtiContextEntity).findOneBy({ cohortId: cohort.id })
  const platform = context ? await findById(ctx.dataSource, LtiPlatformEntity, context.platformId) : null
  return {
    cohortId: cohort.id,
    linked: Boolean(context),
    platformName: platform?.name ?? null,
    courseTitle: context?.title ?? null,
    canPullRoster: Boolean(context?.membershipsUrl),
    lastRosterPullAt: context?.lastRosterPullAt ?? null,
  }
}

async function fetchMembers(
  ctx: AppContext,
  platform: Parameters<typeof callPlatform>[2],
  url: string,
): Promise<Member[]> {
  const members: Member[] = []
  let next: string | undefined = url
  for (let page = 0; next && page < MAX_PAGES; page++) {
    const response = await callPlatform(
      ctx,
      ltiRuntime(ctx).serviceTokens,
      platform,
      [SCOPE.memberships],
      next,
      {
        headers: { accept: MEDIA.memberships },
      },
    )
    if (!response.ok) throw serviceFailure('the request for the course roster', response)
    const parsed = membershipContainerSchema.safeParse(await response.json().catch(() => undefined))
    if (!parsed.success)
      throw new PlatformServiceError('The platform sent a roster Slipway could not read.', true)
    members.push(...parsed.data.members)
    next = nextPageUrl(response.headers.get('link'))
  }
  return members
}

export async function pullRoster(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<RosterPullResult> {
  const ds = ctx.dataSource
  const cohort = await cohortFor(ds, user, cohortId, 'manage')
  const context = await ds.getRepository(LtiContextEntity).findOneBy({ cohortId: cohort.id })
  if (!context) {
    throw new HttpError(
      409,
      'lti_not_linked',
      'This cohort is not linked to a course on a learning platform.',
    )
  }
  if (!context.membershipsUrl) {
    throw new HttpError(
      409,
      'lti_not_linked',
      'The course has not offered its roster to Slipway. Its platform administrator can grant the roster service (Names and Role Provisioning).',
    )
  }
  const platform = (await findById(ds, LtiPlatformEntity, context.platformId))!
  let members: Member[]
  try {
    members = await fetchMembers(ctx, platform, context.membershipsUrl)
  } catch (error) {
    if (error instanceof PlatformServiceError) throw new HttpError(502, 'lti_service_failed', error.message)
    throw error
  }
  const result: RosterPullResult = { enrolled: 0, alreadyEnrolled: 0, staff: 0, inactive: 0, notInCourse: [] }
  const learnerSubjects = new Set<string>()
  for (const member of members) {
    if (!isActiveMember(member.status)) {
      result.inactive++
      continue
    }
    if (slipwayRoleOf(member.roles) === 'instructor') {
      result.staff++
      continue
    }
    learnerSubjects.add(member.user_id)
    const account = await accountFor(ctx, platform, {
      subject: member.user_id,
      role: 'apprentice',
      name: member.name,
      givenName: member.given_name,
      familyName: member.family_name,
      email: member.email,
    })
    if (account.role !== 'apprentice') {
      result.staff++
      continue
    }
    if (await enrol(ctx, cohort.id, account.id)) result.enrolled++
    else result.alreadyEnrolled++
  }
  const enrolled = await ds.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })
  if (enrolled.length) {
    const identities = await ds.getRepository(LtiIdentityEntity).findBy({
      issuer: platform.issuer,
      userId: In(enrolled.map((e) => e.userId)),
    })
    const gone = enrolled.filter((e) => {
      const identity = identities.find((i) => i.userId === e.userId)
      return !identity || !learnerSubjects.has(identity.subject)
    })
    if (gone.length) {
      const people = await ds.getRepository(UserEntity).find({
        where: { id: In(gone.map((e) => e.userId)) },
        select: { id: true, name: true },
        order: { name: 'ASC' },
      })
      result.notInCourse = people.map((p) => ({ userId: p.id, name: p.name }))
    }
  }
  await ds
    .getRepository(LtiContextEntity)
    .update({ id: context.id }, { lastRosterPullAt: nowIso(), updatedAt: nowIso() })
  return result
}
