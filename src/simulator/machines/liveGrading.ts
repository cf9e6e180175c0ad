// Live grading and live safety warnings: ONE implementation the live-attempt machine is given (its
// `liveGrading` actor). Today it regrades the whole log with shared/scenario's `grade` and warns with
// the client's wiring rule (scene/safety.ts); `todayLiveGrader` has the shape of shared/scenario's
// `createLiveGrader(scenario, initial?)`, so moving to the incremental grader and the grader's own
// safety rule is one line in `liveGradingActor` below.
import { fromCallback } from 'xstate'
import { advance, applyEvent, createSimulation, readDrive } from '@shared/model'
import type { AttemptEvent } from '@shared/model/events'
import type { SimState } from '@shared/model/types'
import { grade, type GradeResult } from '@shared/scenario/grade'
import type { SafetyViolation } from '@shared/scenario/safety'
import type { Scenario } from '@shared/scenario/schema'
import { toSimulationSetup } from '@shared/scenario/setup'
import { energisedReason, isWiringEvent, violationMessage } from '../scene/safety'

export interface LiveGrader {
  /** Folds one more event in; returns the safety violations that event committed. */
  push(event: AttemptEvent): { violations: SafetyViolation[] }
  /** The grade as if the attempt ended at `endAt` (simulated ms). */
  result(endAt?: number): GradeResult
  readonly eventCount: number
}

export type CreateLiveGrader = (scenario: Scenario, initial?: readonly AttemptEvent[]) => LiveGrader

/** Today's grader behind the live interface: a full `grade` per result, the client's wiring rule per push. */
export const todayLiveGrader: CreateLiveGrader = (scenario, initial = []) => {
  const events: AttemptEvent[] = [...initial]
  let sim: SimState = createSimulation(toSimulationSetup(scenario))
  for (const e of initial) sim = applyEvent(sim, e)
  return {
    push(event) {
      sim = advance(sim, Math.max(0, event.t - sim.t))
      const reason = isWiringEvent(event) ? energisedReason(readDrive(sim)) : null
      sim = applyEvent(sim, event)
      events.push(event)
      return {
        violations: reason
          ? [{ kind: 'workWhileEnergised', t: event.t, text: violationMessage(reason) }]
          : [],
      }
    },
    result: (endAt) => grade(scenario, events, endAt === undefined ? {} : { endAt }),
    get eventCount() {
      return events.length
    },
  }
}

/** What the machine sends the grading actor, and what the actor sends back. */
export type LiveGradingInput = { scenario: Scenario; events: readonly AttemptEvent[] }
export type ToLiveGrading =
  { type: 'grading.push'; event: AttemptEvent } | { type: 'grading.grade'; endAt: number }
export type FromLiveGrading =
  | { type: 'grading.violations'; violations: SafetyViolation[] }
  | { type: 'grading.result'; result: GradeResult }

/** Grades are asked for after every action and every few seconds; one grade per this many ms at most. */
export const GRADE_COALESCE_MS = 400

export function liveGradingActor(create: CreateLiveGrader = todayLiveGrader) {
  return fromCallback<ToLiveGrading, LiveGradingInput, FromLiveGrading>(({ input, sendBack, receive }) => {
    const grader = create(input.scenario, input.events)
    let timer: ReturnType<typeof setTimeout> | null = null
    let endAt = 0
    receive((message) => {
      if (message.type === 'grading.push') {
        const { violations } = grader.push(message.event)
        if (violations.length) sendBack({ type: 'grading.violations', violations })
        return
      }
      endAt = Math.max(endAt, message.endAt)
      timer ??= setTimeout(() => {
        timer = null
        try {
          sendBack({ type: 'grading.result', result: grader.result(endAt) })
        } catch {
          // Live ticks are a convenience; the server grades authoritatively on submission.
        }
      }, GRADE_COALESCE_MS)
    })
    return () => {
      if (timer) clearTimeout(timer)
    }
  })
}
