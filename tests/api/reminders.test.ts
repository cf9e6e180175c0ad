// Due-date reminders and the instructors' daily digest (server/reminders/): the scan queues each reminder
// once however often it runs, follows opt-outs, excusals and extensions; the digest tells each instructor
// about their own cohorts only, once per occurrence; and the profile's mail preferences.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { JobEntity } from '../../server/entities'
import { queueDailyDigests } from '../../server/reminders/daily-digest.service'
import { queueDueReminders } from '../../server/reminders/due-reminders.service'
import { reminderScanJob } from '../../server/reminders/reminder-jobs'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import {
  buildWorld,
  createAssignment,
  createCohort,
  expectStatus,
  submit,
  type World,
} from '../support/world'

const HOUR = 3_600_000
const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/i
const link = (path: string) => `http://slipway.test${path}`

describe('mail preferences on the profile', () => {
  let api: TestApi
  let me: TestUser
  beforeAll(async () => {
    api = await createTestApi()
    me = await api.createUser('apprentice')
  })
  afterAll(() => api.close())

  const get = () => supertest(api.app).get('/api/auth/me/mail-preferences').set(bearer(me.token))
  const patch = (body: unknown) =>
    supertest(api.app)
      .patch('/api/auth/me/mail-preferences')
      .set(bearer(me.token))
      .send(body as object)

  it('has both kinds of optional mail on until someone turns them off', async () => {
    expect((await expectStatus(get(), 200)).body).toEqual({ dueReminders: true, dailyDigest: true })
  })

  it('turns one off and keeps the other as it was', async () => {
    expect((await expectStatus(patch({ dueReminders: false }), 200)).body).toEqual({
      dueReminders: false,
      dailyDigest: true,
    })
    expect((await expectStatus(get(), 200)).body).toEqual({ dueReminders: false, dailyDigest: true })
    expect((await expectStatus(patch({ dueReminders: true }), 200)).body.dueReminders).toBe(true)
  })

  it('refuses a value that is not yes or no, and a setting that does not exist, changing nothing', async () => {
    const wrong = await expectStatus(patch({ dueReminders: 'sometimes' }), 400)
    expect(wrong.body.error.message).toBeTruthy()
    await expectStatus(patch({ weeklyNewsletter: true }), 400)
    expect((await get()).body).toEqual({ dueReminders: true, dailyDigest: true })
  })

  it('is not there for someone signed out', async () => {
    await expectStatus(supertest(api.app).get('/api/auth/me/mail-preferences'), 401)
  })
})

describe('due-date reminders', () => {
  let api: TestApi
  let world: World
  let optedOut: TestUser
  let excused: TestUser
  let extended: TestUser
  let assignmentId: string
  const start = Date.now()
  const dueAt = new Date(start + 30 * HOUR).toISOString()
  const reminders = async () => (await api.mail()).filter((m) => /^Due .*: Reminder bench$/.test(m.subject))

  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
    optedOut = await api.createUser('apprentice', { name: 'Opal Optout' })
    excused = await api.createUser('apprentice', { name: 'Esme Excused' })
    extended = await api.createUser('apprentice', { name: 'Ezra Extended' })
    const cohort = await createCohort(api, world.instructorA, 'Reminder cohort', [
      world.apprenticeA1,
      optedOut,
      excused,
      extended,
    ])
    const assignment = await createAssignment(api, world.instructorA, cohort, world.assignmentA.scenarioId, {
      title: 'Reminder bench',
      dueAt,
    })
    assignmentId = assignment.id
    await expectStatus(
      supertest(api.app)
        .patch('/api/auth/me/mail-preferences')
        .set(bearer(optedOut.token))
        .send({ dueReminders: false }),
      200,
    )
    const except = (body: object) =>
      expectStatus(
        supertest(api.app)
          .post(`/api/assignments/${assignment.id}/exceptions`)
          .set(bearer(world.instructorA.token))
          .send(body),
        200,
      )
    await except({ userIds: [excused.user.id], excused: true, reason: 'Away on placement' })
    await except({
      userIds: [extended.user.id],
      dueAt: new Date(start + 5 * 24 * HOUR).toISOString(),
      reason: 'Joined late',
    })
    await api.mail() // the "new assignment" mail, out of the way
  })
  afterAll(() => api.close())

  it('reminds, 48 hours ahead, only those who have not passed, are not excused or extended, and want it', async () => {
    expect(await queueDueReminders(api.dataSource, { now: start, link })).toBe(1)
    const sent = await reminders()
    expect(sent.map((m) => m.toAddress)).toEqual([world.apprenticeA1.email])
    const [mail] = sent
    expect(mail!.subject).toBe('Due in two days: Reminder bench')
    expect(mail!.text).toContain('Hello Ada Apprentice')
    expect(mail!.text).toContain('Reminder cohort')
    expect(mail!.text).toContain('UTC') // the centre's clock (UTC until an admin sets one)
    expect(mail!.text).toContain(`http://slipway.test/assignments/${assignmentId}`)
    // Words only: the one id is in the link.
    expect(mail!.text.replace(/https?:\/\/\S+/g, '')).not.toMatch(UUID)
  })

  it('queues nothing more when the scan runs again, through the job queue as a schedule would run it', async () => {
    expect(await queueDueReminders(api.dataSource, { now: start + 60_000, link })).toBe(0)
    await reminderScanJob.enqueue(api.dataSource.manager, {})
    await api.jobs.worker.runDue()
    expect(await reminders()).toHaveLength(1)
  })

  it('sends the 24-hour reminder once its mark is reached', async () => {
    expect(await queueDueReminders(api.dataSource, { now: start + 7 * HOUR, link })).toBe(1)
    expect(await queueDueReminders(api.dataSource, { now: start + 8 * HOUR, link })).toBe(0)
    const sent = await reminders()
    expect(sent.map((m) => m.subject)).toEqual([
      'Due in two days: Reminder bench',
      'Due tomorrow: Reminder bench',
    ])
  })

  it('reminds the extended apprentice before their own due date instead', async () => {
    const ownDue = start + 5 * 24 * HOUR
    expect(await queueDueReminders(api.dataSource, { now: ownDue - 20 * HOUR, link })).toBe(1)
    const last = (await reminders()).at(-1)!
    expect(last.toAddress).toBe(extended.email)
    expect(last.subject).toBe('Due tomorrow: Reminder bench')
  })

  it('sends nothing after the due date', async () => {
    expect(await queueDueReminders(api.dataSource, { now: start + 31 * HOUR, link })).toBe(0)
  })

  it('keeps one mail job per reminder key', async () => {
    const jobs = await api.dataSource.getRepository(JobEntity).find({ where: { kind: 'mail' } })
    const keys = jobs.map((j) => j.dedupeKey).filter((k) => k?.startsWith('reminder:'))
    expect(keys).toHaveLength(3)
    expect(new Set(keys).size).toBe(3)
  })
})

