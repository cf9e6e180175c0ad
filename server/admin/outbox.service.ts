// The admin outbox: every mail job with where it stands (queued, sending, sent, failed with the reason),
// and sending a failed one again.
import type { z } from 'zod'
import type { OutboxMessage, OutboxPage, OutboxStatus, outboxQuerySchema } from '@shared/api/admin'
import type { AppContext } from '../context'
import { JobEntity, type JobRow } from '../entities'
import { conflict, notFound } from '../http-error'
import { retryFailedJob } from '../infrastructure/jobs'
import { mailJob, outgoingMailSchema } from '../infrastructure/mail/mail-job'
import { presentOutboxMessage } from './outbox.presenter'

type OutboxQuery = z.output<typeof outboxQuerySchema>

/** SQL for each status, matching outboxStatus() in the presenter. */
const STATUS_SQL: Record<OutboxStatus, string> = {
  queued: `(job.status = 'queued' OR (job.status = 'running' AND job.lockedUntil <= :now))`,
  sending: `(job.status = 'running' AND job.lockedUntil > :now)`,
  sent: `job.status = 'done'`,
  failed: `job.status = 'failed'`,
}

function present(ctx: AppContext, row: JobRow, now: string): OutboxMessage {
  // A payload that no longer parses still lists, with what can be read of it.
  const parsed = outgoingMailSchema.safeParse(JSON.parse(row.payload))
  const mail = parsed.success ? parsed.data : { to: row.label, subject: '', text: '', html: '' }
  return presentOutboxMessage(row, mail, { from: ctx.config.mailFrom, local: !ctx.config.smtp, now })
}

export async function listOutbox(
  ctx: AppContext,
  { page, pageSize, to, status }: OutboxQuery,
): Promise<OutboxPage> {
  const now = new Date().toISOString()
  const jobs = () => {
    const qb = ctx.dataSource
      .getRepository(JobEntity)
      .createQueryBuilder('job')
      .where('job.kind = :kind', { kind: mailJob.kind, now })
    // LOWER … LIKE: case-insensitive on both databases.
    if (to) qb.andWhere('LOWER(job.label) LIKE :to', { to: `%${to.toLowerCase()}%` })
    return qb
  }
  const listed = jobs()
  if (status) listed.andWhere(STATUS_SQL[status])
  const [rows, total] = await listed
    .orderBy('job.createdAt', 'DESC')
    .addOrderBy('job.id', 'DESC')
    .skip((page - 1) * pageSize)
    .take(pageSize)
    .getManyAndCount()
  const counts = { queued: 0, sending: 0, sent: 0, failed: 0 }
  const phases = (await jobs()
    .select(
      `CASE WHEN job.status = 'done' THEN 'sent' WHEN job.status = 'failed' THEN 'failed'
            WHEN job.status = 'running' AND job.lockedUntil > :now THEN 'sending' ELSE 'queued' END`,
      'phase',
    )
    .addSelect('COUNT(*)', 'count')
    .groupBy('phase')
    .getRawMany()) as { phase: OutboxStatus; count: number | string }[]
  for (const { phase, count } of phases) counts[phase] = Number(count)
  return {
    items: rows.map((row) => present(ctx, row, now)),
    total,
    page,
    pageSize,
    counts,
    local: !ctx.config.smtp,
  }
}

/** A failed message gets a fresh set of attempts, due now. */
export async function retryOutboxMessage(ctx: AppContext, id: string): Promise<OutboxMessage> {
  const jobs = ctx.dataSource.getRepository(JobEntity)
  const row = await jobs.findOneBy({ id, kind: mailJob.kind })
  if (!row) throw notFound('Message')
  if (!(await retryFailedJob(ctx.dataSource, id, new Date()))) {
    throw conflict('conflict', 'Only a message that failed can be sent again; this one has not failed')
  }
  return present(ctx, await jobs.findOneByOrFail({ id }), new Date().toISOString())
}
