// The apprentice's side of the live classroom, beside the live attempt: publishes the attempt's events and
// status to the live session (livePublisher.ts), and reads the inbox stream: an instructor's fault or message
// goes into the log through the machine, like an action (so the model, the grader, the log and the drawing
// see it), messages are listed for the apprentice, and whoever is watching is shown. Nothing here waits on
// the network: the panel works the same with the server away.
import { computed, onBeforeUnmount, ref, shallowRef, watch } from 'vue'
import type { LiveInboxEvent } from '@shared/api/live'
import type { AttemptEvent } from '@shared/model/events'
import { createLivePublisher, type LivePublisher } from '@/live/livePublisher'
import { liveApi, liveStreams, type LiveApi, type LiveStreams } from '@/live/liveApi'
import { liveStatusOf } from '@/live/liveStatus'
import type { EventStream, StreamState } from '@/live/sseReader'
import type { LiveAttempt } from './useLiveAttempt'

/** After the inbox reopens, a moment for its backlog to arrive before the submission is sent again. */
const INBOX_SETTLE_MS = 600

export interface InstructorMessage {
  id: string
  kind: 'hint' | 'message'
  text: string
  from: string
}

export interface LiveClassroomOptions {
  /** Whether to take part (signed in, an attempt the server can hold). */
  enabled: () => boolean
  api?: Pick<LiveApi, 'openSession' | 'postEvents' | 'close'>
  streams?: Pick<LiveStreams, 'inbox'>
}

function messageOf(e: AttemptEvent): InstructorMessage | null {
  return e.type === 'message.received'
    ? { id: e.messageId, kind: e.kind, text: e.text, from: e.from.name }
    : null
}

export function useLiveClassroom(live: LiveAttempt, options: LiveClassroomOptions) {
  const api = options.api ?? liveApi
  const streams = options.streams ?? liveStreams
  const watchers = ref<{ id: string; name: string }[]>([])
  const messages = ref<InstructorMessage[]>([])
  const inboxState = ref<StreamState>('closed')
  let publisher: LivePublisher | null = null
  let inbox: EventStream | null = null
  let attemptId: string | null = null
  let settle: ReturnType<typeof setTimeout> | null = null
  const violations = shallowRef(0)

  const context = live.context
  const ready = computed(() => live.isLive.value && !!context.value.start && options.enabled())

  function onInbox(event: LiveInboxEvent) {
    if (event.type === 'watchers') {
      watchers.value = event.watchers
      return
    }
    if (event.type === 'injection') {
      live.send({
        type: 'INBOX',
        action: { type: 'fault.injected', injectionId: event.injectionId, fault: event.fault, by: event.by },
      })
      return
    }
    live.send({
      type: 'INBOX',
      action: {
        type: 'message.received',
        messageId: event.messageId,
        kind: event.kind,
        text: event.text,
        from: event.from,
      },
    })
  }

  function stop() {
    publisher?.stop()
    inbox?.close()
    if (settle) clearTimeout(settle)
    publisher = null
    inbox = null
    attemptId = null
    watchers.value = []
  }

  function openInbox(id: string) {
    inbox?.close()
    inbox = streams.inbox(id, {
      onEvent: onInbox,
      onState: (state) => (inboxState.value = state),
    })
  }

  function begin() {
    const c = live.actor.getSnapshot().context
    const start = c.start
    if (!start || !c.attemptId) return
    stop()
    attemptId = c.attemptId
    const id = c.attemptId
    publisher = createLivePublisher({
      open: () =>
        api.openSession(id, {
          scenarioVersionId: start.scenarioVersionId,
          assignmentId: c.target.assignmentId ?? null,
          assistance: start.assistance,
        }),
      post: (body) => api.postEvents(id, body),
      // The inbox belongs to the session: read it once the session is open.
      onOpened: () => openInbox(id),
      log: () => live.actor.getSnapshot().context.log,
      status: () => {
        const now = live.actor.getSnapshot().context
        return now.sim ? liveStatusOf(now.sim, now.grade, violations.value) : null
      },
    })
    publisher.start()
  }

  // A new attempt (first start, start again, a copy kept as new) is a new live session.
  watch(
    () => [ready.value, context.value.attemptId, context.value.epoch] as const,
    ([on, id]) => {
      if (!on) {
        // Submitted or closed: stop posting; a refused submission comes back to live and starts again.
        if (!live.snapshot.value.matches('submitting')) stop()
        return
      }
      if (id !== attemptId) begin()
    },
    { immediate: true },
  )

  // Every new action, and each new grade (the objectives and safety counts in the status).
  watch(
    () => [context.value.logLength, context.value.grade] as const,
    () => publisher?.notify(),
  )
  watch(
    () => context.value.warnings[0]?.id,
    (id, old) => {
      if (id !== undefined && id !== old) violations.value += 1
    },
  )

  // Instructors' messages in the log (this session's and any before a reload), newest first.
  watch(
    () => [context.value.logLength, context.value.epoch] as const,
    () => {
      const list = live.actor
        .getSnapshot()
        .context.log.map(messageOf)
        .filter((m): m is InstructorMessage => m !== null)
      if (list.length !== messages.value.length) messages.value = list.reverse()
    },
    { immediate: true },
  )

  // A submission refused for a fault the log lacks: read the inbox from its start, then send again.
  watch(
    () => live.snapshot.value.matches({ submitting: 'readingInbox' }),
    (reading) => {
      const id = live.actor.getSnapshot().context.attemptId
      if (!reading || !id) return
      openInbox(id)
      if (settle) clearTimeout(settle)
      settle = setTimeout(() => live.send({ type: 'INBOX_READY' }), INBOX_SETTLE_MS)
    },
  )

  onBeforeUnmount(() => {
    // Left the page: the instructors' view shows the panel closed at once (best effort; a refused or
    // failed submission only pauses the session, so it is not closed then).
    if (attemptId && publisher?.state() === 'live') api.close(attemptId).catch(() => {})
    stop()
  })

  return {
    watchers,
    messages,
    inboxState,
    /** Events the live session holds, as far as the panel knows (for tests). */
    sentCount: () => publisher?.sentCount() ?? 0,
  }
}

export type LiveClassroom = ReturnType<typeof useLiveClassroom>
