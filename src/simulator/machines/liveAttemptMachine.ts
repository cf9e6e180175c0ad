// A live attempt (practice or assignment) from start to grade: loading the scenario and any saved copy,
// the model state and its event log, saving to this browser after every action and to the server every
// 30 s, live grading and safety warnings, and submission with retries. Components send events; the
// effects (network, grading) are actors given by name, so tests swap them with `machine.provide`.
import { assign, enqueueActions, fromCallback, fromPromise, sendTo, setup } from 'xstate'
import { ATTEMPT_DIVERGED, type AttemptSummary, type SubmitAttemptRequest } from '@shared/api/attempts'
import { advance, applyEvent, createSimulation } from '@shared/model'
import { attemptEventSchema, type AttemptEvent } from '@shared/model/events'
import type { SimulationSetup } from '@shared/model/setup'
import type { SimState } from '@shared/model/types'
import { grade, type GradeResult } from '@shared/scenario/grade'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import type { Scenario } from '@shared/scenario/schema'
import { toSimulationSetup } from '@shared/scenario/setup'
import type { PanelAction } from '../scene/intentActions'
import { menuAfterEvent, STATUS_SCREEN, type KeypadMenu } from '../scene/keypadMenu'
import type { AttemptStore } from '../storage/attemptStore'
import { chooseStart, type AttemptCopy, type StartChoice, type StartDecision } from './attemptStart'
import { warningText, type FromLiveGrading, type LiveGradingInput, type ToLiveGrading } from './liveGrading'
import { isRetryable, retryDelayMs } from './retry'

export type { PanelAction }

/**
 * A scenario's draft on the panel (#17, src/simulator/authoring/): the author sets up its start, tries
 * it, or records its reference solution. Nothing is saved as an attempt; the page does the saving.
 */
export type DraftPurpose = 'setup' | 'try' | 'reference'

export interface LiveTarget {
  /** draft: an author's run on a draft, never saved to the server as an attempt nor counted. */
  mode: 'practice' | 'assignment' | 'draft'
  /** With mode draft: what the run is for. */
  draftPurpose?: DraftPurpose
  scenarioKey: string
  /** A particular version; the latest when absent. */
  scenarioVersion?: number
  assignmentId?: string
  /** An attempt to resume (a "Resume" link names it). */
  attemptId?: string
  /** Practice: the assistance level the apprentice chose (standard when absent). */
  assistance?: AssistanceLevel
}

export interface AssignmentRules {
  title: string
  attemptLimit: number | null
  /** Submitted attempts so far. */
  attemptsUsed: number
  hintsAllowed: boolean
}

/** Everything the machine needs before the panel can start (loaded by the `loadStart` actor). */
export interface LiveStart {
  scenario: Scenario
  scenarioTitle: string
  scenarioVersionId: string
  assignment: AssignmentRules | null
  /**
   * The level this attempt is made at: a copy on the server keeps the level it started at, else the
   * assignment's, else the apprentice's choice for practice. The panel shows and hides help by it.
   */
  assistance: AssistanceLevel
  store: AttemptStore
  browser: AttemptCopy | null
  server: AttemptCopy | null
  /** Something to tell the user about the browser's copy (e.g. it was damaged and set aside). */
  problem: string | null
}

export interface SafetyWarning {
  id: number
  t: number
  text: string
}

export interface LiveAttemptContext {
  target: LiveTarget
  newAttemptId: () => string
  start: LiveStart | null
  setup: SimulationSetup | null
  decision: StartDecision | null
  attemptId: string
  sim: SimState | null
  /**
   * The attempt's events. Append-only and appended in place: copying it on every action would make an
   * action cost more the longer the attempt. `logLength` changes with it, so snapshots show the change.
   */
  log: AttemptEvent[]
  logLength: number
  /** Bumped whenever the attempt (re)starts from a copy, so the clock can start from its time. */
  epoch: number
  menu: KeypadMenu
  /** Events acknowledged by the server. */
  serverSaved: number
  serverSaveProblem: string | null
  grade: GradeResult | null
  warnings: SafetyWarning[]
  actionError: string | null
  notice: string | null
  problem: string | null
  /** Whether opening the exercise again could succeed (a network or server failure, not a refusal). */
  loadRetryable: boolean
  tries: number
  result: AttemptSummary | null
}

