// Live classroom (issue 18): the live copy of each open panel, for watching only — the attempt itself is still
// saved and submitted through /api/attempts. A session per attempt id, its events in order, the instructors'
// commands (injections, messages) in the apprentice's inbox order, and who is watching now.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import {
  belongsTo,
  integer,
  nullableText,
  nullableTimestamp,
  nullableUuid,
  text,
  timestamp,
  uuidColumn,
  uuidPrimary,
  varchar,
} from './columns'

export interface LiveSessionRow {
  /** The attempt's id (the panel's, before the attempt row exists). */
  attemptId: string
  apprenticeId: string
  scenarioId: string
  assignmentId: string | null
  assistance: string
  openedAt: string
  /** The last post of any kind (a heartbeat counts). */
  lastSeenAt: string
  /** The last post that carried events. */
  lastActionAt: string | null
  endedAt: string | null
  eventCount: number
  /** The panel's LiveStatus as JSON text (null until the first post). */
  status: string | null
}

export const LiveSessionEntity = new EntitySchema<LiveSessionRow>({
  name: 'LiveSession',
  tableName: 'live_sessions',
  columns: {
    attemptId: uuidPrimary,
    apprenticeId: uuidColumn,
    scenarioId: uuidColumn,
    assignmentId: nullableUuid,
    assistance: varchar(16),
    openedAt: timestamp,
    lastSeenAt: timestamp,
    lastActionAt: nullableTimestamp,
    endedAt: nullableTimestamp,
    eventCount: integer,
    status: nullableText,
  },
  indices: [
    { name: 'idx_live_sessions_apprentice', columns: ['apprenticeId'] },
    { name: 'idx_live_sessions_assignment', columns: ['assignmentId'] },
  ],
  relations: {
    apprentice: belongsTo('User', 'apprenticeId', 'CASCADE'),
    scenario: belongsTo('Scenario', 'scenarioId', 'CASCADE'),
    assignment: belongsTo('Assignment', 'assignmentId', 'CASCADE', true),
  } as EntitySchemaOptions<LiveSessionRow>['relations'],
})

export interface LiveEventRow {
  attemptId: string
  /** Index in the attempt's log. */
  eventIndex: number
  /** The event as JSON text. */
  event: string
}

export const LiveEventEntity = new EntitySchema<LiveEventRow>({
  name: 'LiveEvent',
  tableName: 'live_events',
  columns: {
    attemptId: { ...uuidColumn, primary: true },
    eventIndex: { ...integer, primary: true },
    event: text,
  },
  relations: {
    session: belongsTo('LiveSession', 'attemptId', 'CASCADE'),
  } as EntitySchemaOptions<LiveEventRow>['relations'],
})

export type LiveCommandKind = 'injection' | 'hint' | 'message'

export interface LiveCommandRow {
  /** The injection's or message's id, as the apprentice's log records it. */
  id: string
  attemptId: string
  kind: LiveCommandKind
  /** An injection: its InjectedFault; a message: its text. JSON text. */
  payload: string
  byId: string
  at: string
  /** Order in the apprentice's inbox (1, 2, …): the inbox stream's event ids. */
  sequence: number
}

export const LiveCommandEntity = new EntitySchema<LiveCommandRow>({
  name: 'LiveCommand',
  tableName: 'live_commands',
  columns: {
    id: uuidPrimary,
    attemptId: uuidColumn,
    kind: varchar(16),
    payload: text,
    byId: uuidColumn,
    at: timestamp,
    sequence: integer,
  },
  uniques: [{ name: 'uq_live_commands_attempt_sequence', columns: ['attemptId', 'sequence'] }],
  relations: {
    session: belongsTo('LiveSession', 'attemptId', 'CASCADE'),
    by: belongsTo('User', 'byId', 'CASCADE'),
  } as EntitySchemaOptions<LiveCommandRow>['relations'],
})

/** One open watch stream (any instance); refreshed by the stream's heartbeat, swept when stale. */
export interface LiveWatcherRow {
  id: string
  attemptId: string
  userId: string
  seenAt: string
}

export const LiveWatcherEntity = new EntitySchema<LiveWatcherRow>({
  name: 'LiveWatcher',
  tableName: 'live_watchers',
  columns: { id: uuidPrimary, attemptId: uuidColumn, userId: uuidColumn, seenAt: timestamp },
  indices: [{ name: 'idx_live_watchers_attempt', columns: ['attemptId'] }],
  relations: {
    session: belongsTo('LiveSession', 'attemptId', 'CASCADE'),
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<LiveWatcherRow>['relations'],
})

export const liveEntities = [LiveSessionEntity, LiveEventEntity, LiveCommandEntity, LiveWatcherEntity]
