// A replay as the page uses it: the replay machine (with the app's loader), the frame path for the
// canvas and the sample the side panels show (refreshed a few times a second while playing).
import { computed, shallowRef } from 'vue'
import { useActorRef, useSelector } from '@xstate/vue'
import { sampleTimeline } from '@shared/model'
import type { TimelineSample } from '@shared/model/types'
import { replayMachine, type ReplayEvent } from '../machines/replayMachine'
import { deriveView } from '../scene/deriveView'
import { layoutPanel } from '../scene/layout'
import { emptyView, type PanelView } from '../scene/view'
import { replayActors } from '../services'
import type { TrendPoint } from '../components/PanelTrendChart.vue'

const PUBLISH_MS = 200
const TREND_STEP_MS = 1000
const TREND_MS = 60_000

export interface ReplayOptions {
  /** Where the attempt comes from (the live watch view gives its own loader). */
  actors?: ReturnType<typeof replayActors>
  tailMs?: number
}

export function useReplay(attemptId: string, options: ReplayOptions = {}) {
  const actor = useActorRef(replayMachine.provide({ actors: options.actors ?? replayActors() }), {
    input: { attemptId, tailMs: options.tailMs },
  })
  const send = (event: ReplayEvent) => actor.send(event)
  // The playhead moves every frame; screens follow the rest of the state and a throttled sample.
  const snapshot = useSelector(
    actor,
    (s) => s,
    (a, b) =>
      JSON.stringify(a.value) === JSON.stringify(b.value) &&
      a.context.data === b.context.data &&
      a.context.rate === b.context.rate &&
      a.context.problem === b.context.problem,
  )
  const position = useSelector(actor, (s) => Math.round(s.context.position / 100) * 100)
  const data = computed(() => snapshot.value.context.data)
  const layout = computed(() => (data.value ? layoutPanel(data.value.scenario.start.devices) : null))
  const playing = computed(() => snapshot.value.matches({ ready: 'playing' }))
  const shown = shallowRef<TimelineSample | null>(null)

  let lastShown = -1
  function render(wallDtMs: number): PanelView {
    if (actor.getSnapshot().matches({ ready: 'playing' })) actor.send({ type: 'FRAME', wallDtMs })
    const { data: d, position: t } = actor.getSnapshot().context
    if (!d) return emptyView()
    const sample = sampleTimeline(d.timeline, t)
    if (Math.abs(sample.t - lastShown) >= PUBLISH_MS || !actor.getSnapshot().matches({ ready: 'playing' })) {
      if (sample.t !== lastShown || !shown.value) shown.value = sample
      lastShown = sample.t
    }
    return deriveView(d.timeline.segments[sample.segment].state, sample, sample.circuit, {
      selectedWire: null,
      draftWire: null,
      probeDrag: null,
      highlight: null,
      armed: null,
      menu: d.menus[sample.segment],
      tagFallback: { name: d.attempt.userName, date: d.attempt.startedAt.slice(0, 10) },
    })
  }

  const trend = computed<TrendPoint[]>(() => {
    const d = data.value
    const t = shown.value?.t ?? 0
    if (!d) return []
    const points: TrendPoint[] = []
    for (let x = Math.max(0, t - TREND_MS); x <= t; x += TREND_STEP_MS) {
      const s = sampleTimeline(d.timeline, x)
      points.push({ t: x, referenceHz: s.referenceHz, outputHz: s.outputHz })
    }
    return points
  })

  return { actor, snapshot, send, data, layout, playing, position, shown, trend, render }
}

export type Replay = ReturnType<typeof useReplay>