/** What the live classroom's inbox hands the panel: an instructor's fault or message, for the log. */
export type InboxAction = Extract<PanelAction, { type: 'fault.injected' | 'message.received' }>

export type LiveAttemptEvent =
  | { type: 'RECORD'; action: PanelAction; t: number }
  /** Appended at the current simulated time, like an action; one already in the log is ignored. */
  | { type: 'INBOX'; action: InboxAction }
  /** The inbox has been read again after a submission was refused for a pending injection. */
  | { type: 'INBOX_READY' }
  | { type: 'TICK'; t: number }
  | { type: 'CHOOSE'; choice: number }
  | { type: 'SUBMIT' }
  /** A draft's run ends here, graded on the panel (nothing is sent). */
  | { type: 'FINISH' }
  | { type: 'SAVE_NOW' }
  | { type: 'START_AGAIN' }
  | { type: 'CONFIRM' }
  | { type: 'CANCEL' }
  | { type: 'RETRY' }
  | { type: 'BACK' }
  | { type: 'LOAD_SERVER_COPY' }
  | { type: 'KEEP_AS_NEW' }
  | FromLiveGrading

export const INJECTION_PENDING = 'injection_pending'
export const AUTOSAVE_MS = 30_000
export const REGRADE_MS = 3_000
const KEEP_WARNINGS = 5

function errorMessage(error: unknown): string {
  return (error as Error | null)?.message ?? String(error)
}

function isDiverged(error: unknown): boolean {
  return (error as { code?: string } | null)?.code === ATTEMPT_DIVERGED
}

/** Whether the log already holds this injection or message (the inbox may deliver one twice). */
export function inLog(log: readonly AttemptEvent[], action: InboxAction): boolean {
  return log.some((e) =>
    action.type === 'fault.injected'
      ? e.type === 'fault.injected' && e.injectionId === action.injectionId
      : e.type === 'message.received' && e.messageId === action.messageId,
  )
}

function requestBody(
  context: LiveAttemptContext,
  status: 'inProgress' | 'submitted',
  events: AttemptEvent[],
): SubmitAttemptRequest {
  const target = context.target.assignmentId
    ? { assignmentId: context.target.assignmentId }
    : { scenarioId: context.start!.scenarioVersionId }
  // The server fixes the level at the first save (an assignment's own level wins there).
  return { id: context.attemptId, status, events, assistanceLevel: context.start!.assistance, ...target }
}

/** The log to submit: the attempt's events, closed by attempt.ended unless it already is. */
function submittedLog(context: LiveAttemptContext): AttemptEvent[] {
  const last = context.log[context.log.length - 1]
  if (last?.type === 'attempt.ended') return [...context.log]
  return [...context.log, { t: Math.max(context.sim?.t ?? 0, last?.t ?? 0), type: 'attempt.ended' }]
}

/** Replays a copy's events into a fresh model state and keypad menu (once, when an attempt begins). */
function begin(
  context: LiveAttemptContext,
  events: readonly AttemptEvent[],
  attemptId: string,
  fromServer: boolean,
) {
  let sim = createSimulation(context.setup!)
  let menu: KeypadMenu = STATUS_SCREEN
  for (const event of events) {
    sim = applyEvent(sim, event)
    menu = menuAfterEvent(menu, event, sim).menu
  }
  const log = [...events]
  return {
    attemptId,
    sim,
    menu,
    log,
    logLength: log.length,
    serverSaved: fromServer ? log.length : 0,
    serverSaveProblem: null,
    grade: null,
    warnings: [],
    actionError: null,
    result: null,
    tries: 0,
    epoch: context.epoch + 1,
  }
}

