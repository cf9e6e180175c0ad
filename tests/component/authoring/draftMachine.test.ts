// The live-attempt machine in draft mode (#17) with the draft's own actors: it never saves or submits an
// attempt however long the run goes on, keeps nothing in the browser, and FINISH grades the closed log
// on the page (then Start again goes back to the draft's start).
import { describe, expect, it, vi } from 'vitest'
import { createActor, fromPromise, waitFor } from 'xstate'
import type { AttemptSummary, SubmitAttemptRequest } from '@shared/api/attempts'
import { grade } from '@shared/scenario/grade'
import { scenarioSchema } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import { draftRunActors, draftRunTarget } from '@/simulator/authoring/draftActors'
import { liveAttemptMachine } from '@/simulator/machines/liveAttemptMachine'

const scenario = scenarioSchema.parse(scenarioFile)

function startDraftRun(purpose: 'try' | 'setup') {
  const sent = vi.fn(async (_: SubmitAttemptRequest): Promise<AttemptSummary> => {
    throw new Error('must not be called')
  })
  const actors = draftRunActors({ scenario, title: scenario.title, purpose, assistance: 'standard' })
  const machine = liveAttemptMachine.provide({
    actors: {
      ...actors,
      saveProgress: fromPromise(({ input }: { input: SubmitAttemptRequest }) => sent(input)),
      submitAttempt: fromPromise(({ input }: { input: SubmitAttemptRequest }) => sent(input)),
    },
    delays: { autosave: 5, regrade: 60_000, retry: 1 },
  })
  const actor = createActor(machine, { input: { target: draftRunTarget(scenario.id, purpose, 'standard') } })
  return { actor: actor.start(), sent }
}

describe('a draft run in the live-attempt machine', () => {
  it('never saves an attempt, however many autosave periods pass', async () => {
    const { actor, sent } = startDraftRun('try')
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'lock.applied' }, t: 100 })
    await new Promise((r) => setTimeout(r, 60))
    actor.send({ type: 'SAVE_NOW' })
    await new Promise((r) => setTimeout(r, 20))
    expect(actor.getSnapshot().context.logLength).toBe(1)
    expect(sent).not.toHaveBeenCalled()
    expect(actor.getSnapshot().context.serverSaveProblem).toBeNull()
  })

  it('FINISH closes the log and grades it as the server would; Start again returns to the start', async () => {
    const { actor, sent } = startDraftRun('try')
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'RECORD', action: { type: 'lock.applied' }, t: 100 })
    actor.send({ type: 'FINISH' })
    const finished = actor.getSnapshot()
    expect(finished.matches('finished')).toBe(true)
    expect(finished.context.log.map((e) => e.type)).toEqual(['lock.applied', 'attempt.ended'])
    expect(finished.context.grade).toEqual(grade(scenario, finished.context.log, { assistance: 'standard' }))
    actor.send({ type: 'START_AGAIN' })
    expect(actor.getSnapshot().matches('live')).toBe(true)
    expect(actor.getSnapshot().context.logLength).toBe(0)
    expect(sent).not.toHaveBeenCalled()
  })

  it('FINISH is ignored outside a draft (an apprentice submits instead)', async () => {
    const machine = liveAttemptMachine.provide({
      actors: draftRunActors({ scenario, title: scenario.title, purpose: 'try', assistance: 'standard' }),
    })
    const actor = createActor(machine, { input: { target: { mode: 'practice', scenarioKey: scenario.id } } })
    actor.start()
    await waitFor(actor, (s) => s.matches('live'))
    actor.send({ type: 'FINISH' })
    expect(actor.getSnapshot().matches('live')).toBe(true)
    actor.stop()
  })

  it('setting up is not graded, where trying the same draft is', async () => {
    const after = async (purpose: 'try' | 'setup') => {
      const { actor } = startDraftRun(purpose)
      await waitFor(actor, (s) => s.matches('live'))
      actor.send({ type: 'RECORD', action: { type: 'lock.applied' }, t: 100 })
      // The live grader answers once per GRADE_COALESCE_MS (400 ms); a loaded machine may take longer,
      // so trying waits for its grade (up to 10 s) and setting up is looked at well after the first answer.
      if (purpose === 'try') await waitFor(actor, (s) => s.context.grade !== null, { timeout: 10_000 })
      else await new Promise((r) => setTimeout(r, 1000))
      const { grade: live, warnings } = actor.getSnapshot().context
      actor.stop()
      return { live, warnings }
    }
    expect((await after('try')).live).not.toBeNull()
    expect(await after('setup')).toEqual({ live: null, warnings: [] })
  })
})
