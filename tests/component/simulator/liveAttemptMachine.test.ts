// The live-attempt machine with its effects swapped out (machine.provide): where an attempt starts,
// what an action records, where it is saved, where live grading and safety warnings come from, and
// submission with its confirmation, retries and refusals; two computers on one attempt.
import { describe, expect, it } from 'vitest'
import { createActor, fromCallback, fromPromise, waitFor } from 'xstate'
import type { AttemptSummary, SubmitAttemptRequest } from '@shared/api/attempts'
import type { AttemptEvent } from '@shared/model/events'
import { grade } from '@shared/scenario/grade'
import { scenarioSchema, type Scenario } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import alarmScenarioFile from '../../../scenarios/configuration-conflict-alarm.json'
import reference from '../../fixtures/attempts/raise-lower-commissioning--reference.json'
import rewiredLive from '../../fixtures/attempts/configuration-conflict-alarm--mistake-rewired-live.json'
import type { AttemptCopy } from '@/simulator/machines/attemptStart'
import type { PanelAction } from '@/simulator/scene/intentActions'
import {
  GRADE_COALESCE_MS,
  liveGradingActor,
  SAFE_SEQUENCE,
  warningText,
} from '@/simulator/machines/liveGrading'
import { liveAttemptMachine, type LiveStart, type LiveTarget } from '@/simulator/machines/liveAttemptMachine'
import { isRetryable, retryDelayMs } from '@/simulator/machines/retry'
import { createAttemptStore } from '@/simulator/storage/attemptStore'
import { MemoryStorage } from './memoryStorage'

const scenario = scenarioSchema.parse(scenarioFile)
const practice: LiveTarget = { mode: 'practice', scenarioKey: scenario.id }

const quietGrading = fromCallback(() => () => {}) as unknown as ReturnType<typeof liveGradingActor>

interface Setup {
  browser?: AttemptCopy | null
  server?: AttemptCopy | null
  target?: LiveTarget
  save?: (body: SubmitAttemptRequest) => Promise<AttemptSummary>
  submit?: (body: SubmitAttemptRequest) => Promise<AttemptSummary>
  serverCopy?: AttemptCopy
  grading?: ReturnType<typeof liveGradingActor>
  autosave?: number
  scenario?: Scenario
}

function start(options: Setup = {}) {
  const storage = new MemoryStorage()
  const store = createAttemptStore('slipway.attempt.practice.v1', storage)
  let ids = 0
  const sent: SubmitAttemptRequest[] = []
  const begin: LiveStart = {
    scenario: options.scenario ?? scenario,
    scenarioTitle: (options.scenario ?? scenario).title,
    scenarioVersionId: 'version-1',
    assignment: null,
    assistance: 'standard',
    store,
    browser: options.browser ?? null,
    server: options.server ?? null,
    problem: null,
  }
  const never = () => new Promise<AttemptSummary>(() => {})
  const machine = liveAttemptMachine.provide({
    actors: {
      loadStart: fromPromise(async () => begin),
      loadServerCopy: fromPromise(async () => options.serverCopy!),
      saveProgress: fromPromise(async ({ input }: { input: SubmitAttemptRequest }) => {
        sent.push(input)
        return (options.save ?? never)(input)
      }),
      submitAttempt: fromPromise(async ({ input }: { input: SubmitAttemptRequest }) => {
        sent.push(input)
        return (options.submit ?? never)(input)
      }),
      liveGrading: options.grading ?? quietGrading,
    },
    delays: { autosave: options.autosave ?? 20, regrade: 60_000, retry: 1 },
  })
  const actor = createActor(machine, {
    input: { target: options.target ?? practice, newAttemptId: () => `new-${++ids}` },
  }).start()
  return { actor, store, storage, sent }
}

const copy = (source: 'browser' | 'server', attemptId: string, events: AttemptEvent[]): AttemptCopy => ({
  source,
  attemptId,
  events,
  savedAt: '2026-12-01T10:00:00.000Z',
})
const summary = (over: Partial<AttemptSummary> = {}) =>
  ({ id: 'x', status: 'inProgress', eventCount: 0, grade: null, ...over }) as AttemptSummary
