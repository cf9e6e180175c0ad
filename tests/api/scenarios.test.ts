// Scenarios: shipped ones listed for everyone; new versions (published drafts) instead of edits; duplicate,
// retire; scenario packs uploaded and checked by the shared schema and checkScenario with per-field errors.
// The authoring routes themselves (drafts, the publish gate, packs with solutions): scenario-authoring.test.ts.
import { readFileSync } from 'node:fs'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { scenarioDetailSchema, scenarioListSchema } from '../../shared/api'
import { ScenarioEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { readdirSync } from 'node:fs'
import { createCohort, submit } from '../support/world'

const shipped = (name: string) => JSON.parse(readFileSync(`scenarios/${name}.json`, 'utf8'))
const solution = (name: string) =>
  JSON.parse(readFileSync(`scenarios/reference-solutions/${name}.json`, 'utf8')).events

describe('scenarios', () => {
  let api: TestApi
  let instructor: TestUser
  let apprentice: TestUser
  beforeAll(async () => {
    api = await createTestApi()
    instructor = await api.createUser('instructor')
    apprentice = await api.createUser('apprentice')
  })
  afterAll(() => api.close())

  const as = (user: TestUser) => ({
    get: (path: string) => supertest(api.app).get(path).set(bearer(user.token)),
    post: (path: string, body?: object) => supertest(api.app).post(path).set(bearer(user.token)).send(body),
    put: (path: string, body: object) => supertest(api.app).put(path).set(bearer(user.token)).send(body),
  })

  it('lists every shipped scenario for an apprentice', async () => {
    const response = await as(apprentice).get('/api/scenarios')
    expect(response.status).toBe(200)
    const keys = scenarioListSchema.parse(response.body).items.map((s) => s.key)
    const files = readdirSync('scenarios')
      .filter((f) => f.endsWith('.json'))
      .map((f) => shipped(f.replace('.json', '')).id)
    expect(keys.sort()).toEqual(files.sort())
  })

  it('publishes a new scenario and stores an update as a new version, keeping the old one', async () => {
    const document = {
      ...shipped('two-wire-run-stop'),
      id: 'bakery-fan-variant',
      title: 'Bakery fan, variant A',
    }
    const key = 'bakery-fan-variant'
    expect((await as(instructor).post('/api/scenarios/drafts', { key, document })).status).toBe(201)
    const recorded = await as(instructor).put(`/api/scenarios/${key}/draft/reference`, {
      events: solution('two-wire-run-stop'),
    })
    expect(recorded.status, recorded.text).toBe(200)
    const created = await as(instructor).post(`/api/scenarios/${key}/draft/publish`)
    expect(created.status, created.text).toBe(201)
    expect(scenarioDetailSchema.parse(created.body)).toMatchObject({ key: 'bakery-fan-variant', version: 1 })

    const saved = await as(instructor).put(`/api/scenarios/${key}/draft`, {
      document: { ...document, title: 'Bakery fan, variant B' },
    })
    expect(saved.status).toBe(200)
    const updated = await as(instructor).post(`/api/scenarios/${key}/draft/publish`)
    expect(updated.status, updated.text).toBe(201)
    expect(updated.body).toMatchObject({ version: 2, title: 'Bakery fan, variant B' })
    expect(updated.body.document.version).toBe(2)

    const v1 = await as(apprentice).get('/api/scenarios/bakery-fan-variant/versions/1')
    expect(v1.body.title).toBe('Bakery fan, variant A')
    expect((await as(apprentice).get('/api/scenarios/bakery-fan-variant')).body.version).toBe(2)
  })

  it('lists the library by title, says which scenarios are the centre’s own and carries their outcomes', async () => {
    const items = scenarioListSchema.parse((await as(instructor).get('/api/scenarios')).body).items
    const titles = items.map((s) => s.title)
    // Intl.Collator (not our code) decides the order, without regard to case.
    const collator = new Intl.Collator('en', { sensitivity: 'base', numeric: true })
    expect(titles).toEqual([...titles].sort(collator.compare))
    // The shipped keys and titles sort differently, so this fails for a list ordered by key.
    const byKey = [...items].sort((a, b) => a.key.localeCompare(b.key)).map((s) => s.title)
    expect(titles).not.toEqual(byKey)
    const variant = items.find((s) => s.key === 'bakery-fan-variant')!
    expect(variant).toMatchObject({ origin: 'centre', version: 2 })
    const fan = items.find((s) => s.key === 'two-wire-run-stop')!
    expect(fan.origin).toBe('shipped')
    expect(fan.learningOutcomes).toEqual(shipped('two-wire-run-stop').learningOutcomes)
  })

  it('refuses a draft of a key that exists', async () => {
    const response = await as(instructor).post('/api/scenarios/drafts', {
      key: 'two-wire-run-stop',
      document: shipped('two-wire-run-stop'),
    })
    expect(response.status).toBe(409)
  })

  it('keeps a draft that breaks the schema, naming the field among its problems', async () => {
    const response = await as(instructor).post('/api/scenarios/drafts', {
      key: 'broken-one',
      document: { ...shipped('two-wire-run-stop'), passMark: 'high' },
    })
    expect(response.status).toBe(201)
    expect(response.body.problems.map((p: { path: string }) => p.path)).toContain('$.passMark')
    expect(response.body.publishable).toBe(false)
  })

  it('reports a semantic problem (a wire to a terminal that does not exist) by JSON path', async () => {
    const document = shipped('two-wire-run-stop')
    document.start.wires = [{ id: 'w1', from: 'drive.di1', to: 'ghost.a', colour: 'blue' }]
    const response = await as(instructor).post('/api/scenarios/drafts', { key: 'dangling-wire', document })
    expect(response.status).toBe(201)
    expect(response.body.problems.some((p: { path: string }) => p.path.startsWith('$.start.wires[0]'))).toBe(
      true,
    )
    expect((await as(instructor).post('/api/scenarios/dangling-wire/draft/publish')).status).toBe(409)
    expect(await api.dataSource.getRepository(ScenarioEntity).countBy({ key: 'dangling-wire' })).toBe(0)
  })

  it('duplicates a scenario as a draft of a new key, which publishes as version 1', async () => {
    const response = await as(instructor).post('/api/scenarios/safe-isolation/duplicate', {
      newKey: 'safe-isolation-night-shift',
    })
    expect(response.status).toBe(201)
    expect(response.body).toMatchObject({ key: 'safe-isolation-night-shift', nextVersion: 1 })
    expect(response.body.title).toMatch(/\(copy\)$/)
    const published = await as(instructor).post('/api/scenarios/safe-isolation-night-shift/draft/publish')
    expect(published.status, published.text).toBe(201)
    expect(published.body).toMatchObject({ key: 'safe-isolation-night-shift', version: 1 })
  })

  it('retires a scenario: hidden from apprentices, refused for new assignments and practice', async () => {
    await as(instructor).post('/api/scenarios/safe-isolation-night-shift/retire')
    const list = await as(apprentice).get('/api/scenarios')
    expect(list.body.items.map((s: { key: string }) => s.key)).not.toContain('safe-isolation-night-shift')
    const staffList = await as(instructor).get('/api/scenarios?includeRetired=true')
    const retired = staffList.body.items.find((s: { key: string }) => s.key === 'safe-isolation-night-shift')
    expect(retired.status).toBe('retired')
    const practice = await submit(api, apprentice, { scenarioId: retired.id })
    expect(practice.status).toBe(409)
    expect(practice.body.error.code).toBe('scenario_retired')
    const cohort = await createCohort(api, instructor, 'Retirement check', [])
    const assign = await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/assignments`)
      .set(bearer(instructor.token))
      .send({
        scenarioId: retired.id,
        opensAt: new Date().toISOString(),
        dueAt: new Date(Date.now() + 86_400_000).toISOString(),
        attemptLimit: null,
        hintsAllowed: true,
      })
    expect(assign.status).toBe(409)
  })

  it('does not let an apprentice create scenarios', async () => {
    const response = await as(apprentice).post('/api/scenarios/drafts', {
      key: 'sneaky',
      document: shipped('two-wire-run-stop'),
    })
    expect(response.status).toBe(403)
  })

  describe('scenario pack upload', () => {
    const upload = (content: string | Buffer, filename = 'pack.json', contentType = 'application/json') =>
      supertest(api.app)
        .post('/api/scenarios/upload')
        .set(bearer(instructor.token))
        .attach('pack', Buffer.from(content), { filename, contentType })

    it('keeps every bare document of a valid pack as a draft (they carry no reference solution)', async () => {
      const pack = [
        { ...shipped('fan-ramp-or-coast'), id: 'pack-fan-one' },
        { ...shipped('fan-ramp-or-coast'), id: 'fan-ramp-or-coast' },
      ]
      const response = await upload(JSON.stringify(pack))
      expect(response.status).toBe(201)
      expect(
        response.body.items.map((i: { key: string; outcome: string; version: number | null }) => [
          i.key,
          i.outcome,
          i.version,
        ]),
      ).toEqual([
        ['pack-fan-one', 'draft', null],
        ['fan-ramp-or-coast', 'draft', null],
      ])
      const draft = await as(instructor).get('/api/scenarios/fan-ramp-or-coast/draft')
      expect(draft.body).toMatchObject({ baseVersion: 1, nextVersion: 2 })
      expect((await as(instructor).get('/api/scenarios/pack-fan-one/draft')).body.nextVersion).toBe(1)
    })

    it('names the field in error, by position in the pack, and stores nothing', async () => {
      const pack = [
        { ...shipped('fan-ramp-or-coast'), id: 'pack-good' },
        { ...shipped('fan-ramp-or-coast'), id: 'Pack Bad!' },
      ]
      const response = await upload(JSON.stringify(pack))
      expect(response.status).toBe(400)
      expect(Object.keys(response.body.error.details.fields)).toContain('1.id')
      expect(await api.dataSource.getRepository(ScenarioEntity).countBy({ key: 'pack-good' })).toBe(0)
    })

    it('answers a file that is not JSON with 415', async () => {
      expect((await upload('<xml/>', 'pack.xml', 'application/xml')).status).toBe(415)
      expect((await upload('not json at all', 'pack.json')).status).toBe(415)
    })

    it('answers a pack over the size limit with 413', async () => {
      const response = await upload(JSON.stringify({ padding: 'x'.repeat(600 * 1024) }))
      expect(response.status).toBe(413)
    })

    it('asks for the file when none is attached', async () => {
      const response = await supertest(api.app)
        .post('/api/scenarios/upload')
        .set(bearer(instructor.token))
        .field('x', 'y')
      expect(response.status).toBe(400)
      expect(response.body.error.details.fields).toHaveProperty('pack')
    })
  })
})

describe('semantic problems in a pack', () => {
  it('prefix the JSON path with the position in the pack', async () => {
    const api = await createTestApi({ scenarios: false })
    try {
      const instructor = await api.createUser('instructor')
      const bad = shipped('two-wire-run-stop')
      bad.start.wires = [{ id: 'w1', from: 'drive.di1', to: 'ghost.a', colour: 'blue' }]
      const response = await supertest(api.app)
        .post('/api/scenarios/upload')
        .set(bearer(instructor.token))
        .attach('pack', Buffer.from(JSON.stringify([shipped('safe-isolation'), bad])), {
          filename: 'pack.json',
          contentType: 'application/json',
        })
      expect(response.status).toBe(400)
      expect(
        Object.keys(response.body.error.details.fields).some((k) => k.startsWith('$[1].start.wires[0]')),
      ).toBe(true)
      expect(await api.dataSource.getRepository(ScenarioEntity).count()).toBe(0)
    } finally {
      await api.close()
    }
  })
})
