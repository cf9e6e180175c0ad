// The submission's checks against the live classroom's records: a log may hold only the injections and messages
// an instructor really sent to this attempt, and a final submission must hold every injection sent to it (the
// panel appends each as it arrives; one still on its way means the panel has not caught up yet).
import { isDeepStrictEqual } from 'node:util'
import type { DataSource } from 'typeorm'
import { LiveCommandEntity } from '../entities'
import { HttpError, conflict } from '../http-error'
import type { LiveRecordsInLog } from '../infrastructure/grading/grading-worker'

export async function checkLiveRecords(
  ds: DataSource,
  attemptId: string,
  inLog: LiveRecordsInLog,
  submitting: boolean,
): Promise<void> {
  const recorded = await ds.getRepository(LiveCommandEntity).findBy({ attemptId })
  const byId = new Map(recorded.map((r) => [r.id, r]))
  for (const event of inLog.injections) {
    const row = byId.get(event.injectionId)
    if (
      row?.kind !== 'injection' ||
      row.byId !== event.by.id ||
      !isDeepStrictEqual(JSON.parse(row.payload), event.fault)
    ) {
      throw new HttpError(
        400,
        'injection_unknown',
        'This attempt’s log holds a fault that no instructor injected into it; nothing was saved',
        { fields: { events: ['Contains a fault injection that was not recorded'] } },
      )
    }
  }
  for (const event of inLog.messages) {
    const row = byId.get(event.messageId)
    if (
      row?.kind !== event.kind ||
      row.byId !== event.from.id ||
      (JSON.parse(row.payload) as string) !== event.text
    ) {
      throw new HttpError(
        400,
        'message_unknown',
        'This attempt’s log holds a message that no instructor sent to it; nothing was saved',
        { fields: { events: ['Contains a message that was not recorded'] } },
      )
    }
  }
  if (!submitting) return
  const inLogIds = new Set(inLog.injections.map((e) => e.injectionId))
  if (recorded.some((r) => r.kind === 'injection' && !inLogIds.has(r.id))) {
    throw conflict(
      'injection_pending',
      'Your instructor has just changed something on your bench and your panel is still bringing it in. Wait a moment, then submit again.',
    )
  }
}