const failure = (status: number, code = 'x') => Object.assign(new Error(`failed ${status}`), { status, code })
// The scenario starts under the supervisor's lock: asking them to remove it lets the supply on.
const unlock: AttemptEvent = { t: 100, type: 'supervisorLock.removed' }
const powerOn: AttemptEvent = { t: 200, type: 'power.on' }

describe('where a live attempt starts', () => {
  it('offers to try again only when opening failed for a reason that can pass', async () => {
    const opened = (error: unknown) =>
      createActor(
        liveAttemptMachine.provide({ actors: { loadStart: fromPromise(async () => Promise.reject(error)) } }),
        {
          input: { target: practice },
        },
      ).start()
    const refused = opened(failure(403, 'practice_closed'))
    await waitFor(refused, (s) => s.matches('failed'))
    expect(refused.getSnapshot().context.loadRetryable).toBe(false)
    const offline = opened(failure(503))
    await waitFor(offline, (s) => s.matches('failed'))
    expect(offline.getSnapshot().context.loadRetryable).toBe(true)
    expect(offline.getSnapshot().context.problem).toMatch(/could not be opened/)
  })

  it('starts a fresh attempt with a new id when nothing is saved', async () => {
    const { actor } = start()
    await waitFor(actor, (s) => s.matches('live'))
    expect(actor.getSnapshot().context.attemptId).toBe('new-1')
    expect(actor.getSnapshot().context.log).toEqual([])
  })

  it('resumes this browser’s copy, and the server’s when it went further from another computer', async () => {
    const here = start({ browser: copy('browser', 'a', [unlock]) })
    await waitFor(here.actor, (s) => s.matches('live'))
    expect(here.actor.getSnapshot().context.log).toEqual([unlock])
    expect(here.actor.getSnapshot().context.notice).toMatch(/saved in this browser \(1 action\)/)

    const further = start({
      browser: copy('browser', 'a', [unlock]),
      server: copy('server', 'a', [unlock, powerOn]),
    })
    await waitFor(further.actor, (s) => s.matches('live'))
    const ctx = further.actor.getSnapshot().context
    expect(ctx.log).toEqual([unlock, powerOn])
    expect(ctx.serverSaved).toBe(2)
    expect(further.store.load().copy?.events).toEqual([unlock, powerOn])
  })

  it('offers the server’s copy on a computer that has none, and starts it here when chosen', async () => {
    const { actor } = start({ server: copy('server', 's', [unlock]) })
    await waitFor(actor, (s) => s.matches('choosing'))
    actor.send({ type: 'CHOOSE', choice: 0 })
    expect(actor.getSnapshot().matches('live')).toBe(true)
    expect(actor.getSnapshot().context.attemptId).toBe('s')
  })

  it('asks when the two copies went separate ways, and can keep this browser’s as a new attempt', async () => {
    const { actor } = start({
      browser: copy('browser', 'a', [unlock, { t: 150, type: 'lock.applied' }]),
      server: copy('server', 'a', [unlock, powerOn]),
    })
    await waitFor(actor, (s) => s.matches('choosing'))
    const decision = actor.getSnapshot().context.decision
    expect(decision?.kind === 'ask' && decision.choices.map((c) => c.label)).toEqual([
      'Load the newer copy from the server',
      'Keep this browser’s copy as a new attempt',
    ])
    actor.send({ type: 'CHOOSE', choice: 1 })
    expect(actor.getSnapshot().context.attemptId).toBe('new-1')
    expect(actor.getSnapshot().context.log).toHaveLength(2)
  })
})

