// Live grading and live safety warnings: ONE implementation the live-attempt machine is given (its
// `liveGrading` actor): shared/scenario's incremental grader. Each recorded event is pushed as it
// happens; the violations a push returns are the grader's own safety rule, word for word what the
// server's grade will list, so the panel and the grade cannot disagree about what was unsafe.
import { fromCallback } from 'xstate'
import type { AttemptEvent } from '@shared/model/events'
import type { GradeResult, SafetyViolation } from '@shared/api/grading'
import { createLiveGrader, type LiveGrader } from '@shared/scenario/liveGrader'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import type { Scenario } from '@shared/scenario/schema'

export type { LiveGrader }
export type CreateLiveGrader = (
  scenario: Scenario,
  initial?: readonly AttemptEvent[],
  options?: { assistance?: AssistanceLevel },
) => LiveGrader

/** What to do instead, said after every live warning (the safe sequence the grader checks for). */
export const SAFE_SEQUENCE =
  'Isolate, lock out, wait for the DC bus to discharge and prove absence of voltage before touching terminals.'

/**
 * One action's violations as the one warning the panel shows: the grader's words, then the safe sequence.
 * Each violation names the same work at the same moment ("Wire W1 added … at 00:15.2 while …", "… with no
 * lock …"), so that shared opening is said once and the reasons follow it.
 */
export function warningText(violations: readonly SafetyViolation[]): string {
  const texts = violations.map((v) => v.text.replace(/\.$/, ''))
  const opening = sharedOpening(texts)
  const said = opening
    ? `${opening.trimEnd()} ${texts.map((t) => t.slice(opening.length)).join('; ')}`
    : texts.join('. ')
  return `Safety violation: ${said}. ${SAFE_SEQUENCE}`
}

/** The words every text starts with, up to a space (empty for one text, or when they share no word). */
function sharedOpening(texts: readonly string[]): string {
  if (texts.length < 2) return ''
  const first = texts[0]!
  let n = 0
  while (n < first.length && texts.every((t) => t[n] === first[n])) n++
  return first.slice(0, first.lastIndexOf(' ', n - 1) + 1)
}

/** What the machine sends the grading actor, and what the actor sends back. */
export type LiveGradingInput = {
  scenario: Scenario
  events: readonly AttemptEvent[]
  /** The attempt's level: the live grade charges hints as the server's will. */
  assistance?: AssistanceLevel
}
export type ToLiveGrading =
  { type: 'grading.push'; event: AttemptEvent } | { type: 'grading.grade'; endAt: number }
export type FromLiveGrading =
  | { type: 'grading.violations'; violations: SafetyViolation[] }
  | { type: 'grading.result'; result: GradeResult }

/** Grades are asked for after every action and every few seconds; one grade per this many ms at most. */
export const GRADE_COALESCE_MS = 400

export function liveGradingActor(create: CreateLiveGrader = createLiveGrader) {
  return fromCallback<ToLiveGrading, LiveGradingInput, FromLiveGrading>(({ input, sendBack, receive }) => {
    const grader = create(input.scenario, input.events, { assistance: input.assistance })
    let timer: ReturnType<typeof setTimeout> | null = null
    let endAt = 0
    receive((message) => {
      if (message.type === 'grading.push') {
        let violations: SafetyViolation[]
        try {
          violations = grader.push(message.event).violations
        } catch {
          return // an event the grader cannot take (the machine validates first); the server grades on submission
        }
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
