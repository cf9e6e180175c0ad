// The durable job queue on the test database (SQLite here, PostgreSQL in `npm run test:pg`): jobs commit with
// their transaction, are claimed once, retried with a doubling delay, failed when out of attempts, and taken
// over when the instance holding them stops renewing its lease.
import { pino } from 'pino'
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest'
import { z } from 'zod'
import { JobEntity, type JobRow } from '../../server/entities'
import {
  createJobWorker,
  defineJobKind,
  JobError,
  readJobQueueFigures,
  retryDelayMs,
  type JobWorker,
  type JobWorkerOptions,
} from '../../server/infrastructure/jobs'
import { claimJobs, completeJob } from '../../server/infrastructure/jobs/job-store'
import { createTestApi, type TestApi } from '../support/api-harness'

const log = pino({ level: 'silent' })
const SECOND = 1000

/** A clock the test moves by hand. */
function manualClock(start = new Date()) {
  let now = start.getTime()
  return {
    now: () => new Date(now),
    advance: (ms: number) => void (now += ms),
    set: (at: Date) => void (now = at.getTime()),
  }
}

let counter = 0
/** A kind of its own per test, so workers of earlier tests never see these jobs. */
function testKind(retry = { maxAttempts: 4, firstDelayMs: 10 * SECOND, maxDelayMs: 60 * SECOND }) {
  counter++
  return defineJobKind({
    kind: `test.${counter}`,
    payload: z.object({ n: z.number().int() }),
    retry,
    timeoutMs: 2 * SECOND,
    label: ({ n }) => `item ${n}`,
  })
}

