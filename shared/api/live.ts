// Live classroom: every open panel streams its events; the cohort's instructors see a class view, watch one
// panel live, inject a fault and send hints or messages. Routes under /api/live (see README's route table).
//
// The flow:
// 1. The apprentice's panel opens a live session for its attempt (`POST /api/live/attempts/:id/session`) and
//    then posts its new events in order, with a small status summary, every few hundred milliseconds while it
//    has something new and at least every HEARTBEAT_MS (`POST …/events`). The attempt's log itself is still
//    saved and submitted through /api/attempts, as before; the live copy is for watching only.
// 2. The apprentice's panel reads its inbox stream (`GET …/inbox`): injections, messages and who is watching.
//    It appends each injection and message to its own log as `fault.injected` / `message.received` events
//    (shared/model/events.ts), so grading and replay see them where they happened.
// 3. Instructors read the class stream of a cohort (`GET /api/live/cohorts/:id/stream`) and a watch stream of
//    one attempt (`GET /api/live/attempts/:id/stream`), and post injections and messages.
//
// Streams are Server-Sent Events read with fetch (the Authorization header as on every route). Every stream
// event carries an `id:`; a reconnect sends `Last-Event-ID` (or `?after=`) and gets everything after it,
// nothing missed and nothing doubled.
import { z } from 'zod'
import { attemptEventSchema } from '../model/events'
import { injectedFaultSchema } from '../model/setup'
import { assistanceLevelSchema } from '../scenario/assistance'
import { idSchema, isoDateTimeSchema } from './common'

/** The panel posts at least this often while open; a session silent for DISCONNECTED_AFTER_MS is disconnected. */
export const LIVE_HEARTBEAT_MS = 10_000
export const LIVE_DISCONNECTED_AFTER_MS = 30_000
/** No apprentice action for this long: idle (still connected). */
export const LIVE_IDLE_AFTER_MS = 120_000
/** Most events in one post (a panel that fell behind sends several posts). */
export const LIVE_EVENTS_PER_POST = 500

const words = (max: number) => z.string().trim().min(1).max(max)

/**
 * What the apprentice's bench shows right now, summarised by their panel from the model (the server does not
 * re-run the model for the class view). Everything is in words or numbers a person reads.
 */
export const liveStatusSchema = z.object({
  powerOn: z.boolean(),
  /** Locks on the disconnect: the apprentice's own, the supervisor's. */
  ownLock: z.boolean(),
  supervisorLock: z.boolean(),
  /** The drive's state in words: "Dark", "Ready", "Running", "Stopping", "Tripped" … */
  driveState: words(40),
  /** Output frequency, Hz (what the display's first page shows). */
  outputHz: z.number().min(-1000).max(1000),
  /** Alarms and trips as the drive's display words them (short code and what is wrong). */
  alarms: z.array(words(120)).max(10),
  safetyViolations: z.number().int().min(0).max(10_000),
  objectivesMet: z.number().int().min(0).max(200),
  objectivesTotal: z.number().int().min(0).max(200),
})
export type LiveStatus = z.infer<typeof liveStatusSchema>

export const openLiveSessionRequestSchema = z
  .object({
    /** The exact scenario version on the panel. */
    scenarioVersionId: idSchema,
    assignmentId: idSchema.nullable(),
    assistance: assistanceLevelSchema,
  })
  .strict()
export type OpenLiveSessionRequest = z.infer<typeof openLiveSessionRequestSchema>

export const liveSessionSchema = z.object({
  attemptId: idSchema,
  /** Events the server holds for this attempt: the panel posts from here (a reopened panel resends the rest). */
  eventCount: z.number().int().min(0),
})
export type LiveSession = z.infer<typeof liveSessionSchema>

export const postLiveEventsRequestSchema = z
  .object({
    /** Index in the attempt's log of the first event sent; must equal the server's eventCount (else 409). */
    from: z.number().int().min(0),
    events: z.array(attemptEventSchema).max(LIVE_EVENTS_PER_POST),
    status: liveStatusSchema,
  })
  .strict()
export type PostLiveEventsRequest = z.infer<typeof postLiveEventsRequestSchema>

export const liveConnectionSchema = z.enum(['active', 'idle', 'disconnected', 'ended'])
export type LiveConnection = z.infer<typeof liveConnectionSchema>

