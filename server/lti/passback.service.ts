// Grades back to the platform (Assignment and Grade Services 2.0): every graded attempt and every override
// on a linked assignment marks the apprentice's grade as waiting and queues a job (score-post-job.ts); the
// job (postScore, the handler of kind 'lti.score-post') reads the
// grade that counts at that moment (best or latest, as the assignment says) and sends it to the line item
// of each activity linked to the assignment, creating the line item first if the platform has none.
// The state of each (assignment, apprentice) is a row in lti_score_syncs, which the gradebook shows; it is
// read live by its own route rather than through the gradebook cache, so it never waits on a revision.
import { In, type DataSource } from 'typeorm'
import type { ScoreSyncList } from '@shared/api/lti'
import { cohortFor } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  LtiContextEntity,
  LtiIdentityEntity,
  LtiPlatformEntity,
  LtiResourceLinkEntity,
  LtiScoreSyncEntity,
  type AssignmentRow,
  type LtiContextRow,
  type LtiPlatformRow,
  type LtiResourceLinkRow,
  type LtiScoreSyncRow,
  type UserRow,
} from '../entities'
import { nowIso } from '../infrastructure/clock'
import { JobError, type RunningJob } from '../infrastructure/jobs'
import { lineItemSchema, MEDIA, SCOPE } from './claims'
import { callPlatform, PlatformServiceError, serviceFailure, type ServiceTokenCache } from './platform-client'
import { queueScorePost, type ScorePost } from './score-post-job'
import { presentScoreSync } from './sync.presenter'

/** Scores are percentages in Slipway; the line item's maximum says so to the platform. */
export const SCORE_MAXIMUM = 100

/** The grade that counts for the platform: the best or the latest graded attempt, as the assignment says. */
async function gradeThatCounts(
  ds: DataSource,
  assignment: AssignmentRow,
  userId: string,
): Promise<number | null> {
  const graded = await ds.getRepository(AttemptEntity).find({
    where: { assignmentId: assignment.id, userId, status: 'submitted' },
    select: { id: true, score: true, submittedAt: true },
    order: { submittedAt: 'DESC' },
  })
  const scores = graded.filter((a) => a.score !== null)
  if (scores.length === 0) return null
  if (assignment.scorePolicy === 'latest') return scores[0]!.score
  return Math.max(...scores.map((a) => a.score!))
}

const withPath = (url: string, suffix: string) => {
  // AGS §3.4: the scores endpoint is the line item URL with /scores added to its path (query kept).
  const u = new URL(url)
  u.pathname = u.pathname.replace(/\/$/, '') + suffix
  return u.toString()
}

/** The line item of an activity: the one the launch named, one the platform lists for it, or a new one. */
async function lineItemOf(
  deps: PassbackDeps,
  platform: LtiPlatformRow,
  context: LtiContextRow,
  link: LtiResourceLinkRow,
  assignment: AssignmentRow,
): Promise<string> {
  if (link.lineItemUrl) return link.lineItemUrl
  const granted = JSON.parse(context.agsScopes) as string[]
  if (!context.lineItemsUrl || !granted.includes(SCOPE.lineItem)) {
    throw new PlatformServiceError(
      'The course has not given Slipway a gradebook column for this activity, nor the right to add one.',
      false,
    )
  }
  const { serviceTokens: tokens } = deps
  const listUrl = new URL(context.lineItemsUrl)
  listUrl.searchParams.set('resource_link_id', link.resourceLinkId)
  const listed = await callPlatform(deps, tokens, platform, [SCOPE.lineItem], listUrl.toString(), {
    headers: { accept: MEDIA.lineItems },
  })
  if (!listed.ok) throw serviceFailure('a request for its gradebook columns', listed)
  const existing = lineItemSchema.array().safeParse(await listed.json().catch(() => undefined))
  let lineItemUrl = existing.success ? existing.data[0]?.id : undefined
  if (!lineItemUrl) {
    const created = await callPlatform(deps, tokens, platform, [SCOPE.lineItem], context.lineItemsUrl, {
      method: 'POST',
      headers: { 'content-type': MEDIA.lineItem, accept: MEDIA.lineItem },
      body: JSON.stringify({
        scoreMaximum: SCORE_MAXIMUM,
        label: assignment.title,
        resourceId: assignment.id,
        resourceLinkId: link.resourceLinkId,
        tag: 'slipway',
      }),
    })
    if (!created.ok) throw serviceFailure('a new gradebook column', created)
    const item = lineItemSchema.safeParse(await created.json().catch(() => undefined))
    if (!item.success)
      throw new PlatformServiceError('The platform sent an unreadable gradebook column.', true)
    lineItemUrl = item.data.id
  }
  await deps.dataSource
    .getRepository(LtiResourceLinkEntity)
    .update({ id: link.id }, { lineItemUrl, updatedAt: nowIso() })
  return lineItemUrl
}

async function record(ds: DataSource, sync: LtiScoreSyncRow, changes: Partial<LtiScoreSyncRow>) {
  // Only if no newer grade arrived meanwhile: that one has its own post coming.
  await ds
    .getRepository(LtiScoreSyncEntity)
    .update({ id: sync.id, changedAt: sync.changedAt }, { ...changes, updatedAt: nowIso() })
}

