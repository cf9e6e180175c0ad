// Watching one apprentice's panel live: the replay (same machine, same renderer) fed from
// GET /api/live/attempts/:id and then the watch stream. It follows live by default: the playhead runs on at
// the apprentice's pace from their last event; a jump back stops following until "Back to live".
import { computed, onBeforeUnmount, ref, shallowRef, watch } from 'vue'
import { fromPromise } from 'xstate'
import type { AttemptDetail } from '@shared/api/attempts'
import type { LiveAttempt, LiveRow, LiveWatchStreamEvent } from '@shared/api/live'
import type { AttemptEvent } from '@shared/model/events'
import { liveApi, liveStreams, type LiveApi, type LiveStreams } from '@/live/liveApi'
import { placeBatch } from '@/live/placeBatch'
import type { EventStream, StreamState } from '@/live/sseReader'
import { useScenariosStore } from '@/stores/scenarios'
import type { ReplaySource } from '../machines/replayMachine'
import { useReplay } from './useReplay'

/** A live panel's time runs on past its last event; the playhead may follow it this far. */
const LIVE_TAIL_MS = 6 * 60 * 60 * 1000
/** New events are folded into the timeline at most this often (a replay of the whole log each time). */
const FEED_MS = 700

/** The live attempt in the shape the replay reads (it never leaves this page). */
function asAttempt(live: LiveAttempt, version: number): AttemptDetail {
  const row = live.row
  return {
    id: row.attemptId,
    userId: row.apprentice.id,
    userName: row.apprentice.name,
    assignmentId: null,
    scenarioId: row.scenario.versionId,
    scenarioKey: row.scenario.key,
    scenarioVersion: version,
    scenarioTitle: row.scenario.title,
    status: 'inProgress',
    assistanceLevel: row.assistance,
    eventCount: live.events.length,
    late: false,
    startedAt: row.openedAt,
    updatedAt: row.lastSeenAt,
    submittedAt: null,
    grade: null,
    reviewedAt: null,
    feedback: [],
    audit: [],
    events: live.events,
  }
}

export interface LiveWatchOptions {
  api?: Pick<LiveApi, 'attempt'>
  streams?: Pick<LiveStreams, 'watch'>
}

export function useLiveWatch(attemptId: string, options: LiveWatchOptions = {}) {
  const api = options.api ?? liveApi
  const streams = options.streams ?? liveStreams
  const scenarios = useScenariosStore()
  const row = shallowRef<LiveRow | null>(null)
  const cohortIds = shallowRef<string[]>([])
  const ended = ref(false)
  const streamState = ref<StreamState>('closed')
  const streamProblem = ref<string | null>(null)
  const following = ref(true)
  /** The log so far (grows in place); `count` is what changes. */
  const events: AttemptEvent[] = []
  const count = ref(0)
  /** Wall-clock moment the newest event arrived, to estimate the apprentice's time now. */
  let lastArrival = performance.now()
  let stream: EventStream | null = null
  let feedTimer: ReturnType<typeof setTimeout> | null = null

  const replay = useReplay(attemptId, {
    tailMs: LIVE_TAIL_MS,
    actors: {
      loadReplay: fromPromise<ReplaySource, { attemptId: string }>(async ({ input }) => {
        const live = await api.attempt(input.attemptId)
        const version = await scenarios.getById(live.row.scenario.versionId)
        row.value = live.row
        cohortIds.value = live.cohortIds
        ended.value = live.row.connection === 'ended'
        events.splice(0, events.length, ...live.events)
        count.value = events.length
        lastArrival = performance.now()
        return { attempt: asAttempt(live, version.version), scenario: version.document }
      }),
    },
  })

  /** The apprentice's simulated time now, as far as the watcher can tell (1× since their last event). */
  function liveTime(): number {
    const last = events[events.length - 1]?.t ?? 0
    return ended.value ? last : last + (performance.now() - lastArrival)
  }

  function feedSoon() {
    if (feedTimer) return
    feedTimer = setTimeout(() => {
      feedTimer = null
      replay.send({ type: 'FEED', events })
      if (following.value) backToLive()
    }, FEED_MS)
  }

  function onStream(event: LiveWatchStreamEvent) {
    if (event.type === 'row') {
      row.value = event.row
      if (event.row.connection === 'ended') ended.value = true
      return
    }
    if (event.type === 'ended') {
      ended.value = true
      return
    }
    // A gap means something was missed: the whole log is read again.
    const placed = placeBatch(events.length, event.from, event.events)
    if (placed.kind === 'gap') return void reload()
    const fresh = placed.events
    if (!fresh.length) return
    events.push(...fresh)
    count.value = events.length
    lastArrival = performance.now()
    feedSoon()
  }

  function openStream() {
    stream?.close()
    stream = streams.watch(attemptId, {
      lastEventId: events.length ? String(events.length - 1) : null,
      onEvent: onStream,
      onState: (state, problem) => {
        streamState.value = state
        streamProblem.value = problem
      },
    })
  }

  /** Something was missed: read the whole log again, then listen from its end. */
  async function reload() {
    stream?.close()
    stream = null
    try {
      const live = await api.attempt(attemptId)
      row.value = live.row
      if (live.events.length > events.length) {
        events.splice(0, events.length, ...live.events)
        count.value = events.length
        lastArrival = performance.now()
        replay.send({ type: 'FEED', events })
        if (following.value) backToLive()
      }
    } catch {
      // Keep what is shown; the stream below catches up when the server answers again.
    } finally {
      openStream()
    }
  }

  const ready = computed(() => replay.snapshot.value.matches('ready'))
  watch(ready, (now) => {
    if (!now) return
    if (ended.value) {
      // Opened after it ended: its last moment, still; nothing more will come.
      following.value = false
      replay.send({ type: 'SEEK', t: liveTime() })
      return
    }
    backToLive()
    openStream()
  })

  // Ended: the playhead stops on the last moment instead of running on past it.
  watch(ended, (now) => {
    if (!now || !ready.value) return
    following.value = false
    replay.send({ type: 'PAUSE' })
    replay.send({ type: 'SEEK', t: liveTime() })
  })

  function backToLive() {
    following.value = true
    replay.send({ type: 'RATE', rate: 1 })
    replay.send({ type: 'SEEK', t: liveTime() })
    replay.send({ type: 'PLAY' })
  }

  /** A jump or a pause by the watcher: stop following until they ask to go back. */
  function leaveLive() {
    following.value = false
  }

  onBeforeUnmount(() => {
    stream?.close()
    if (feedTimer) clearTimeout(feedTimer)
  })

  return {
    replay,
    row,
    cohortIds,
    ended,
    following,
    count,
    streamState,
    streamProblem,
    events: () => events,
    liveTime,
    backToLive,
    leaveLive,
    reconnect: () => (stream ? stream.reconnect() : openStream()),
  }
}

export type LiveWatch = ReturnType<typeof useLiveWatch>
