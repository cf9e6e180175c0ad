// The live classroom's routes (shared/api/live.ts is the contract) and its three streams, read with fetch
// and the Authorization header (sseReader.ts). Stream payloads are parsed with the shared schemas; one that
// does not parse is dropped, never shown half-understood.
import { z } from 'zod'
import {
  injectionSchema,
  liveAttemptSchema,
  liveClassSchema,
  liveClassStreamEventSchema,
  liveInboxEventSchema,
  liveSessionSchema,
  liveWatchStreamEventSchema,
  sentLiveMessageSchema,
  type InjectFaultRequest,
  type LiveClassStreamEvent,
  type LiveInboxEvent,
  type LiveWatchStreamEvent,
  type OpenLiveSessionRequest,
  type PostLiveEventsRequest,
  type SendLiveMessageRequest,
} from '@shared/api/live'
import { authorizationHeader, refreshAccess, request } from '@/api/client'
import { endpoints } from '@/api/endpoints'
import { openEventStream, type EventStream, type StreamState } from './sseReader'

const acceptedSchema = z.unknown()

export const liveApi = {
  openSession: (attemptId: string, body: OpenLiveSessionRequest) =>
    request(endpoints.live.session(attemptId), liveSessionSchema, { method: 'POST', body }),
  postEvents: (attemptId: string, body: PostLiveEventsRequest) =>
    request(endpoints.live.events(attemptId), acceptedSchema, { method: 'POST', body }),
  classOf: (cohortId: string) => request(endpoints.live.cohort(cohortId), liveClassSchema),
  attempt: (attemptId: string) => request(endpoints.live.attempt(attemptId), liveAttemptSchema),
  /** The panel closed for good (left the page): the class view shows it ended at once. */
  close: (attemptId: string) => request(endpoints.live.close(attemptId), acceptedSchema, { method: 'POST' }),
  inject: (attemptId: string, body: InjectFaultRequest) =>
    request(endpoints.live.injections(attemptId), injectionSchema, { method: 'POST', body }),
  sendMessage: (body: SendLiveMessageRequest) =>
    request(endpoints.live.messages, sentLiveMessageSchema, { method: 'POST', body }),
}
export type LiveApi = typeof liveApi

export interface StreamHandlers<T> {
  onEvent: (event: T) => void
  onState?: (state: StreamState, problem: string | null) => void
  lastEventId?: string | null
}

function stream<T>(path: string, schema: z.ZodType<T>, handlers: StreamHandlers<T>): EventStream {
  return openEventStream({
    url: `/api${path}`,
    headers: authorizationHeader,
    lastEventId: handlers.lastEventId ?? null,
    onUnauthorized: refreshAccess,
    // Not yours, or gone: retrying will not change that.
    fatal: (status) => status === 403 || status === 404,
    onState: handlers.onState,
    onMessage: ({ event, data }) => {
      let json: unknown
      try {
        json = JSON.parse(data)
      } catch {
        return
      }
      // The event name repeats the type; the data carries it too, so either is enough.
      const parsed = schema.safeParse(
        json && typeof json === 'object' && !('type' in json) ? { type: event, ...json } : json,
      )
      if (parsed.success) handlers.onEvent(parsed.data)
    },
  })
}

export const liveStreams = {
  inbox: (attemptId: string, handlers: StreamHandlers<LiveInboxEvent>) =>
    stream(endpoints.live.inbox(attemptId), liveInboxEventSchema, handlers),
  classOf: (cohortId: string, handlers: StreamHandlers<LiveClassStreamEvent>) =>
    stream(endpoints.live.cohortStream(cohortId), liveClassStreamEventSchema, handlers),
  watch: (attemptId: string, handlers: StreamHandlers<LiveWatchStreamEvent>) =>
    stream(endpoints.live.watch(attemptId), liveWatchStreamEventSchema, handlers),
}
export type LiveStreams = typeof liveStreams
