// The live attempt as the page uses it: the live-attempt machine (with the app's network and grading
// actors), the simulated clock that drives it, the frame path for the canvas, the panel's own UI state
// (selected wire, wire colour, time speed) and what the screen reader hears. Views pass ids, components
// call `intent` or `send`; nothing here decides what the attempt is — the machine does.
import { computed, reactive, ref, shallowRef, watch } from 'vue'
import { useActorRef, useSelector } from '@xstate/vue'
import { readDrive } from '@shared/model'
import type { CircuitReading, DriveReading, SimState } from '@shared/model/types'
import {
  liveAttemptMachine,
  type LiveAttemptEvent,
  type LiveTarget,
  type PanelAction,
} from '../machines/liveAttemptMachine'
import { createCircuitCache } from '../scene/circuitCache'
import { deriveView } from '../scene/deriveView'
import { stateWord } from '../scene/driveDisplay'
import { eventWireId, eventWords } from '../scene/eventWords'
import { actionsFor, nextWireId } from '../scene/intentActions'
import type { Intent } from '../scene/interaction'
import { layoutPanel } from '../scene/layout'
import { createSimClock } from '../scene/simClock'
import { emptyView, type PanelView } from '../scene/view'
import { DEFAULT_WIRE_COLOUR, wireLabel } from '../scene/wireColours'
import { liveAttemptActors } from '../services'
import type { StageOverlay } from '../components/PanelStage.vue'
import type { TrendPoint } from '../components/PanelTrendChart.vue'

export const TIME_SPEEDS = [1, 10, 60] as const
/** Side panels follow the model this often, not every frame. */
const PUBLISH_MS = 250
const TREND_MS = 60_000

type Machine = typeof liveAttemptMachine
type Snapshot = ReturnType<ReturnType<typeof useActorRef<Machine>>['getSnapshot']>

/** Everything a screen shows except the model state itself, which changes every frame. */
function sameScreen(a: Snapshot, b: Snapshot): boolean {
  if (a.value !== b.value && JSON.stringify(a.value) !== JSON.stringify(b.value)) return false
  const x = a.context
  const y = b.context
  return (
    x.logLength === y.logLength &&
    x.epoch === y.epoch &&
    x.menu === y.menu &&
    x.grade === y.grade &&
    x.warnings === y.warnings &&
    x.actionError === y.actionError &&
    x.notice === y.notice &&
    x.problem === y.problem &&
    x.serverSaved === y.serverSaved &&
    x.serverSaveProblem === y.serverSaveProblem &&
    x.result === y.result &&
    x.tries === y.tries &&
    x.start === y.start &&
    x.decision === y.decision
  )
}