/** What a post needs: the database, and service tokens kept between posts (one cache per worker). */
export interface PassbackDeps {
  dataSource: DataSource
  serviceTokens: ServiceTokenCache
}

const UNEXPECTED_PROBLEM = 'An unexpected error stopped it; the server log has the details.'

/**
 * Sends one apprentice's grade on one assignment to every activity linked to it: the handler of the job kind
 * 'lti.score-post'. The lti_score_syncs row says how it went, in words; a JobError tells the queue whether
 * to try again (a platform that is down or busy) or not (a refusal trying again cannot change).
 */
export async function postScore(
  deps: PassbackDeps,
  post: ScorePost,
  job: Pick<RunningJob, 'attempt' | 'maxAttempts'>,
): Promise<void> {
  const ds = deps.dataSource
  const sync = await ds.getRepository(LtiScoreSyncEntity).findOneBy(post)
  const assignment = await ds.getRepository(AssignmentEntity).findOneBy({ id: post.assignmentId })
  if (!sync || !assignment) return // deleted since: nothing left to send
  const tries = job.attempt
  const score = await gradeThatCounts(ds, assignment, post.userId)
  if (score === null) {
    const problem = 'There is no graded attempt to send.'
    await record(ds, sync, { state: 'failed', tries, problem })
    throw new JobError(problem, { permanent: true })
  }
  try {
    const links = await ds.getRepository(LtiResourceLinkEntity).findBy({ assignmentId: assignment.id })
    const contexts = await ds
      .getRepository(LtiContextEntity)
      .findBy({ id: In(links.map((l) => l.contextRowId)) })
    const platforms = await ds
      .getRepository(LtiPlatformEntity)
      .findBy({ id: In([...new Set(contexts.map((c) => c.platformId))]) })
    for (const link of links) {
      const context = contexts.find((c) => c.id === link.contextRowId)!
      const platform = platforms.find((p) => p.id === context.platformId)!
      const identity = await ds
        .getRepository(LtiIdentityEntity)
        .findOneBy({ issuer: platform.issuer, userId: post.userId })
      if (!identity) {
        throw new PlatformServiceError(
          `This apprentice has not come in from ${platform.name}, so the course there does not know them.`,
          false,
        )
      }
      const lineItemUrl = await lineItemOf(deps, platform, context, link, assignment)
      const response = await callPlatform(
        deps,
        deps.serviceTokens,
        platform,
        [SCOPE.score],
        withPath(lineItemUrl, '/scores'),
        {
          method: 'POST',
          headers: { 'content-type': MEDIA.score },
          body: JSON.stringify({
            userId: identity.subject,
            scoreGiven: score,
            scoreMaximum: SCORE_MAXIMUM,
            activityProgress: 'Completed',
            gradingProgress: 'FullyGraded',
            // The time the grade changed: a platform keeps the score with the newest timestamp (AGS §3.4.6).
            timestamp: sync.changedAt,
          }),
        },
      )
      if (!response.ok) throw serviceFailure('the grade', response)
    }
    await record(ds, sync, { state: 'sent', score, tries, problem: null, sentAt: nowIso() })
  } catch (error) {
    const last = job.attempt >= job.maxAttempts
    if (!(error instanceof PlatformServiceError)) {
      // The queue logs it and tries again; after the last attempt the gradebook must not show it waiting.
      if (last) await record(ds, sync, { state: 'failed', score, tries, problem: UNEXPECTED_PROBLEM })
      throw error
    }
    const again = error.retry && !last
    await record(ds, sync, {
      state: again ? 'waiting' : 'failed',
      score,
      tries,
      problem: again ? `${error.message} Trying again shortly.` : error.message,
    })
    throw new JobError(error.message, { permanent: !error.retry, cause: error })
  }
}

/** The gradebook's sync states for a cohort's linked assignments (instructor of the cohort, or admin). */
export async function cohortScoreSyncs(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<ScoreSyncList> {
  const ds = ctx.dataSource
  const cohort = await cohortFor(ds, user, cohortId, 'manage')
  const assignments = await ds
    .getRepository(AssignmentEntity)
    .find({ where: { cohortId: cohort.id }, select: { id: true } })
  const linkedIds = assignments.length
    ? [
        ...new Set(
          (
            await ds.getRepository(LtiResourceLinkEntity).find({
              where: { assignmentId: In(assignments.map((a) => a.id)) },
              select: { assignmentId: true },
            })
          ).map((l) => l.assignmentId),
        ),
      ]
    : []
  const cells = linkedIds.length
    ? await ds.getRepository(LtiScoreSyncEntity).findBy({ assignmentId: In(linkedIds) })
    : []
  return { linkedAssignmentIds: linkedIds, cells: cells.map(presentScoreSync) }
}

/** Sends every failed grade of a cohort again (after the platform's administrator fixed what was wrong). */
export async function retryFailedScores(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<ScoreSyncList> {
  const list = await cohortScoreSyncs(ctx, user, cohortId)
  await ctx.dataSource.transaction(async (manager) => {
    for (const cell of list.cells.filter((c) => c.state === 'failed')) {
      await queueScorePost(manager, { assignmentId: cell.assignmentId, userId: cell.userId })
    }
  })
  return cohortScoreSyncs(ctx, user, cohortId)
}