describe('the daily digest', () => {
  let api: TestApi
  let world: World

  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api) // Ada has submitted once on cohort A's assignment
    await expectStatus(submit(api, world.apprenticeA2, { assignmentId: world.assignmentA.id }), 201)
    await api.mail()
  })
  afterAll(() => api.close())

  const digests = async () => (await api.mail()).filter((m) => m.subject === 'Your Slipway digest')

  it('tells each instructor about new submissions in their own cohorts, once per occurrence', async () => {
    const occurrence = new Date(Date.now() + 60_000)
    expect(await queueDailyDigests(api.dataSource, { occurrence, link })).toBe(1)
    expect(await queueDailyDigests(api.dataSource, { occurrence, link })).toBe(0)
    const sent = await digests()
    expect(sent.map((m) => m.toAddress)).toEqual([world.instructorA.email])
    expect(sent[0]!.text).toContain('Hello Ines Instructor-A')
    expect(sent[0]!.text).toContain('Cohort A: 2 new submissions, 0 passed')
    expect(sent[0]!.text).not.toContain('Cohort B')
    expect(sent[0]!.text.replace(/https?:\/\/\S+/g, '')).not.toMatch(UUID)
  })

  it('covers only what came since the previous digest, and sends none when nothing did', async () => {
    await api.dataSource.getRepository(JobEntity).insert({
      id: crypto.randomUUID(),
      kind: 'digest.daily',
      payload: '{}',
      status: 'done',
      runAt: new Date(Date.now() + 60_000).toISOString(),
      attempts: 1,
      maxAttempts: 5,
      lockedBy: null,
      lockedUntil: null,
      lastError: null,
      dedupeKey: null,
      label: '',
      createdAt: new Date().toISOString(),
      updatedAt: new Date().toISOString(),
      finishedAt: new Date().toISOString(),
    })
    const next = new Date(Date.now() + 2 * HOUR)
    expect(await queueDailyDigests(api.dataSource, { occurrence: next, link })).toBe(0)
  })

  it('is not sent to an instructor who turned it off', async () => {
    await expectStatus(
      supertest(api.app)
        .patch('/api/auth/me/mail-preferences')
        .set(bearer(world.instructorB.token))
        .send({ dailyDigest: false }),
      200,
    )
    await expectStatus(submit(api, world.apprenticeB1, { assignmentId: world.assignmentB.id }), 201)
    const occurrence = new Date(Date.now() + 3 * HOUR)
    expect(await queueDailyDigests(api.dataSource, { occurrence, link })).toBe(0)
    expect((await digests()).map((m) => m.toAddress)).not.toContain(world.instructorB.email)
  })
})
