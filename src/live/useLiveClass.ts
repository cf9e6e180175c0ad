// The class view's data: the cohort's open panels (GET once), then the class stream keeping each row
// current; the stream's own connection state, and a clock for the time each panel has been open.
import { onBeforeUnmount, ref, shallowRef } from 'vue'
import type { LiveClass, LiveRow } from '@shared/api/live'
import { liveApi, liveStreams, type LiveApi, type LiveStreams } from './liveApi'
import { applyClassEvent } from './classRows'
import type { EventStream, StreamState } from './sseReader'

export interface LiveClassOptions {
  api?: Pick<LiveApi, 'classOf'>
  streams?: Pick<LiveStreams, 'classOf'>
  tickMs?: number
}

export function useLiveClass(cohortId: () => string, options: LiveClassOptions = {}) {
  const api = options.api ?? liveApi
  const streams = options.streams ?? liveStreams
  const cohort = shallowRef<LiveClass['cohort'] | null>(null)
  const rows = shallowRef<LiveRow[]>([])
  const loading = ref(false)
  const error = shallowRef<unknown>(null)
  const streamState = ref<StreamState>('closed')
  const streamProblem = ref<string | null>(null)
  const now = ref(Date.now())
  let stream: EventStream | null = null
  const clock = setInterval(() => (now.value = Date.now()), options.tickMs ?? 1000)

  async function load() {
    stream?.close()
    stream = null
    loading.value = true
    error.value = null
    try {
      const snapshot = await api.classOf(cohortId())
      cohort.value = snapshot.cohort
      rows.value = snapshot.rows
    } catch (e) {
      error.value = e
      return
    } finally {
      loading.value = false
    }
    let opens = 0
    stream = streams.classOf(cohortId(), {
      onEvent: (event) => (rows.value = applyClassEvent(rows.value, event)),
      onState: (state, problem) => {
        streamState.value = state
        streamProblem.value = problem
        // The stream starts afresh on each connection and cannot say which rows went while it was away.
        if (state === 'open' && ++opens > 1) void refresh()
      },
    })
  }

  async function refresh() {
    try {
      rows.value = (await api.classOf(cohortId())).rows
    } catch {
      // Keep the rows shown; the stream goes on updating them.
    }
  }

  onBeforeUnmount(() => {
    stream?.close()
    clearInterval(clock)
  })

  return {
    cohort,
    rows,
    loading,
    error,
    streamState,
    streamProblem,
    now,
    load,
    reconnect: () => (stream ? stream.reconnect() : load()),
  }
}