describe('recording an action', () => {
  it('applies it to the model, appends it to the log and saves it in the browser at once', async () => {
    const { actor, store } = start()
    await waitFor(actor, (s) => s.matches('live'))
    const log = actor.getSnapshot().context.log
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 500 })
    const ctx = actor.getSnapshot().context
    expect(ctx.sim?.power.supervisorLock).toBeUndefined()
    expect(ctx.log).toBe(log) // appended in place, not copied
    expect(ctx.logLength).toBe(1)
    expect(store.load().copy?.events).toEqual([{ t: 500, type: 'supervisorLock.removed' }])
  })

  it('never records an action earlier than the model’s time', async () => {
    const { actor } = start()
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'TICK', t: 3000 })
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 1000 })
    expect(actor.getSnapshot().context.log[0].t).toBe(3000)
  })

  it('moves the keypad menu, and OK in an edit screen also records the setting and saves it', async () => {
    const { actor } = start()
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 100 })
    actor.send({ type: 'RECORD', action: { type: 'power.on' }, t: 200 })
    actor.send({ type: 'TICK', t: 10_000 })
    for (const key of ['enter', 'enter', 'enter', 'down', 'enter'] as const) {
      actor.send({ type: 'RECORD', action: { type: 'keypad.key', key }, t: 10_000 })
    }
    const ctx = actor.getSnapshot().context
    expect(ctx.menu).toEqual({ screen: 'settings', group: 0, item: 0 })
    expect(ctx.log.slice(-2).map((e) => e.type)).toEqual(['setting.changed', 'settings.saved'])
  })
})

describe('live grading and live safety warnings', () => {
  it('come from the one grading actor the machine is given', async () => {
    const pushed: AttemptEvent[] = []
    const grading = fromCallback(({ sendBack, receive }) => {
      receive((m: { type: string; event?: AttemptEvent }) => {
        if (m.type !== 'grading.push') return
        pushed.push(m.event!)
        sendBack({
          type: 'grading.violations',
          violations: [{ kind: 'workWhileEnergised', t: 1, text: 'From the grader' }],
        })
      })
    }) as unknown as ReturnType<typeof liveGradingActor>
    const { actor } = start({ grading })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 100 })
    expect(pushed).toEqual([{ t: 100, type: 'supervisorLock.removed' }])
    expect(actor.getSnapshot().context.warnings.map((w) => w.text)).toEqual([
      `Safety violation: From the grader. ${SAFE_SEQUENCE}`,
    ])
  })

  /** Records a log through the machine as the panel would, one action at a time, with the shared grader. */
  async function recordThrough(events: readonly AttemptEvent[], on: Scenario = scenario) {
    const { actor } = start({ grading: liveGradingActor(), scenario: on })
    await waitFor(actor, (s) => s.matches('live'))
    const warned: { t: number; text: string }[] = []
    for (const { t, ...action } of events) {
      const before = actor.getSnapshot().context.warnings[0]?.id
      actor.send({ type: 'RECORD', action: action as PanelAction, t })
      const newest = actor.getSnapshot().context.warnings[0]
      if (newest && newest.id !== before) warned.push({ t: newest.t, text: newest.text })
    }
    return { actor, warned }
  }

  it("says one action's violations once: the work, then each rule it broke, then the safe sequence", () => {
    const at = 'Wire W1 added from +24 to Infeed run / stop terminal 13 at 00:15.2'
    const violations = [
      { kind: 'workWhileEnergised', t: 15_200, text: `${at} while the supply disconnect was on.` },
      { kind: 'workWithoutLock', t: 15_200, text: `${at} with no lock on the disconnect.` },
    ] as const
    expect(warningText(violations)).toBe(
      `Safety violation: ${at} while the supply disconnect was on; with no lock on the disconnect. ${SAFE_SEQUENCE}`,
    )
    expect(warningText([violations[1]])).toBe(`Safety violation: ${violations[1].text} ${SAFE_SEQUENCE}`)
  })

  it('the shared grader: a correct attempt gets no warning, and the live ticks equal the grade', async () => {
    const events = reference.events as AttemptEvent[]
    const { actor, warned } = await recordThrough(events)
    expect(warned).toEqual([])
    const { log, sim } = actor.getSnapshot().context
    expect(log).toEqual(events)
    // The last grade asked for (coalesced) is the batch grade of the same log at the same moment.
    await waitFor(actor, (s) => s.context.grade !== null, { timeout: GRADE_COALESCE_MS * 10 })
    expect(actor.getSnapshot().context.grade).toEqual(grade(scenario, log, { endAt: sim!.t }))
    expect(actor.getSnapshot().context.grade!.passed).toBe(true)
  })

  it('the shared grader: rewiring live warns at that action, in the words the grade lists', async () => {
    const alarmScenario = scenarioSchema.parse(alarmScenarioFile)
    const events = rewiredLive.events as AttemptEvent[]
    const { warned } = await recordThrough(events, alarmScenario)
    const graded = grade(alarmScenario, events).safetyViolations
    expect(graded.length).toBeGreaterThan(0)
    // One warning per action that broke the rule, holding every violation the grade lists for it.
    const times = [...new Set(graded.map((v) => v.t))]
    expect(warned).toEqual(times.map((t) => ({ t, text: warningText(graded.filter((v) => v.t === t)) })))
    expect(warned.some((w) => /while the supply disconnect was on/.test(w.text))).toBe(true)
  })

  it('the shared grader: every kind of terminal work on an energised drive warns at once', async () => {
    // Supply on and no lock: each piece of terminal work the grader counts must warn as it is done.
    const works: PanelAction[] = [
      { type: 'wire.added', id: 'w1', from: 'drive.p24', to: 'runSwitch.a', colour: 'blue' },
      { type: 'wire.removed', id: 'w1' },
      { type: 'device.contactFitted', device: 'runSwitch', contact: 'NO' },
      { type: 'fuse.replaced' },
      { type: 'motor.conductorLanded', conductor: 'u', terminal: null },
      { type: 'motor.cableReplaced' },
    ]
    const events: AttemptEvent[] = [unlock, powerOn]
    works.forEach((work, i) => events.push({ ...work, t: 1000 * (i + 1) } as AttemptEvent))
    const { warned } = await recordThrough(events)
    expect(warned.map((w) => w.t)).toEqual(works.map((_, i) => 1000 * (i + 1)))
    for (const w of warned) {
      // The work is named once, then each rule it broke.
      expect(w.text).toMatch(
        /^Safety violation: [^;]+ at [\d:.]+ while the supply disconnect was on; with no lock on the disconnect; before absence of voltage was proved/,
      )
      expect(w.text.endsWith(SAFE_SEQUENCE)).toBe(true)
    }
  })
})

