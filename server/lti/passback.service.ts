// Grades back to the platform (Assignment and Grade Services 2.0): every graded attempt and every override
// on a linked assignment marks the apprentice's grade as waiting and enqueues a post; the post reads the
// grade that counts at that moment (best or latest, as the assignment says) and sends it to the line item
// of each activity linked to the assignment, creating the line item first if the platform has none.
// The state of each (assignment, apprentice) is a row in lti_score_syncs, which the gradebook shows; it is
// read live by its own route rather than through the gradebook cache, so it never waits on a revision.
import { randomUUID } from 'node:crypto'
import { In } from 'typeorm'
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
import { lineItemSchema, MEDIA, SCOPE } from './claims'
import { callPlatform, PlatformServiceError, serviceFailure } from './platform-client'
import { ltiRuntime } from './runtime'
import type { ScorePost, ScorePostOutcome } from './score-queue'
import { presentScoreSync } from './sync.presenter'

/** Scores are percentages in Slipway; the line item's maximum says so to the platform. */
export const SCORE_MAXIMUM = 100

/**
 * Called after a grade changes (submission graded, override). Cheap for a centre without platforms: one
 * indexed query finds no linked activity and nothing else happens. Never throws into the caller's request.
 */
export async function scoreChanged(ctx: AppContext, assignmentId: string, userId: string): Promise<void> {
  try {
    const linked = await ctx.dataSource.getRepository(LtiResourceLinkEntity).countBy({ assignmentId })
    if (!linked) return
    const now = nowIso()
    const syncs = ctx.dataSource.getRepository(LtiScoreSyncEntity)
    const existing = await syncs.findOneBy({ assignmentId, userId })
    const waiting = { state: 'waiting' as const, tries: 0, problem: null, changedAt: now, updatedAt: now }
    if (existing) await syncs.update({ id: existing.id }, waiting)
    else {
      await syncs.insert({ id: randomUUID(), assignmentId, userId, score: null, sentAt: null, ...waiting })
    }
    ltiRuntime(ctx).scores.enqueueScorePost({ assignmentId, userId })
  } catch (err) {
    ctx.log.error({ err, assignmentId, userId }, 'could not queue a grade for the learning platform')
  }
}

/** The grade that counts for the platform: the best or the latest graded attempt, as the assignment says. */
async function gradeThatCounts(
  ctx: AppContext,
  assignment: AssignmentRow,
  userId: string,
): Promise<number | null> {
  const graded = await ctx.dataSource.getRepository(AttemptEntity).find({
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
  ctx: AppContext,
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
  const tokens = ltiRuntime(ctx).serviceTokens
  const listUrl = new URL(context.lineItemsUrl)
  listUrl.searchParams.set('resource_link_id', link.resourceLinkId)
  const listed = await callPlatform(ctx, tokens, platform, [SCOPE.lineItem], listUrl.toString(), {
    headers: { accept: MEDIA.lineItems },
  })
  if (!listed.ok) throw serviceFailure('a request for its gradebook columns', listed)
  const existing = lineItemSchema.array().safeParse(await listed.json().catch(() => undefined))
  let lineItemUrl = existing.success ? existing.data[0]?.id : undefined
  if (!lineItemUrl) {
    const created = await callPlatform(ctx, tokens, platform, [SCOPE.lineItem], context.lineItemsUrl, {
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
  await ctx.dataSource
    .getRepository(LtiResourceLinkEntity)
    .update({ id: link.id }, { lineItemUrl, updatedAt: nowIso() })
  return lineItemUrl
}

async function record(ctx: AppContext, sync: LtiScoreSyncRow, changes: Partial<LtiScoreSyncRow>) {
  // Only if no newer grade arrived meanwhile: that one has its own post coming.
  await ctx.dataSource
    .getRepository(LtiScoreSyncEntity)
    .update({ id: sync.id, changedAt: sync.changedAt }, { ...changes, updatedAt: nowIso() })
}

/** Sends one apprentice's grade on one assignment to every activity linked to it (the queue's handler). */
export async function postScore(
  ctx: AppContext,
  post: ScorePost,
  attempt: { number: number; last: boolean },
): Promise<ScorePostOutcome> {
  const ds = ctx.dataSource
  const sync = await ds.getRepository(LtiScoreSyncEntity).findOneBy(post)
  const assignment = await ds.getRepository(AssignmentEntity).findOneBy({ id: post.assignmentId })
  if (!sync || !assignment) return 'done'
  const score = await gradeThatCounts(ctx, assignment, post.userId)
  if (score === null) {
    await record(ctx, sync, {
      state: 'failed',
      tries: attempt.number,
      problem: 'There is no graded attempt to send.',
    })
    return 'done'
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
      const lineItemUrl = await lineItemOf(ctx, platform, context, link, assignment)
      const response = await callPlatform(
        ctx,
        ltiRuntime(ctx).serviceTokens,
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
    await record(ctx, sync, { state: 'sent', score, tries: attempt.number, problem: null, sentAt: nowIso() })
    return 'done'
  } catch (error) {
    if (!(error instanceof PlatformServiceError)) throw error
    const again = error.retry && !attempt.last
    await record(ctx, sync, {
      state: again ? 'waiting' : 'failed',
      score,
      tries: attempt.number,
      problem: again ? `${error.message} Trying again shortly.` : error.message,
    })
    return again ? 'retry' : 'done'
  }
}

/** Rows still waiting (after a restart), to enqueue again. */
export async function waitingPosts(ctx: AppContext): Promise<ScorePost[]> {
  const rows = await ctx.dataSource
    .getRepository(LtiScoreSyncEntity)
    .find({ where: { state: 'waiting' }, select: { assignmentId: true, userId: true } })
  return rows.map((r) => ({ assignmentId: r.assignmentId, userId: r.userId }))
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
  for (const cell of list.cells.filter((c) => c.state === 'failed')) {
    await scoreChanged(ctx, cell.assignmentId, cell.userId)
  }
  return cohortScoreSyncs(ctx, user, cohortId)
}
