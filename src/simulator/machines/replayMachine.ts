// Playback of a recorded attempt: loads the attempt (once) and its scenario version, replays the log
// once into a timeline, grades it once, and folds the keypad's menu through it; then play, pause,
// 1×/4×/16× and scrubbing move a playhead over the timeline (a jump is one segment lookup).
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
}

export type ReplayEvent =
  | { type: 'PLAY' }
  | { type: 'PAUSE' }
  | { type: 'SEEK'; t: number }
  | { type: 'RATE'; rate: ReplayRate }
  | { type: 'FRAME'; wallDtMs: number }
  | { type: 'RETRY' }

/** Everything derived from the log, computed once when the replay opens. */
export function prepareReplay({ attempt, scenario }: ReplaySource): ReplayData {
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
  return { attempt, scenario, events, timeline, menus, graded, end: timeline.end + REPLAY_TAIL_MS }
}

const clamp = (t: number, end: number) => Math.max(0, Math.min(end, Math.round(t)))

export const replayMachine = setup({
  types: {
    context: {} as ReplayContext,
    events: {} as ReplayEvent,
    input: {} as { attemptId: string },
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
    prepare: assign(({ event }) => ({
      data: prepareReplay((event as unknown as { output: ReplaySource }).output),
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
    setRate: assign(({ event }) => (event.type === 'RATE' ? { rate: event.rate } : {})),
  },
}).createMachine({
  id: 'replay',
  context: ({ input }) => ({ attemptId: input.attemptId, data: null, position: 0, rate: 1, problem: null }),
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
      on: { SEEK: { actions: 'seek' }, RATE: { actions: 'setRate' } },
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