describe('submitting', () => {
  it('asks first; cancelling keeps working', async () => {
    const { actor, sent } = start()
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'SUBMIT' })
    expect(actor.getSnapshot().matches({ live: { dialog: 'confirmingSubmit' } })).toBe(true)
    actor.send({ type: 'CANCEL' })
    expect(actor.getSnapshot().matches({ live: { dialog: 'closed' } })).toBe(true)
    expect(sent).toEqual([])
  })

  it('retries failures with the same attempt id until acknowledged, then closes the log and clears the browser copy', async () => {
    const failures = [failure(0), failure(503)]
    const { actor, sent, store } = start({
      submit: async (b) => {
        const f = failures.shift()
        if (f) throw f
        return summary({ id: b.id, status: 'submitted', eventCount: b.events.length })
      },
    })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 100 })
    actor.send({ type: 'SUBMIT' })
    actor.send({ type: 'CONFIRM' })
    await waitFor(actor, (s) => s.matches('submitted'))
    expect(sent.map((b) => [b.id, b.status])).toEqual([
      ['new-1', 'submitted'],
      ['new-1', 'submitted'],
      ['new-1', 'submitted'],
    ])
    expect(sent[2].events.at(-1)?.type).toBe('attempt.ended')
    expect(actor.getSnapshot().context.log.at(-1)?.type).toBe('attempt.ended')
    expect(store.load().copy).toBeNull()
  })

  it('stops at a client mistake, says why, and lets the apprentice go back to the panel', async () => {
    const { actor, sent } = start({
      submit: async () => Promise.reject(failure(409, 'attempt_limit_reached')),
    })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'SUBMIT' })
    actor.send({ type: 'CONFIRM' })
    await waitFor(actor, (s) => s.matches('refused'))
    expect(sent).toHaveLength(1)
    expect(actor.getSnapshot().context.problem).toMatch(/failed 409/)
    actor.send({ type: 'BACK' })
    expect(actor.getSnapshot().matches('live')).toBe(true)
    // Nothing was submitted, so the log is not closed.
    expect(actor.getSnapshot().context.log.some((e) => e.type === 'attempt.ended')).toBe(false)
  })

  it('treats timeouts and rate limits as worth retrying, with growing waits', () => {
    expect(isRetryable({ status: 408 })).toBe(true)
    expect(isRetryable({ status: 429 })).toBe(true)
    expect(isRetryable({ status: 422 })).toBe(false)
    expect([1, 2, 3, 10].map(retryDelayMs)).toEqual([1000, 2000, 4000, 30_000])
  })
})

