// The live copy of a panel's log is for watching while the panel is open; the attempt keeps its own log
// (attempts.events). Once a session has ended, or gone silent, for a week its copied events are deleted so
// `live_events` does not grow with every class ever taught. The session row and its injections and messages
// stay: the submission checks and the audit need them.
import type { DataSource } from 'typeorm'
import { LiveEventEntity, LiveSessionEntity } from '../entities'

export const LIVE_COPY_RETENTION_DAYS = 7

/** Statement parameters stay well under SQLite's limit per IN list. */
const CHUNK = 500

/** Deletes the copied events of sessions ended or silent since before `before`; returns how many. */
export async function pruneLiveCopies(dataSource: DataSource, before: Date): Promise<number> {
  const cutoff = before.toISOString()
  const stale = await dataSource
    .getRepository(LiveSessionEntity)
    .createQueryBuilder('s')
    .select('s.attemptId', 'attemptId')
    .where('s.eventCount > 0')
    .andWhere(
      '((s.endedAt IS NOT NULL AND s.endedAt < :cutoff) OR (s.endedAt IS NULL AND s.lastSeenAt < :cutoff))',
      { cutoff },
    )
    .getRawMany<{ attemptId: string }>()
  let deleted = 0
  for (let i = 0; i < stale.length; i += CHUNK) {
    const ids = stale.slice(i, i + CHUNK).map((row) => row.attemptId)
    deleted += await dataSource.transaction(async (manager) => {
      const result = await manager
        .createQueryBuilder()
        .delete()
        .from(LiveEventEntity)
        .where('"attemptId" IN (:...ids)', { ids })
        .execute()
      // A panel reopened later posts its log again from the start.
      await manager
        .createQueryBuilder()
        .update(LiveSessionEntity)
        .set({ eventCount: 0 })
        .where('"attemptId" IN (:...ids)', { ids })
        .execute()
      return result.affected ?? 0
    })
  }
  return deleted
}
