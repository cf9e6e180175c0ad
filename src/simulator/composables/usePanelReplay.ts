// Replay of a recorded attempt: the model's timeline, sampled at a playhead that plays at 1×/4×/16×
// or jumps when scrubbed. The cost of a jump is one segment lookup, not a re-simulation.
import { computed, ref, shallowRef } from 'vue'
import { replay, sampleTimeline } from '@shared/model'
import type { AttemptEvent } from '@shared/model/events'
import type { SimulationSetup } from '@shared/model/setup'
import type { SimState, Timeline, TimelineSample } from '@shared/model/types'

export const REPLAY_RATES = [1, 4, 16] as const

export function usePanelReplay(setup: SimulationSetup, events: readonly AttemptEvent[]) {
  const timeline: Timeline = replay(setup, [...events])
  // Show a little after the last event so the final state is visible.
  const end = timeline.end + 2000
  const position = ref(0)
  const playing = ref(false)
  const rate = ref<(typeof REPLAY_RATES)[number]>(1)
  const sample = shallowRef<TimelineSample>(sampleTimeline(timeline, 0))

  function stateAt(s: TimelineSample): SimState {
    return timeline.segments[s.segment].state
  }

  function seek(t: number) {
    position.value = Math.max(0, Math.min(end, Math.round(t)))
    sample.value = sampleTimeline(timeline, position.value)
  }

  /** Advances the playhead by a frame's wall time. */
  function frame(wallDtMs: number) {
    if (!playing.value) return
    const next = position.value + wallDtMs * rate.value
    if (next >= end) playing.value = false
    seek(next)
  }

  const eventMarks = computed(() => events.map((e, i) => ({ t: e.t, index: i, type: e.type })))

  return {
    timeline,
    end,
    position,
    playing,
    rate,
    sample,
    eventMarks,
    stateAt,
    seek,
    frame,
    play: () => {
      if (position.value >= end) seek(0)
      playing.value = true
    },
    pause: () => (playing.value = false),
  }
}