describe('job queue', () => {
  let api: TestApi
  const workers: JobWorker[] = []
  const worker = (options: Partial<JobWorkerOptions> = {}) => {
    const made = createJobWorker({ dataSource: api.dataSource, log, pollMs: 0, random: () => 0, ...options })
    workers.push(made)
    return made
  }
  const jobsOf = (kind: string) =>
    api.dataSource.getRepository(JobEntity).find({ where: { kind }, order: { createdAt: 'ASC' } })
  const jobById = (id: string) => api.dataSource.getRepository(JobEntity).findOneByOrFail({ id })

  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterEach(async () => {
    await Promise.all(workers.splice(0).map((w) => w.stop(100)))
  })
  afterAll(() => api.close())

  it('runs a job enqueued in a transaction that committed, and nothing of one that rolled back', async () => {
    const kind = testKind()
    await api.dataSource.transaction((m) => kind.enqueue(m, { n: 1 }))
    await expect(
      api.dataSource.transaction(async (m) => {
        await kind.enqueue(m, { n: 2 })
        throw new Error('the change failed')
      }),
    ).rejects.toThrow('the change failed')
    const ran: number[] = []
    const w = worker()
    w.handle(kind, async ({ n }) => void ran.push(n))
    expect(await w.runDue()).toBe(1)
    expect(ran).toEqual([1])
    const [job] = await jobsOf(kind.kind)
    expect(job).toMatchObject({ status: 'done', attempts: 1, lockedBy: null, label: 'item 1' })
  })

  it('refuses a payload its kind does not accept, when it is enqueued', async () => {
    const kind = testKind()
    await expect(kind.enqueue(api.dataSource.manager, { n: 1.5 })).rejects.toThrow()
    expect(await jobsOf(kind.kind)).toEqual([])
  })

  it('does not run a job before its run time', async () => {
    const kind = testKind()
    const clock = manualClock()
    await kind.enqueue(
      api.dataSource.manager,
      { n: 1 },
      { runAt: new Date(clock.now().getTime() + 60 * SECOND) },
    )
    const ran: number[] = []
    const w = worker({ clock: clock.now })
    w.handle(kind, async ({ n }) => void ran.push(n))
    expect(await w.runDue()).toBe(0)
    clock.advance(61 * SECOND)
    expect(await w.runDue()).toBe(1)
    expect(ran).toEqual([1])
  })

  it('gives each job to one worker when several claim at the same moment', async () => {
    const kind = testKind()
    await api.dataSource.transaction(async (m) => {
      for (let n = 0; n < 40; n++) await kind.enqueue(m, { n })
    })
    const runs = new Map<number, string[]>()
    const pool = Array.from({ length: 3 }, (_, i) => {
      const w = worker({ concurrency: 5, id: `worker-${i}` })
      w.handle(kind, async ({ n }) => {
        await new Promise((r) => setTimeout(r, 2))
        runs.set(n, [...(runs.get(n) ?? []), w.id])
      })
      return w
    })
    const counts = await Promise.all(pool.map((w) => w.runDue()))
    expect(counts.reduce((a, b) => a + b, 0)).toBe(40)
    expect([...runs.keys()].sort((a, b) => a - b)).toEqual(Array.from({ length: 40 }, (_, n) => n))
    expect([...runs.values()].every((who) => who.length === 1)).toBe(true)
  })

  it('adds one job per dedupe key, however often it is enqueued', async () => {
    const kind = testKind()
    const first = await kind.enqueue(api.dataSource.manager, { n: 1 }, { dedupeKey: `once-${kind.kind}` })
    const again = await api.dataSource.transaction((m) =>
      kind.enqueue(m, { n: 2 }, { dedupeKey: `once-${kind.kind}` }),
    )
    expect(first.created).toBe(true)
    expect(again).toEqual({ id: first.id, created: false })
    expect((await jobsOf(kind.kind)).map((j) => j.payload)).toEqual([JSON.stringify({ n: 1 })])
  })

  it('retries a failed attempt after a delay that doubles each time, then marks the job failed', async () => {
    const kind = testKind({ maxAttempts: 4, firstDelayMs: 10 * SECOND, maxDelayMs: 25 * SECOND })
    const { id } = await kind.enqueue(api.dataSource.manager, { n: 1 })
    const clock = manualClock()
    let calls = 0
    const w = worker({ clock: clock.now, random: () => 0 })
    w.handle(kind, async () => {
      calls++
      throw new JobError('The far end said no')
    })
    // Waits after attempts 1, 2, 3: 10 s, 20 s, then 40 s capped at 25 s.
    for (const wait of [10, 20, 25]) {
      expect(await w.runDue()).toBe(1)
      const job = await jobById(id)
      expect(job).toMatchObject({ status: 'queued', lastError: 'The far end said no' })
      expect(Date.parse(job.runAt) - clock.now().getTime()).toBe(wait * SECOND)
      clock.advance(wait * SECOND - 1)
      expect(await w.runDue()).toBe(0) // not a millisecond early
      clock.advance(1)
    }
    expect(await w.runDue()).toBe(1)
    expect(calls).toBe(4)
    expect(await jobById(id)).toMatchObject({
      status: 'failed',
      attempts: 4,
      lastError: 'The far end said no',
    })
    expect(w.counts()[kind.kind]).toEqual({ succeeded: 0, retried: 3, failed: 1 })
  })

  it('spreads retries up to a fifth earlier at random, so jobs that failed together do not retry together', () => {
    const policy = { maxAttempts: 5, firstDelayMs: 1000, maxDelayMs: 60_000 }
    expect(retryDelayMs(policy, 1, () => 0)).toBe(1000)
    expect(retryDelayMs(policy, 3, () => 0)).toBe(4000)
    expect(retryDelayMs(policy, 3, () => 1)).toBe(3200)
    expect(retryDelayMs(policy, 20, () => 0)).toBe(60_000)
  })

  it('fails at once on an error marked permanent', async () => {
    const kind = testKind()
    const { id } = await kind.enqueue(api.dataSource.manager, { n: 1 })
    const w = worker()
    w.handle(kind, async () => {
      throw new JobError('The address does not exist', { permanent: true })
    })
    await w.runDue()
    expect(await jobById(id)).toMatchObject({
      status: 'failed',
      attempts: 1,
      lastError: 'The address does not exist',
    })
  })

  it('records an unexpected error in words, keeping the exception for the log', async () => {
    const kind = testKind()
    const { id } = await kind.enqueue(api.dataSource.manager, { n: 1 })
    const w = worker()
    w.handle(kind, async () => {
      throw new TypeError("Cannot read properties of undefined (reading 'x')")
    })
    await w.runDue()
    const job = await jobById(id)
    expect(job.status).toBe('queued')
    expect(job.lastError).toBe('An unexpected error stopped it; the server log has the details')
  })

  it('fails an attempt that runs past the kind’s time limit', async () => {
    const kind = defineJobKind({ kind: `test.slow.${++counter}`, payload: z.object({}), timeoutMs: 50 })
    const { id } = await kind.enqueue(api.dataSource.manager, {})
    let aborted = false
    const w = worker()
    w.handle(
      kind,
      (_, job) =>
        new Promise<void>((resolve) =>
          job.signal.addEventListener('abort', () => {
            aborted = true
            resolve()
          }),
        ),
    )
    await w.runDue()
    expect(aborted).toBe(true)
    expect(await jobById(id)).toMatchObject({
      status: 'queued',
      lastError: 'It did not finish within 1 minute(s)',
    })
  })

  it('fails a stored job whose payload its kind no longer accepts, in words', async () => {
    const kind = testKind()
    const { id } = await kind.enqueue(api.dataSource.manager, { n: 1 })
    await api.dataSource.getRepository(JobEntity).update({ id }, { payload: '{"n":"one"}' })
    const w = worker()
    w.handle(kind, async () => {})
    await w.runDue()
    expect(await jobById(id)).toMatchObject({
      status: 'failed',
      lastError: 'Its stored details no longer match what this version of Slipway expects',
    })
  })

  describe('an instance that stops mid-job', () => {
    async function claimAndAbandon(kind: { kind: string }, now: Date, leaseMs: number): Promise<JobRow> {
      const [job] = await claimJobs(api.dataSource, {
        kinds: [kind.kind],
        workerId: 'crashed-instance',
        leaseMs,
        limit: 1,
        now,
      })
      return job!
    }

    it('leaves the job alone while its lease holds, then another instance takes it over', async () => {
      const kind = testKind()
      const { id } = await kind.enqueue(api.dataSource.manager, { n: 7 })
      const clock = manualClock()
      const abandoned = await claimAndAbandon(kind, clock.now(), 30 * SECOND)
      expect(abandoned).toMatchObject({ id, status: 'running', attempts: 1, lockedBy: 'crashed-instance' })
      const ran: number[] = []
      const w = worker({ clock: clock.now })
      w.handle(kind, async ({ n }) => void ran.push(n))
      clock.advance(30 * SECOND - 1)
      expect(await w.runDue()).toBe(0)
      clock.advance(1)
      expect(await w.runDue()).toBe(1)
      expect(ran).toEqual([7])
      expect(await jobById(id)).toMatchObject({ status: 'done', attempts: 2 })
      // The first instance, had it only been slow, can no longer overwrite the outcome.
      expect(await completeJob(api.dataSource, abandoned, 'crashed-instance', clock.now())).toBe(false)
    })

    it('fails a job whose instance stopped during its last allowed attempt', async () => {
      const kind = testKind({ maxAttempts: 1, firstDelayMs: SECOND, maxDelayMs: SECOND })
      const { id } = await kind.enqueue(api.dataSource.manager, { n: 1 })
      const clock = manualClock()
      await claimAndAbandon(kind, clock.now(), 5 * SECOND)
      const w = worker({ clock: clock.now })
      w.handle(kind, async () => {})
      clock.advance(5 * SECOND)
      expect(await w.runDue()).toBe(0)
      expect(await jobById(id)).toMatchObject({
        status: 'failed',
        lastError: 'The server stopped during the last attempt; no attempts were left',
      })
    })

    it('renews the lease while a long job is still running, so nobody takes it over', async () => {
      const kind = testKind()
      const { id } = await kind.enqueue(api.dataSource.manager, { n: 1 })
      const clock = manualClock()
      let finish!: () => void
      const holder = worker({ clock: clock.now, leaseMs: 300 })
      holder.handle(kind, () => new Promise<void>((resolve) => (finish = resolve)))
      const running = holder.runDue()
      await vi.waitFor(async () => expect((await jobById(id)).status).toBe('running'))
      const firstLease = (await jobById(id)).lockedUntil!
      clock.advance(250)
      await vi.waitFor(async () => expect((await jobById(id)).lockedUntil! > firstLease).toBe(true), {
        timeout: 5000,
      })
      clock.advance(100) // past the first lease, within the renewed one
      const other = worker({ clock: clock.now })
      other.handle(kind, async () => {})
      expect(await other.runDue()).toBe(0)
      finish()
      expect(await running).toBe(1)
      expect(await jobById(id)).toMatchObject({ status: 'done', attempts: 1 })
    })
  })

  describe('schedules', () => {
    it('enqueues each occurrence once, at the time the expression names in its time zone', async () => {
      const kind = testKind()
      const name = `digest-${kind.kind}`
      // 07:00 in Paris is 06:00 UTC in winter and 05:00 UTC in summer (daylight saving, EU rules).
      const clock = manualClock(new Date('2031-01-15T04:00:00Z'))
      const runs: Date[] = []
      const instances = [worker({ clock: clock.now }), worker({ clock: clock.now })]
      for (const w of instances) {
        w.handle(kind, async (_, job) => void runs.push(job.runAt))
        w.schedule({ name, cron: '0 7 * * *', timeZone: 'Europe/Paris', job: kind, payload: { n: 0 } })
      }
      await Promise.all(instances.map((w) => w.runDue()))
      expect((await jobsOf(kind.kind)).map((j) => [j.runAt, j.dedupeKey])).toEqual([
        ['2031-01-15T06:00:00.000Z', `schedule:${name}:2031-01-15T06:00:00.000Z`],
      ])
      clock.set(new Date('2031-01-15T06:00:00Z'))
      await Promise.all(instances.map((w) => w.runDue()))
      expect(runs).toEqual([new Date('2031-01-15T06:00:00Z')])
      // Every instance down from Jan 15 to Jul 15: the occurrence planned before the gap runs once, late (a
      // handler may look at job.runAt and skip a stale one); those in between are not made up.
      clock.set(new Date('2031-07-15T04:59:00Z'))
      await Promise.all(instances.map((w) => w.runDue()))
      clock.set(new Date('2031-07-15T05:00:00Z'))
      await Promise.all(instances.map((w) => w.runDue()))
      expect(runs.map((d) => d.toISOString())).toEqual([
        '2031-01-15T06:00:00.000Z',
        '2031-01-16T06:00:00.000Z',
        '2031-07-15T05:00:00.000Z',
      ])
    })

    it('refuses an expression or a time zone it cannot read, when the schedule is added', () => {
      const kind = testKind()
      const w = worker()
      expect(() => w.schedule({ name: 'bad', cron: '0 25 * * *', job: kind, payload: { n: 0 } })).toThrow()
      expect(() =>
        w.schedule({
          name: 'bad',
          cron: '0 7 * * *',
          timeZone: 'Mars/Olympus',
          job: kind,
          payload: { n: 0 },
        }),
      ).toThrow()
    })
  })

  it('reports the queue per kind: due, waiting, running and failed', async () => {
    const kind = testKind({ maxAttempts: 1, firstDelayMs: SECOND, maxDelayMs: SECOND })
    const now = new Date()
    const m = api.dataSource.manager
    await kind.enqueue(m, { n: 1 }, { runAt: new Date(now.getTime() - 90 * SECOND) })
    await kind.enqueue(m, { n: 2 }, { runAt: new Date(now.getTime() - 90 * SECOND) })
    await kind.enqueue(m, { n: 3 }, { runAt: new Date(now.getTime() + 3600 * SECOND) })
    const [failing] = await claimJobs(api.dataSource, {
      kinds: [kind.kind],
      workerId: 'x',
      leaseMs: 60_000,
      limit: 1,
      now,
    })
    await api.dataSource
      .getRepository(JobEntity)
      .update({ id: failing!.id }, { status: 'failed', lockedBy: null })
    await claimJobs(api.dataSource, { kinds: [kind.kind], workerId: 'x', leaseMs: 60_000, limit: 1, now })
    await kind.enqueue(m, { n: 4 }, { runAt: new Date(now.getTime() - 30 * SECOND) })
    const figures = await readJobQueueFigures(api.dataSource, now)
    expect(figures[kind.kind]).toEqual({ due: 1, waiting: 1, running: 1, failed: 1, oldestDueSeconds: 30 })
  })
})
