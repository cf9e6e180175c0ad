// What the inbox hands the live-attempt machine: an instructor's fault and a message go into the log at the
// apprentice's current time, through the same path as an action (the model changes, the grader hears it),
// each once however often it is delivered; a submission refused for a pending injection waits for the inbox.
import { describe, expect, it } from 'vitest'
import { createActor, fromCallback, fromPromise, waitFor } from 'xstate'
import type { AttemptSummary, SubmitAttemptRequest } from '@shared/api/attempts'
import { scenarioSchema } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import { liveAttemptMachine, type InboxAction, type LiveStart } from '@/simulator/machines/liveAttemptMachine'
import { createAttemptStore } from '@/simulator/storage/attemptStore'
import { MemoryStorage } from '../simulator/memoryStorage'

const scenario = scenarioSchema.parse(scenarioFile)
const instructor = { id: '5c2d3e4f-5a6b-4c7d-8e9f-0a1b2c3d4e5f', name: 'Idris Penhallow' }
const injection: InboxAction = {
  type: 'fault.injected',
  injectionId: '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d',
  fault: { kind: 'blownFuse' },
  by: instructor,
}
const hint: InboxAction = {
  type: 'message.received',
  messageId: '2b3c4d5e-6f7a-4b8c-9d0e-1f2a3b4c5d6e',
  kind: 'hint',
  text: 'Measure before you replace anything.',
  from: instructor,
}

function start(submit: (body: SubmitAttemptRequest) => Promise<AttemptSummary>) {
  const pushed: string[] = []
  const sent: SubmitAttemptRequest[] = []
  const begin: LiveStart = {
    scenario,
    scenarioTitle: scenario.title,
    scenarioVersionId: 'version-1',
    assignment: null,
    assistance: 'standard',
    store: createAttemptStore('slipway.attempt.practice.v1', new MemoryStorage()),
    browser: null,
    server: null,
    problem: null,
  }
  const machine = liveAttemptMachine.provide({
    actors: {
      loadStart: fromPromise(async () => begin),
      saveProgress: fromPromise(() => new Promise<AttemptSummary>(() => {})),
      submitAttempt: fromPromise(async ({ input }: { input: SubmitAttemptRequest }) => {
        sent.push(input)
        return submit(input)
      }),
      liveGrading: fromCallback(({ receive }) => {
        receive((e: { type: string; event?: { type: string } }) => {
          if (e.type === 'grading.push') pushed.push(e.event!.type)
        })
        return () => {}
      }),
    },
    delays: { autosave: 60_000, regrade: 60_000, retry: 60_000 },
  })
  const actor = createActor(machine, { input: { target: { mode: 'practice', scenarioKey: scenario.id } } })
  actor.start()
  return { actor, pushed, sent }
}

describe('the inbox in the live attempt', () => {
  it('appends a fault at the current simulated time, applies it to the model and tells the grader', async () => {
    const { actor, pushed } = start(() => new Promise(() => {}))
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'TICK', t: 4_000 })
    expect(actor.getSnapshot().context.sim!.fuseBlown).toBe(false)
    actor.send({ type: 'INBOX', action: injection })
    actor.send({ type: 'INBOX', action: injection })
    actor.send({ type: 'INBOX', action: hint })
    actor.send({ type: 'INBOX', action: hint })
    const { log, sim } = actor.getSnapshot().context
    expect(log.map((e) => [e.type, e.t])).toEqual([
      ['fault.injected', 4_000],
      ['message.received', 4_000],
    ])
    expect(sim!.fuseBlown).toBe(true)
    expect(pushed).toEqual(['fault.injected', 'message.received'])
  })

  it('reads the inbox and submits again when the server holds an injection the log lacks', async () => {
    let refused = false
    const { actor, sent } = start(async (body) => {
      if (!body.events.some((e) => e.type === 'fault.injected')) {
        refused = true
        throw Object.assign(new Error('An instructor changed the bench'), {
          status: 409,
          code: 'injection_pending',
        })
      }
      return { id: body.id, status: 'submitted', eventCount: body.events.length, grade: null } as never
    })
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'SUBMIT' })
    actor.send({ type: 'CONFIRM' })
    await waitFor(actor, (s) => s.matches({ submitting: 'readingInbox' }))
    expect(refused).toBe(true)
    actor.send({ type: 'INBOX', action: injection })
    actor.send({ type: 'INBOX_READY' })
    await waitFor(actor, (s) => s.matches('submitted'))
    expect(sent).toHaveLength(2)
    expect(sent[1]!.events.map((e) => e.type)).toEqual(['fault.injected', 'attempt.ended'])
  })
})
