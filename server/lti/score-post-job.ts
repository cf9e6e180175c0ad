// Grades on their way to learning platforms go through the durable job queue as kind 'lti.score-post'.
// `queueScorePost(manager, …)` runs inside the transaction of the grade change: it marks the apprentice's
// grade as waiting (the lti_score_syncs row the gradebook shows) and makes sure one post is queued for it.
// The post reads the grade that counts when it runs (passback.service.ts postScore, registered in
// background-jobs.ts), so a newer grade joins a post still queued instead of adding a second one.
import { randomUUID } from 'node:crypto'
import { Like, type EntityManager } from 'typeorm'
import { z } from 'zod'
import { JobEntity, LtiResourceLinkEntity, LtiScoreSyncEntity } from '../entities'
import { nowIso } from '../infrastructure/clock'
import { defineJobKind, restartQueuedJob } from '../infrastructure/jobs'

export const scorePostSchema = z.object({ assignmentId: z.uuid(), userId: z.uuid() })
export type ScorePost = z.infer<typeof scorePostSchema>

export const scorePostJob = defineJobKind({
  kind: 'lti.score-post',
  payload: scorePostSchema,
  // 10 s, 20 s, 40 s … capped at an hour: about three and a half hours of a platform being down before it is failed.
  retry: { maxAttempts: 12, firstDelayMs: 10_000, maxDelayMs: 3_600_000 },
  // Each platform call has its own 10-second limit; a post makes at most a handful per linked activity.
  timeoutMs: 2 * 60_000,
})

/** Every post for one apprentice on one assignment has a dedupe key with this start, then the instant it was queued. */
const keyPrefix = ({ assignmentId, userId }: ScorePost) => `lti-score:${assignmentId}:${userId}:`

/**
 * Called in the transaction of a grade change (graded submission, override, "send again"). Cheap for a
 * centre without platforms: one indexed query finds no linked activity and nothing else happens.
 */
export async function queueScorePost(manager: EntityManager, post: ScorePost): Promise<void> {
  const { assignmentId, userId } = post
  if (!(await manager.getRepository(LtiResourceLinkEntity).countBy({ assignmentId }))) return
  const now = nowIso()
  const syncs = manager.getRepository(LtiScoreSyncEntity)
  const existing = await syncs.findOneBy({ assignmentId, userId })
  const waiting = { state: 'waiting' as const, tries: 0, problem: null, changedAt: now, updatedAt: now }
  if (existing) await syncs.update({ id: existing.id }, waiting)
  else await syncs.insert({ id: randomUUID(), assignmentId, userId, score: null, sentAt: null, ...waiting })

  // A post not yet started will read this grade: it is not doubled. One waiting out a retry of an older
  // grade is made due now, with a fresh set of attempts. A running one may have read the older grade, so a
  // new post follows it (the older one's result is not recorded: its row changed meanwhile).
  const queued = await manager.getRepository(JobEntity).findOne({
    where: { kind: scorePostJob.kind, status: 'queued', dedupeKey: Like(`${keyPrefix(post)}%`) },
    select: { id: true },
  })
  if (queued && (await restartQueuedJob(manager, queued.id, new Date(now)))) return
  await scorePostJob.enqueue(manager, post, { dedupeKey: keyPrefix(post) + now })
}
