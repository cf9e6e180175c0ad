// Where a live attempt starts: fresh, from the copy saved in this browser, or from the copy saved on the
// server (made on another computer). A copy that simply extends the other is taken without asking; two
// copies that went separate ways, or a server copy this browser has never seen, are offered to the user.
import { isLogPrefix } from '@shared/api/attempts'
import type { AttemptEvent } from '@shared/model/events'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import { formatDateTime } from '@/composables/format'

export interface AttemptCopy {
  source: 'browser' | 'server'
  attemptId: string
  events: AttemptEvent[]
  savedAt: string
  /** A server copy's level, fixed when it started. */
  assistance?: AssistanceLevel
}

export interface StartChoice {
  /** What a button says. */
  label: string
  /** One line about the copy: how many actions, when it was saved. */
  detail: string
  copy: AttemptCopy | null
  /** Continue the copy's events under a new attempt id (its own id went on elsewhere). */
  asNewAttempt: boolean
}

export type StartDecision =
  | { kind: 'fresh' }
  | { kind: 'resume'; copy: AttemptCopy; notice: string }
  | { kind: 'ask'; question: string; choices: StartChoice[] }

const actions = (n: number) => `${n} action${n === 1 ? '' : 's'}`

function describe(copy: AttemptCopy): string {
  const where = copy.source === 'browser' ? 'in this browser' : 'on the server'
  return `${actions(copy.events.length)}, saved ${where} ${formatDateTime(copy.savedAt)}`
}

const START_NEW: StartChoice = {
  label: 'Start a new attempt',
  detail: 'Begin again from the exercise’s starting state.',
  copy: null,
  asNewAttempt: true,
}

/** `asked`: the attempt a "Resume" link named; its server copy is taken without asking again. */
export function chooseStart(
  browser: AttemptCopy | null,
  server: AttemptCopy | null,
  asked?: string,
): StartDecision {
  if (!browser && !server) return { kind: 'fresh' }
  if (!browser && server && server.attemptId === asked) {
    return {
      kind: 'resume',
      copy: server,
      notice: `Resumed the attempt saved on the server (${actions(server.events.length)}).`,
    }
  }
  if (browser && !server) {
    return {
      kind: 'resume',
      copy: browser,
      notice: `Resumed the attempt saved in this browser (${actions(browser.events.length)}).`,
    }
  }
  if (!browser && server) {
    return {
      kind: 'ask',
      question: 'You have an attempt in progress saved on the server. Resume it here?',
      choices: [
        { label: 'Resume it', detail: describe(server), copy: server, asNewAttempt: false },
        START_NEW,
      ],
    }
  }
  const b = browser!
  const s = server!
  if (b.attemptId === s.attemptId) {
    if (isLogPrefix(s.events, b.events)) {
      return {
        kind: 'resume',
        copy: b,
        notice: `Resumed the attempt saved in this browser (${actions(b.events.length)}).`,
      }
    }
    if (isLogPrefix(b.events, s.events)) {
      return {
        kind: 'resume',
        copy: s,
        notice: `Resumed the newer copy saved on the server (${actions(s.events.length)}; it went on from another computer).`,
      }
    }
    return {
      kind: 'ask',
      question:
        'This attempt went on in two places: the copy on the server was continued on another computer, and this browser’s copy differs from it. Which do you want to continue?',
      choices: [
        { label: 'Load the newer copy from the server', detail: describe(s), copy: s, asNewAttempt: false },
        {
          label: 'Keep this browser’s copy as a new attempt',
          detail: describe(b),
          copy: b,
          asNewAttempt: true,
        },
      ],
    }
  }
  return {
    kind: 'ask',
    question: 'There are two attempts in progress for this exercise. Which do you want to continue?',
    choices: [
      { label: 'Continue the one in this browser', detail: describe(b), copy: b, asNewAttempt: false },
      { label: 'Continue the one on the server', detail: describe(s), copy: s, asNewAttempt: false },
      START_NEW,
    ],
  }
}