function fromChoice(context: LiveAttemptContext, choice: StartChoice | undefined) {
  const copy = choice?.copy
  if (!copy) return { ...begin(context, [], context.newAttemptId(), false), notice: null }
  const id = choice.asNewAttempt ? context.newAttemptId() : copy.attemptId
  return {
    ...begin(context, copy.events, id, copy.source === 'server' && !choice.asNewAttempt),
    notice: choice.asNewAttempt ? 'Your copy goes on as a new attempt.' : null,
  }
}

export const liveAttemptMachine = setup({
  types: {
    context: {} as LiveAttemptContext,
    events: {} as LiveAttemptEvent,
    input: {} as { target: LiveTarget; newAttemptId?: () => string },
  },
  actors: {
    loadStart: fromPromise<LiveStart, { target: LiveTarget }>(async () => {
      throw new Error('loadStart is provided by the page (useLiveAttempt)')
    }),
    loadServerCopy: fromPromise<AttemptCopy, { attemptId: string }>(async () => {
      throw new Error('loadServerCopy is provided by the page (useLiveAttempt)')
    }),
    saveProgress: fromPromise<AttemptSummary, SubmitAttemptRequest>(async () => {
      throw new Error('saveProgress is provided by the page (useLiveAttempt)')
    }),
    submitAttempt: fromPromise<AttemptSummary, SubmitAttemptRequest>(async () => {
      throw new Error('submitAttempt is provided by the page (useLiveAttempt)')
    }),
    // The one place live grading and live safety warnings come from (see liveGrading.ts).
    liveGrading: fromCallback<ToLiveGrading, LiveGradingInput, FromLiveGrading>(() => {
      throw new Error('liveGrading is provided by the page (useLiveAttempt)')
    }),
  },
  delays: {
    autosave: AUTOSAVE_MS,
    regrade: REGRADE_MS,
    retry: ({ context }) => retryDelayMs(context.tries),
  },
  guards: {
    mustAsk: ({ context }) => context.decision?.kind === 'ask',
    mayStartAgain: ({ context }) => context.target.mode !== 'assignment',
    isDraft: ({ context }) => context.target.mode === 'draft',
    // A draft's run is never saved as an attempt.
    hasUnsavedEvents: ({ context }) =>
      context.target.mode !== 'draft' && context.logLength > context.serverSaved,
    laterTick: ({ context, event }) =>
      event.type === 'TICK' && context.sim !== null && Number.isInteger(event.t) && event.t > context.sim.t,
    diverged: ({ event }) => isDiverged((event as { error?: unknown }).error),
    injectionPending: ({ event }) =>
      (event as { error?: { code?: string } }).error?.code === INJECTION_PENDING,
    retryable: ({ event }) => isRetryable((event as { error?: unknown }).error),
    submittedElsewhere: ({ event }) => (event as { output?: AttemptSummary }).output?.status === 'submitted',
  },
  actions: {
    acceptStart: assign(({ context, event }) => {
      const start = (event as unknown as { output: LiveStart }).output
      return {
        start,
        setup: toSimulationSetup(start.scenario),
        decision: chooseStart(start.browser, start.server, context.target.attemptId),
      }
    }),
    noteLoadError: assign(({ event }) => {
      const error = (event as { error?: unknown }).error
      return {
        problem: `The exercise could not be opened: ${errorMessage(error)}`,
        loadRetryable: isRetryable(error),
      }
    }),
    beginFromDecision: assign(({ context }) => {
      const decision = context.decision
      if (decision?.kind === 'resume') {
        return {
          ...begin(context, decision.copy.events, decision.copy.attemptId, decision.copy.source === 'server'),
          notice: decision.notice,
        }
      }
      return { ...begin(context, [], context.newAttemptId(), false), notice: null }
    }),
    beginFromChoice: assign(({ context, event }) => {
      if (event.type !== 'CHOOSE' || context.decision?.kind !== 'ask') return {}
      return fromChoice(context, context.decision.choices[event.choice])
    }),
    startAfresh: assign(({ context }) => ({
      ...begin(context, [], context.newAttemptId(), false),
      notice:
        context.target.mode === 'draft' ? 'The panel is back at the start.' : 'A new attempt has started.',
    })),
    /** After (re)starting from a copy: the browser holds exactly that copy, whatever it held before. */
    replaceLocalCopy: ({ context }) => {
      context.start?.store.clear()
      context.start?.store.append(context.attemptId, context.log)
    },
    forgetLocalCopy: ({ context }) => context.start?.store.clear(),
    continueAsNewAttempt: assign(({ context }) => ({
      ...begin(context, context.log, context.newAttemptId(), false),
      notice: 'Your copy goes on as a new attempt.',
    })),
    beginFromServerCopy: assign(({ context, event }) => {
      const copy = (event as unknown as { output: AttemptCopy }).output
      return {
        ...begin(context, copy.events, copy.attemptId, true),
        notice: `Loaded the newer copy from the server (${copy.events.length} actions).`,
      }
    }),
    advanceClock: assign(({ context, event }) => {
      if (event.type !== 'TICK' || !context.sim) return {}
      return { sim: advance(context.sim, event.t - context.sim.t) }
    }),
    record: enqueueActions(({ context, event, enqueue }) => {
      if ((event.type !== 'RECORD' && event.type !== 'INBOX') || !context.sim) return
      if (event.type === 'INBOX' && inLog(context.log, event.action)) return
      // The inbox's events happen now, on the apprentice's clock, like an action.
      const t = event.type === 'RECORD' ? Math.max(event.t, context.sim.t) : context.sim.t
      const parsed = attemptEventSchema.safeParse({ ...event.action, t })
      if (!parsed.success) {
        enqueue.assign({ actionError: `That action was not recorded: ${parsed.error.issues[0]?.message}` })
        return
      }
      let sim = applyEvent(context.sim, parsed.data)
      const step = menuAfterEvent(context.menu, parsed.data, sim)
      const recorded: AttemptEvent[] = [parsed.data]
      // The keypad's OK in an edit screen also stores and saves the setting, as the display says.
      for (const output of step.output) {
        const extra = attemptEventSchema.parse({ ...output, t })
        sim = applyEvent(sim, extra)
        recorded.push(extra)
      }
      context.log.push(...recorded)
      for (const e of recorded) enqueue.sendTo('grader', { type: 'grading.push', event: e })
      enqueue.sendTo('grader', { type: 'grading.grade', endAt: sim.t })
      enqueue.assign({ sim, menu: step.menu, logLength: context.log.length, actionError: null })
      enqueue(() => context.start?.store.append(context.attemptId, context.log))
    }),
    /** While submitting (no grader running): the inbox's event goes into the model and the log only. */
    appendInbox: assign(({ context, event }) => {
      if (event.type !== 'INBOX' || !context.sim || inLog(context.log, event.action)) return {}
      const parsed = attemptEventSchema.safeParse({ ...event.action, t: context.sim.t })
      if (!parsed.success) return {}
      context.log.push(parsed.data)
      context.start?.store.append(context.attemptId, context.log)
      return { sim: applyEvent(context.sim, parsed.data), logLength: context.log.length }
    }),
    askForGrade: sendTo('grader', ({ context }) => ({ type: 'grading.grade', endAt: context.sim?.t ?? 0 })),
    keepGrade: assign(({ event }) => (event.type === 'grading.result' ? { grade: event.result } : {})),
    keepWarnings: assign(({ context, event }) => {
      if (event.type !== 'grading.violations') return {}
      // One warning per action, however many rules it broke (the grade lists each).
      const warning = {
        id: (context.warnings[0]?.id ?? 0) + 1,
        t: event.violations[0]!.t,
        text: warningText(event.violations),
      }
      return { warnings: [warning, ...context.warnings].slice(0, KEEP_WARNINGS) }
    }),
    markServerSaved: assign(({ event }) => ({
      serverSaved: (event as unknown as { output: AttemptSummary }).output.eventCount,
      serverSaveProblem: null,
    })),
    noteSaveProblem: assign(({ event }) => ({
      serverSaveProblem: `Not saved on the server yet (${errorMessage((event as { error?: unknown }).error)}). It is kept in this browser; saving is tried again in 30 s.`,
    })),
    noteConflict: assign(({ event }) => ({ problem: errorMessage((event as { error?: unknown }).error) })),
    noteTry: assign(({ context, event }) => ({
      tries: context.tries + 1,
      problem: errorMessage((event as { error?: unknown }).error),
    })),
    acceptResult: assign(({ context, event }) => {
      const result = (event as unknown as { output: AttemptSummary }).output
      const ended = submittedLog(context)
      context.log.push(...ended.slice(context.log.length))
      return { result, problem: null, logLength: context.log.length, serverSaved: context.log.length }
    }),
    acceptSubmittedElsewhere: assign(({ event }) => ({
      result: (event as unknown as { output: AttemptSummary }).output,
      notice: 'This attempt was submitted from another computer.',
    })),
    resetTries: assign({ tries: 0, problem: null }),
    /** A draft's run ends: the log is closed and graded here, as the server would grade it. */
    finishRun: assign(({ context }) => {
      const ended = submittedLog(context)
      context.log.push(...ended.slice(context.log.length))
      try {
        const result = grade(context.start!.scenario, context.log, { assistance: context.start!.assistance })
        return { grade: result, logLength: context.log.length, problem: null }
      } catch (error) {
        return {
          logLength: context.log.length,
          problem: `The run could not be graded: ${errorMessage(error)}`,
        }
      }
    }),
  },
}).createMachine({
  id: 'liveAttempt',
  context: ({ input }) => ({
    target: input.target,
    newAttemptId: input.newAttemptId ?? (() => crypto.randomUUID()),
    start: null,
    setup: null,
    decision: null,
    attemptId: '',
    sim: null,
    log: [],
    logLength: 0,
    epoch: 0,
    menu: STATUS_SCREEN,
    serverSaved: 0,
    serverSaveProblem: null,
    grade: null,
    warnings: [],
    actionError: null,
    notice: null,
    problem: null,
    loadRetryable: true,
    tries: 0,
    result: null,
  }),
  initial: 'loading',
  states: {
    loading: {
      invoke: {
        src: 'loadStart',
        input: ({ context }) => ({ target: context.target }),
        onDone: { target: 'deciding', actions: 'acceptStart' },
        onError: { target: 'failed', actions: 'noteLoadError' },
      },
    },
    failed: { on: { RETRY: 'loading' } },
    deciding: {
      always: [
        { guard: 'mustAsk', target: 'choosing' },
        { target: 'live', actions: ['beginFromDecision', 'replaceLocalCopy'] },
      ],
    },
    choosing: { on: { CHOOSE: { target: 'live', actions: ['beginFromChoice', 'replaceLocalCopy'] } } },
    live: {
      type: 'parallel',
      invoke: {
        id: 'grader',
        src: 'liveGrading',
        input: ({ context }) => ({
          scenario: context.start!.scenario,
          events: [...context.log],
          assistance: context.start!.assistance,
        }),
      },
      on: {
        TICK: { guard: 'laterTick', actions: 'advanceClock' },
        RECORD: { actions: 'record' },
        INBOX: { actions: 'record' },
        'grading.result': { actions: 'keepGrade' },
        'grading.violations': { actions: 'keepWarnings' },
      },
      states: {
        dialog: {
          initial: 'closed',
          states: {
            closed: {
              on: {
                SUBMIT: 'confirmingSubmit',
                FINISH: { guard: 'isDraft', target: '#liveAttempt.finished', actions: 'finishRun' },
                START_AGAIN: { guard: 'mayStartAgain', target: 'confirmingRestart' },
              },
            },
            confirmingSubmit: {
              on: { CONFIRM: { target: '#liveAttempt.submitting', actions: 'resetTries' }, CANCEL: 'closed' },
            },
            confirmingRestart: {
              on: {
                CONFIRM: {
                  target: '#liveAttempt.live',
                  reenter: true,
                  actions: ['startAfresh', 'replaceLocalCopy'],
                },
                CANCEL: 'closed',
              },
            },
          },
        },
        autosave: {
          initial: 'waiting',
          states: {
            waiting: {
              after: {
                autosave: [
                  { guard: 'hasUnsavedEvents', target: 'saving' },
                  { target: 'waiting', reenter: true },
                ],
              },
              // Before moving to another computer, say.
              on: { SAVE_NOW: { guard: 'hasUnsavedEvents', target: 'saving' } },
            },
            saving: {
              invoke: {
                src: 'saveProgress',
                input: ({ context }) => requestBody(context, 'inProgress', [...context.log]),
                onDone: [
                  {
                    guard: 'submittedElsewhere',
                    target: '#liveAttempt.submitted',
                    actions: ['acceptSubmittedElsewhere', 'forgetLocalCopy'],
                  },
                  { target: 'waiting', actions: 'markServerSaved' },
                ],
                onError: [
                  { guard: 'diverged', target: '#liveAttempt.conflict', actions: 'noteConflict' },
                  { target: 'waiting', actions: 'noteSaveProblem' },
                ],
              },
            },
          },
        },
        grading: {
          initial: 'ticking',
          states: {
            // Entered again every few seconds: time-based objectives (held for 10 s) tick without an action.
            ticking: { entry: 'askForGrade', after: { regrade: { target: 'ticking', reenter: true } } },
          },
        },
      },
    },
    submitting: {
      initial: 'sending',
      states: {
        sending: {
          invoke: {
            src: 'submitAttempt',
            input: ({ context }) => requestBody(context, 'submitted', submittedLog(context)),
            onDone: { target: '#liveAttempt.submitted', actions: ['acceptResult', 'forgetLocalCopy'] },
            onError: [
              { guard: 'diverged', target: '#liveAttempt.conflict', actions: 'noteConflict' },
              // An instructor's fault the server holds but this log lacks: read the inbox, then send again.
              { guard: 'injectionPending', target: 'readingInbox', actions: 'noteTry' },
              { guard: 'retryable', target: 'waiting', actions: 'noteTry' },
              { target: '#liveAttempt.refused', actions: 'noteTry' },
            ],
          },
        },
        waiting: { after: { retry: 'sending' } },
        readingInbox: {
          on: { INBOX: { actions: 'appendInbox' }, INBOX_READY: 'sending' },
          after: { retry: 'sending' },
        },
      },
    },
    refused: {
      on: {
        RETRY: { target: 'submitting', actions: 'resetTries' },
        BACK: 'live',
      },
    },
    conflict: {
      on: {
        LOAD_SERVER_COPY: 'reloading',
        KEEP_AS_NEW: { target: 'live', actions: ['continueAsNewAttempt', 'replaceLocalCopy'] },
      },
    },
    reloading: {
      invoke: {
        src: 'loadServerCopy',
        input: ({ context }) => ({ attemptId: context.attemptId }),
        onDone: { target: 'live', actions: ['beginFromServerCopy', 'replaceLocalCopy'] },
        onError: { target: 'conflict', actions: 'noteConflict' },
      },
    },
    /** A draft's run, ended and graded on the panel; the page may save its log (reference solution). */
    finished: {
      on: {
        START_AGAIN: { target: 'live', actions: ['startAfresh', 'replaceLocalCopy'] },
      },
    },
    submitted: {
      on: {
        START_AGAIN: { guard: 'mayStartAgain', target: 'live', actions: ['startAfresh', 'replaceLocalCopy'] },
      },
    },
  },
})
