// Playback of a recorded attempt: loads the attempt (once) and its scenario version, replays the log
// once into a timeline, grades it once, and folds the keypad's menu through it; then play, pause,
// 1×/4×/16× and scrubbing move a playhead over the timeline (a jump is one segment lookup). Watching a
// panel live uses the same machine: `FEED` brings the log as it grows, and the tail past the last event is
// long, so the playhead can run on with the apprentice's time.
import { assign, fromPromise, setup } from 'xstate'
import type { AttemptDetail } from '@shared/api/attempts'
import { replay } from '@shared/model'
import type { AttemptEvent } from '@shared/model/events'
import type { Timeline } from '@shared/model/types'
import { grade, type GradeResult } from '@shared/scenario/grade'
import type { Scenario } from '@shared/scenario/schema'
import { toSimulationSetup } from '@shared/scenario/setup'
import { menuAfterEvent, STATUS_SCREEN, type KeypadMenu } from '../scene/keypadMenu'

export const REPLAY_RATES = [1, 4, 16] as const
export type ReplayRate = (typeof REPLAY_RATES)[number]
/** Shown past the last event, so the final state is visible. */
export const REPLAY_TAIL_MS = 2000

export interface ReplaySource {
  attempt: AttemptDetail
  scenario: Scenario
}

export interface ReplayData {
  attempt: AttemptDetail
  scenario: Scenario
  events: readonly AttemptEvent[]
  timeline: Timeline
  /** The keypad menu after each timeline segment (index = segment). */
  menus: KeypadMenu[]
  graded: GradeResult | null
  end: number
}

export interface ReplayContext {
  attemptId: string
  data: ReplayData | null
  position: number
  rate: ReplayRate
  problem: string | null
  /** Shown past the last event (a live panel's time runs on after it). */
  tailMs: number
}

export type ReplayEvent =
  | { type: 'PLAY' }
  | { type: 'PAUSE' }
  | { type: 'SEEK'; t: number }
  | { type: 'RATE'; rate: ReplayRate }
  | { type: 'FRAME'; wallDtMs: number }
  | { type: 'RETRY' }
  /** Live watching: the log so far (it only grows); the playhead stays where it is. */
  | { type: 'FEED'; events: readonly AttemptEvent[] }

/** Everything derived from the log, computed once when the replay opens. */
export function prepareReplay({ attempt, scenario }: ReplaySource, tailMs = REPLAY_TAIL_MS): ReplayData {
  const events = attempt.events
  const timeline = replay(toSimulationSetup(scenario), events)
  const menus: KeypadMenu[] = [STATUS_SCREEN]
  events.forEach((event, i) => {
    menus.push(menuAfterEvent(menus[i], event, timeline.segments[i + 1].state).menu)
  })
  let graded: GradeResult | null = null
  try {
    graded = grade(scenario, events, { assistance: attempt.assistanceLevel })
  } catch {
    graded = null
  }
  return { attempt, scenario, events, timeline, menus, graded, end: timeline.end + tailMs }
}

const clamp = (t: number, end: number) => Math.max(0, Math.min(end, Math.round(t)))

export const replayMachine = setup({
  types: {
    context: {} as ReplayContext,
    events: {} as ReplayEvent,
    input: {} as { attemptId: string; tailMs?: number },
  },
  actors: {
    loadReplay: fromPromise<ReplaySource, { attemptId: string }>(async () => {
      throw new Error('loadReplay is provided by the page (useReplay)')
    }),
  },
  guards: {
    atEnd: ({ context }) => !!context.data && context.position >= context.data.end,
  },
  actions: {
    prepare: assign(({ context, event }) => ({
      data: prepareReplay((event as unknown as { output: ReplaySource }).output, context.tailMs),
      position: 0,
      problem: null,
    })),
    noteProblem: assign(({ event }) => ({
      problem: `The replay could not be opened: ${((event as { error?: Error }).error ?? new Error('unknown')).message}`,
    })),
    seek: assign(({ context, event }) =>
      event.type === 'SEEK' && context.data ? { position: clamp(event.t, context.data.end) } : {},
    ),
    advance: assign(({ context, event }) =>
      event.type === 'FRAME' && context.data
        ? { position: clamp(context.position + event.wallDtMs * context.rate, context.data.end) }
        : {},
    ),
    rewindIfAtEnd: assign(({ context }) =>
      context.data && context.position >= context.data.end ? { position: 0 } : {},
    ),
    feed: assign(({ context, event }) => {
      if (event.type !== 'FEED' || !context.data || event.events.length <= context.data.events.length)
        return {}
      const attempt = { ...context.data.attempt, events: [...event.events] }
      return { data: prepareReplay({ attempt, scenario: context.data.scenario }, context.tailMs) }
    }),
    setRate: assign(({ event }) => (event.type === 'RATE' ? { rate: event.rate } : {})),
  },
}).createMachine({
  id: 'replay',
  context: ({ input }) => ({
    attemptId: input.attemptId,
    data: null,
    position: 0,
    rate: 1,
    problem: null,
    tailMs: input.tailMs ?? REPLAY_TAIL_MS,
  }),
  initial: 'loading',
  states: {
    loading: {
      invoke: {
        src: 'loadReplay',
        input: ({ context }) => ({ attemptId: context.attemptId }),
        onDone: { target: 'ready', actions: 'prepare' },
        onError: { target: 'failed', actions: 'noteProblem' },
      },
    },
    failed: { on: { RETRY: 'loading' } },
    ready: {
      initial: 'paused',
      on: { SEEK: { actions: 'seek' }, RATE: { actions: 'setRate' }, FEED: { actions: 'feed' } },
      states: {
        paused: { on: { PLAY: { target: 'playing', actions: 'rewindIfAtEnd' } } },
        playing: {
          on: {
            PAUSE: 'paused',
            FRAME: [{ actions: 'advance' }],
          },
          always: { guard: 'atEnd', target: 'paused' },
        },
      },
    },
  },
})