describe('saving on the server, and two computers on one attempt', () => {
  it('saves new actions now and then, and not when nothing changed', async () => {
    const { actor, sent } = start({ save: async (b) => summary({ id: b.id, eventCount: b.events.length }) })
    await waitFor(actor, (s) => s.matches('live'))
    await new Promise((r) => setTimeout(r, 60))
    expect(sent).toEqual([])
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 100 })
    await waitFor(actor, (s) => s.context.serverSaved === 1)
    expect(sent[0]).toMatchObject({ id: 'new-1', status: 'inProgress', scenarioId: 'version-1' })
  })

  it('saves at once when asked (before moving to another computer)', async () => {
    const { actor, sent } = start({
      save: async (b) => summary({ id: b.id, eventCount: b.events.length }),
      autosave: 60_000,
    })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'SAVE_NOW' })
    expect(sent).toEqual([]) // nothing new to save
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 100 })
    actor.send({ type: 'SAVE_NOW' })
    expect(sent).toHaveLength(1)
  })

  it('offers the newer copy when the server holds actions this copy lacks, and loads it', async () => {
    const { actor, store } = start({
      save: async () => Promise.reject(failure(409, 'attempt_diverged')),
      serverCopy: copy('server', 'new-1', [unlock, powerOn]),
    })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 300 })
    actor.send({ type: 'RECORD', action: { type: 'lock.applied' }, t: 400 })
    await waitFor(actor, (s) => s.matches('conflict'))
    actor.send({ type: 'LOAD_SERVER_COPY' })
    await waitFor(actor, (s) => s.matches('live'))
    expect(actor.getSnapshot().context.log).toEqual([unlock, powerOn])
    expect(actor.getSnapshot().context.serverSaved).toBe(2)
    // The browser now keeps the newer copy, not a mix of both.
    expect(store.load().copy?.events).toEqual([unlock, powerOn])
  })

  it('or keeps this copy as a new attempt', async () => {
    const { actor } = start({ save: async () => Promise.reject(failure(409, 'attempt_diverged')) })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 300 })
    await waitFor(actor, (s) => s.matches('conflict'))
    actor.send({ type: 'KEEP_AS_NEW' })
    expect(actor.getSnapshot().context.attemptId).toBe('new-2')
    expect(actor.getSnapshot().context.logLength).toBe(1)
  })

  it('notices an attempt submitted from another computer', async () => {
    const { actor } = start({ save: async (b) => summary({ id: b.id, status: 'submitted', eventCount: 3 }) })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 300 })
    await waitFor(actor, (s) => s.matches('submitted'))
    expect(actor.getSnapshot().context.notice).toMatch(/submitted from another computer/)
  })
})

describe('starting again', () => {
  it('asks, then begins a new practice attempt from the starting state', async () => {
    const { actor, store } = start()
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'supervisorLock.removed' }, t: 100 })
    actor.send({ type: 'START_AGAIN' })
    expect(actor.getSnapshot().matches({ live: { dialog: 'confirmingRestart' } })).toBe(true)
    actor.send({ type: 'CONFIRM' })
    const ctx = actor.getSnapshot().context
    expect(ctx.attemptId).toBe('new-2')
    expect(ctx.log).toEqual([])
    expect(ctx.sim?.power.supervisorLock).toEqual({ name: 'Rena Dubrovny' })
    expect(store.load().copy).toMatchObject({ attemptId: 'new-2', events: [] })
  })

  it('is not offered on an assignment', async () => {
    const { actor } = start({
      target: { mode: 'assignment', scenarioKey: scenario.id, assignmentId: 'as-1' },
    })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'START_AGAIN' })
    expect(actor.getSnapshot().matches({ live: { dialog: 'closed' } })).toBe(true)
  })
})