/** Today's date as a tag is written (the apprentice's own clock, YYYY-MM-DD). */
function today(): string {
  const d = new Date()
  const pad = (n: number) => String(n).padStart(2, '0')
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`
}

export interface LiveAttemptOptions {
  /** The name the apprentice writes on their lock's tag (the signed-in user's). */
  tagName?: () => string | null
  /** The machine's effects, when not the app's own (a draft on the panel: src/simulator/authoring/). */
  actors?: LiveAttemptActors
}

type LiveAttemptActors = ReturnType<typeof liveAttemptActors>

export function useLiveAttempt(target: LiveTarget, options: LiveAttemptOptions = {}) {
  const actors = options.actors ?? liveAttemptActors()
  const actor = useActorRef(liveAttemptMachine.provide({ actors }), {
    input: { target },
  })
  const snapshot = useSelector(actor, (s) => s, sameScreen)
  const send = (event: LiveAttemptEvent) => actor.send(event)
  const context = computed(() => snapshot.value.context)
  const scenario = computed(() => context.value.start?.scenario ?? null)
  const layout = computed(() => (context.value.setup ? layoutPanel(context.value.setup.devices) : null))
  const isLive = computed(() => snapshot.value.matches('live'))

  const ui = reactive({
    selectedWire: null as string | null,
    colour: DEFAULT_WIRE_COLOUR as string,
    speed: 1 as number,
    /** Asking "remove your lock?" before the lock comes off. */
    confirmingUnlock: false,
    /** A wire being drawn: the terminal it started from (the panel is mid-gesture). */
    wireFrom: null as string | null,
  })
  const clock = createSimClock(0)
  const circuits = createCircuitCache()

  // Published a few times a second for the side panels.
  const simView = shallowRef<SimState | null>(null)
  const drive = shallowRef<DriveReading | null>(null)
  const circuit = shallowRef<CircuitReading | null>(null)
  const trend = shallowRef<TrendPoint[]>([])
  const announcement = ref('')

  function publish(sim: SimState, d: DriveReading, c: CircuitReading) {
    simView.value = sim
    drive.value = d
    circuit.value = c
    const point = { t: sim.t, referenceHz: d.referenceHz, outputHz: d.outputHz }
    trend.value = [...trend.value.filter((p) => p.t >= sim.t - TREND_MS && p.t < sim.t), point]
  }

  // The clock starts from the attempt's last moment, and stands still while the attempt is not live.
  watch(
    () => [context.value.epoch, isLive.value] as const,
    ([, live]) => {
      const sim = actor.getSnapshot().context.sim
      if (!sim) return
      clock.set(sim.t)
      if (live) clock.resume()
      else clock.pause()
      circuits.forget()
      trend.value = []
      publish(sim, readDrive(sim), circuits.read(sim, readDrive(sim), 0, performance.now()))
    },
  )

  let sincePublish = 0
  /** The frame path: let simulated time catch up, derive the view; no other model work. */
  function render(wallDtMs: number, overlay: StageOverlay): PanelView {
    if (actor.getSnapshot().matches('live')) actor.send({ type: 'TICK', t: clock.time() })
    const { sim, logLength, menu } = actor.getSnapshot().context
    if (!sim) return emptyView()
    const d = readDrive(sim)
    const c = circuits.read(sim, d, logLength, performance.now())
    sincePublish += wallDtMs
    if (sincePublish >= PUBLISH_MS) {
      sincePublish = 0
      publish(sim, d, c)
    }
    return deriveView(sim, d, c, {
      selectedWire: ui.selectedWire,
      draftWire: overlay.draftWire ? { ...overlay.draftWire, colour: ui.colour } : null,
      probeDrag: overlay.probeDrag,
      highlight: overlay.hover,
      armed: overlay.armed,
      menu,
    })
  }

  function record(action: PanelAction) {
    send({ type: 'RECORD', action, t: clock.time() })
  }

  function intent(i: Intent) {
    const sim = actor.getSnapshot().context.sim
    if (!sim || !layout.value) return
    const title = (id: string) => layout.value?.terminals[id]?.title ?? 'a terminal'
    if (i.type === 'wire.select') {
      ui.selectedWire = i.wire
      const index = sim.wires.findIndex((w) => w.id === i.wire)
      if (index >= 0) {
        const w = sim.wires[index]
        announce(`Wire ${wireLabel(w.id, w.colour, index)} selected. Press Delete to remove it.`)
      }
      return
    }
    if (i.type === 'wire.start') ui.wireFrom = i.from
    if (i.type === 'wire.cancel' || i.type === 'wire.add') ui.wireFrom = null
    if (i.type === 'wire.start') {
      announce(
        `Wire started at ${title(i.from)}: tap the terminal it goes to. Tap it again or press Escape to let go.`,
      )
      return
    }
    if (i.type === 'wire.cancel') return announce('Wire let go.')
    if (i.type === 'wire.remove' && ui.selectedWire === i.wire) ui.selectedWire = null
    if (i.type === 'lock.toggle' && sim.power.locked) {
      ui.confirmingUnlock = true
      return
    }
    if (i.type === 'lock.remove') ui.confirmingUnlock = false
    const name = options.tagName?.()?.trim()
    const tag = name ? { name, date: today() } : undefined
    for (const action of actionsFor(i, sim, ui.colour, tag)) record(action)
  }

  /** A wire chosen from lists (with its own colour). */
  function addWire(from: string, to: string, colour: string) {
    const sim = actor.getSnapshot().context.sim
    if (sim) record({ type: 'wire.added', id: nextWireId(sim), from, to, colour: colour as never })
  }

  function announce(text: string) {
    announcement.value = text
  }

  // What the screen reader hears after an action: the action in words, and anything it caused.
  let announced = 0
  watch(
    () => [context.value.logLength, context.value.epoch] as const,
    ([length], old) => {
      const oldEpoch = old?.[1] ?? -1
      const { log, sim, epoch } = actor.getSnapshot().context
      if (epoch !== oldEpoch) announced = length
      if (length <= announced || !layout.value) return
      // Wire markers as the panel prints them now (a removed wire by its id).
      const marker = (e: (typeof log)[number]) => {
        const id = e.type === 'wire.removed' ? undefined : eventWireId(e)
        if (id === undefined || !sim) return undefined
        const at = sim.wires.findIndex((w) => w.id === id)
        return at >= 0 ? wireLabel(sim.wires[at].id, sim.wires[at].colour, at) : undefined
      }
      const words = log.slice(announced, length).map((e) => eventWords(e, layout.value!, marker(e)))
      announced = length
      const messages = sim?.messages.map((m) => m.text) ?? []
      announce([...words, ...messages].join('. '))
    },
  )
  watch(
    () => context.value.warnings[0]?.id,
    () => context.value.warnings[0] && announce(context.value.warnings[0].text),
  )
  watch(
    () => context.value.actionError,
    (e) => e && announce(e),
  )
  let lastWord = ''
  watch(drive, (d) => {
    if (!d) return
    const word = stateWord(d)
    if (lastWord && word !== lastWord) announce(`Drive ${word.toLowerCase()}.`)
    lastWord = word
  })

  function setSpeed(speed: number) {
    clock.setSpeed(speed)
    ui.speed = speed
    announce(
      speed === 1 ? 'Simulated time runs at real speed.' : `Simulated time runs ${speed} times faster.`,
    )
  }

  const attemptsLeft = computed(() => {
    const rules = context.value.start?.assignment
    return rules?.attemptLimit == null ? null : Math.max(0, rules.attemptLimit - rules.attemptsUsed)
  })

  return {
    actor,
    snapshot,
    context,
    send,
    scenario,
    layout,
    isLive,
    ui,
    simView,
    drive,
    circuit,
    trend,
    announcement,
    attemptsLeft,
    render,
    intent,
    record,
    addWire,
    setSpeed,
    sim: () => actor.getSnapshot().context.sim,
  }
}

export type LiveAttempt = ReturnType<typeof useLiveAttempt>
