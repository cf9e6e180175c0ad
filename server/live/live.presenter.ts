// A live session's row of the class view, in words and numbers (pure: names and watchers are passed in).
import type { LiveConnection, LiveRow, LiveStatus } from '@shared/api/live'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import type { LiveSessionRow } from '../entities'

export interface LiveThresholds {
  /** No apprentice action for this long: idle. */
  idleAfterMs: number
  /** No post at all for this long: disconnected. */
  disconnectedAfterMs: number
}

export interface Person {
  id: string
  name: string
}

/** What the row shows beside the session itself, read once per list by the caller. */
export interface RowFacts {
  apprentice: Person
  scenario: { key: string; title: string; versionId: string }
  assignmentTitle: string | null
  watchers: Person[]
}

export function connectionOf(session: LiveSessionRow, nowMs: number, limits: LiveThresholds): LiveConnection {
  if (session.endedAt) return 'ended'
  if (nowMs - Date.parse(session.lastSeenAt) > limits.disconnectedAfterMs) return 'disconnected'
  const lastAction = session.lastActionAt ?? session.openedAt
  if (nowMs - Date.parse(lastAction) > limits.idleAfterMs) return 'idle'
  return 'active'
}

export function presentLiveRow(
  session: LiveSessionRow,
  facts: RowFacts,
  nowMs: number,
  limits: LiveThresholds,
): LiveRow {
  return {
    attemptId: session.attemptId,
    apprentice: facts.apprentice,
    scenario: facts.scenario,
    assignmentTitle: facts.assignmentTitle,
    assistance: session.assistance as AssistanceLevel,
    openedAt: session.openedAt,
    lastActionAt: session.lastActionAt,
    lastSeenAt: session.lastSeenAt,
    connection: connectionOf(session, nowMs, limits),
    eventCount: session.eventCount,
    status: session.status ? (JSON.parse(session.status) as LiveStatus) : null,
    watchers: facts.watchers,
  }
}