/** One row of the class view. */
export const liveRowSchema = z.object({
  attemptId: idSchema,
  apprentice: z.object({ id: idSchema, name: z.string() }),
  scenario: z.object({ key: z.string(), title: z.string(), versionId: idSchema }),
  /** The assignment's title in words, null for practice. */
  assignmentTitle: z.string().nullable(),
  assistance: assistanceLevelSchema,
  openedAt: isoDateTimeSchema,
  /** Last apprentice action (an event), and the last post of any kind (heartbeat). */
  lastActionAt: isoDateTimeSchema.nullable(),
  lastSeenAt: isoDateTimeSchema,
  connection: liveConnectionSchema,
  eventCount: z.number().int().min(0),
  status: liveStatusSchema.nullable(),
  /** Instructors watching this panel now. */
  watchers: z.array(z.object({ id: idSchema, name: z.string() })),
})
export type LiveRow = z.infer<typeof liveRowSchema>

export const liveClassSchema = z.object({
  cohort: z.object({ id: idSchema, name: z.string() }),
  rows: z.array(liveRowSchema),
})
export type LiveClass = z.infer<typeof liveClassSchema>

/** Class stream (`event:` name → data): `row` a new or changed row; `gone` a row left the class view. */
export const liveClassStreamEventSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('row'), row: liveRowSchema }),
  z.object({ type: z.literal('gone'), attemptId: idSchema }),
])
export type LiveClassStreamEvent = z.infer<typeof liveClassStreamEventSchema>

/** GET /api/live/attempts/:id — what a watcher needs to draw the panel: the row and every event so far. */
export const liveAttemptSchema = z.object({
  row: liveRowSchema,
  cohortIds: z.array(idSchema),
  events: z.array(attemptEventSchema),
})
export type LiveAttempt = z.infer<typeof liveAttemptSchema>

/**
 * Watch stream: `events` new log events from index `from` (the stream's ids are the log index of the last
 * event sent, so a reconnect with Last-Event-ID misses and doubles nothing); `row` a changed row (status,
 * connection, watchers); `ended` the attempt was submitted or its panel closed for good.
 */
export const liveWatchStreamEventSchema = z.discriminatedUnion('type', [
  z.object({ type: z.literal('events'), from: z.number().int().min(0), events: z.array(attemptEventSchema) }),
  z.object({ type: z.literal('row'), row: liveRowSchema }),
  z.object({ type: z.literal('ended') }),
])
export type LiveWatchStreamEvent = z.infer<typeof liveWatchStreamEventSchema>

/** A stream's query: where a reconnect resumes, as an alternative to the Last-Event-ID header. */
export const liveStreamQuerySchema = z.object({
  after: z.coerce
    .number({ error: 'Must be a whole number' })
    .int()
    .min(0)
    .max(Number.MAX_SAFE_INTEGER)
    .optional(),
})

const personSchema = z.object({ id: idSchema, name: z.string() })

/**
 * Apprentice's inbox stream: injections and messages to append to the log (each once: the ids make a
 * second delivery harmless), and who is watching now (the panel shows an indicator whenever anyone is).
 */
export const liveInboxEventSchema = z.discriminatedUnion('type', [
  z.object({
    type: z.literal('injection'),
    injectionId: idSchema,
    fault: injectedFaultSchema,
    by: personSchema,
    at: isoDateTimeSchema,
  }),
  z.object({
    type: z.literal('message'),
    messageId: idSchema,
    kind: z.enum(['hint', 'message']),
    text: z.string(),
    from: personSchema,
    at: isoDateTimeSchema,
  }),
  z.object({ type: z.literal('watchers'), watchers: z.array(personSchema) }),
])
export type LiveInboxEvent = z.infer<typeof liveInboxEventSchema>

export const injectFaultRequestSchema = z.object({ fault: injectedFaultSchema }).strict()
export type InjectFaultRequest = z.infer<typeof injectFaultRequestSchema>
export const injectionSchema = z.object({ injectionId: idSchema, at: isoDateTimeSchema })

/** To one or more open attempts of the cohort, or (attemptIds omitted) to every open attempt in it. */
export const sendLiveMessageRequestSchema = z
  .object({
    cohortId: idSchema,
    attemptIds: z.array(idSchema).min(1).max(200).optional(),
    kind: z.enum(['hint', 'message']),
    text: z
      .string()
      .trim()
      .min(1, { error: 'Write the message' })
      .max(1000, { error: 'At most 1000 characters' }),
  })
  .strict()
export type SendLiveMessageRequest = z.infer<typeof sendLiveMessageRequestSchema>
export const sentLiveMessageSchema = z.object({ sent: z.number().int().min(0) })
