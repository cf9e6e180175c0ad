// Scenario authoring (issue 17): drafts kept with their problems, reference solutions graded in the pool, the
// publish gate (checks, a solution, full marks), re-grading a later version, packs exported and imported with
// their solutions re-graded, all or nothing. The rules: shared/api/scenarioAuthoring.ts.
import { readFileSync } from 'node:fs'
import supertest from 'supertest'
import { In } from 'typeorm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  SCENARIO_DRAFT_MAX_BYTES,
  packImportResultSchema,
  scenarioDetailSchema,
  scenarioDraftListSchema,
  scenarioDraftSchema,
  scenarioPackFileSchema,
  scenarioVersionWithReferenceSchema,
} from '../../shared/api'
import { ScenarioDraftEntity, ScenarioEntity, ScenarioReferenceSolutionEntity } from '../../server/entities'
import { createGradingPool } from '../../server/infrastructure/grading/grading-pool'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'

const shipped = (name: string) => JSON.parse(readFileSync(`scenarios/${name}.json`, 'utf8'))
const solution = (name: string) =>
  JSON.parse(readFileSync(`scenarios/reference-solutions/${name}.json`, 'utf8')).events
const mistake = (file: string) =>
  JSON.parse(readFileSync(`tests/fixtures/attempts/${file}.json`, 'utf8')).events

function client(api: TestApi, user: TestUser) {
  const auth = () => bearer(user.token)
  return {
    get: (path: string) => supertest(api.app).get(path).set(auth()),
    post: (path: string, body?: object) => supertest(api.app).post(path).set(auth()).send(body),
    put: (path: string, body: object) => supertest(api.app).put(path).set(auth()).send(body),
    delete: (path: string) => supertest(api.app).delete(path).set(auth()),
    upload: (content: string) =>
      supertest(api.app)
        .post('/api/scenarios/upload')
        .set(auth())
        .attach('pack', Buffer.from(content), { filename: 'pack.json', contentType: 'application/json' }),
  }
}

describe('scenario authoring', () => {
  let api: TestApi
  let instructor: TestUser
  let as: ReturnType<typeof client>
  beforeAll(async () => {
    api = await createTestApi()
    instructor = await api.createUser('instructor', { name: 'Oriel Instructor' })
    as = client(api, instructor)
  })
  afterAll(() => api.close())

  const versionsOf = async (key: string) =>
    (await as.get(`/api/scenarios/${key}/versions`)).body.items.map((v: unknown) =>
      scenarioVersionWithReferenceSchema.parse(v),
    )

  describe('drafts', () => {
    it('creates a draft of a new key, keeps it with its problems in words, and lists it', async () => {
      expect((await as.get('/api/scenarios/drafts')).body).toEqual({ items: [] })
      const response = await as.post('/api/scenarios/drafts', {
        key: 'kiln-fan',
        document: { title: 'Kiln exhaust fan', id: 'something-else', version: 7 },
      })
      expect(response.status).toBe(201)
      const draft = scenarioDraftSchema.parse(response.body)
      expect(draft).toMatchObject({
        key: 'kiln-fan',
        title: 'Kiln exhaust fan',
        baseVersion: null,
        nextVersion: 1,
        updatedByName: 'Oriel Instructor',
        reference: null,
        publishable: false,
      })
      // The key and the next version are the server's, whatever the document said.
      expect(draft.document).toMatchObject({ id: 'kiln-fan', version: 1 })
      expect(draft.problems.length).toBeGreaterThan(0)
      for (const problem of draft.problems) {
        expect(problem.message).toMatch(/\S{3}/)
        expect(problem.place).not.toMatch(/\$|\[\d/)
      }
      const list = scenarioDraftListSchema.parse((await as.get('/api/scenarios/drafts')).body)
      expect(list.items.map((d) => d.key)).toEqual(['kiln-fan'])
      expect((await as.get('/api/scenarios/kiln-fan/draft')).body.title).toBe('Kiln exhaust fan')
    })

    it('lists drafts newest first', async () => {
      await as.post('/api/scenarios/drafts', { key: 'kiln-fan-two', document: { title: 'Second kiln fan' } })
      const keys = (await as.get('/api/scenarios/drafts')).body.items.map((d: { key: string }) => d.key)
      expect(keys.slice(0, 2)).toEqual(['kiln-fan-two', 'kiln-fan'])
      expect((await as.delete('/api/scenarios/kiln-fan-two/draft')).status).toBe(204)
    })

    it('refuses a new draft whose key a published scenario or another draft uses', async () => {
      for (const key of ['two-wire-run-stop', 'kiln-fan']) {
        const response = await as.post('/api/scenarios/drafts', { key, document: {} })
        expect(response.status).toBe(409)
        expect(response.body.error.code).toBe('conflict')
      }
    })

    it('starts a draft from the latest version, then answers with that draft', async () => {
      const started = await as.post('/api/scenarios/safe-isolation/draft')
      expect(started.status).toBe(201)
      expect(started.body).toMatchObject({
        key: 'safe-isolation',
        baseVersion: 1,
        nextVersion: 2,
        problems: [],
      })
      expect(started.body.document).toMatchObject({ ...shipped('safe-isolation'), version: 2 })
      // The shipped reference solution came with the scenario, so it can be published as it is.
      expect(started.body.reference.result).toMatchObject({ fullMarks: true, missed: [] })
      expect(started.body.publishable).toBe(true)
      // Version 1 was imported with how that solution fared on it.
      const [shippedVersion] = await versionsOf('safe-isolation')
      expect(shippedVersion.reference).toMatchObject({ fullMarks: true, score: 100 })
      const again = await as.post('/api/scenarios/safe-isolation/draft')
      expect(again.status).toBe(200)
      expect(again.body.createdAt).toBe(started.body.createdAt)
      expect((await as.post('/api/scenarios/no-such-scenario/draft')).status).toBe(404)
    })

    it('saves the whole document, even with problems, and refuses one too large to keep', async () => {
      const document = { ...shipped('safe-isolation'), title: 'Safe isolation at the mill', passMark: 'high' }
      const saved = await as.put('/api/scenarios/safe-isolation/draft', { document })
      expect(saved.status).toBe(200)
      expect(saved.body.document.passMark).toBe('high')
      expect(saved.body.problems.map((p: { path: string }) => p.path)).toContain('$.passMark')
      expect(saved.body).toMatchObject({ title: 'Safe isolation at the mill', publishable: false })
      // The reference result waits for a draft that passes its checks.
      expect(saved.body.reference.result).toBeNull()

      const big = await as.put('/api/scenarios/safe-isolation/draft', {
        document: { ...document, story: 'x'.repeat(SCENARIO_DRAFT_MAX_BYTES) },
      })
      expect(big.status).toBe(413)
      expect(big.body.error.code).toBe('payload_too_large')
      expect((await as.get('/api/scenarios/safe-isolation/draft')).body.document.story).toBe(document.story)
      expect((await as.put('/api/scenarios/no-such-scenario/draft', { document })).status).toBe(404)
    })

    it('discards a draft (404 when there is none)', async () => {
      expect((await as.delete('/api/scenarios/safe-isolation/draft')).status).toBe(204)
      expect((await as.get('/api/scenarios/safe-isolation/draft')).status).toBe(404)
      expect((await as.delete('/api/scenarios/safe-isolation/draft')).status).toBe(404)
      // The key keeps its reference solution: it belongs to the published scenario.
      const solutions = api.dataSource.getRepository(ScenarioReferenceSolutionEntity)
      expect(await solutions.existsBy({ key: 'safe-isolation' })).toBe(true)
    })
  })

  describe('reference solutions and the publish gate', () => {
    const key = 'stirrer-night'
    const document = { ...shipped('potentiometer-reference'), title: 'Night-shift stirrer' }

    it('refuses to record a solution against a draft with problems, in words', async () => {
      await as.post('/api/scenarios/drafts', { key, document: { ...document, passMark: 'high' } })
      const response = await as.put(`/api/scenarios/${key}/draft/reference`, {
        events: solution('potentiometer-reference'),
      })
      expect(response.status).toBe(409)
      expect(response.body.error.code).toBe('draft_not_ready')
      expect(response.body.error.message).toMatch(/^The draft has 1 problem to put right first: /)
      expect(response.body.error.message).not.toContain('$.')
    })

    it('refuses to publish a draft with problems', async () => {
      const response = await as.post(`/api/scenarios/${key}/draft/publish`)
      expect(response.status).toBe(409)
      expect(response.body.error.code).toBe('draft_not_ready')
    })

    it('refuses to publish without a reference solution', async () => {
      await as.put(`/api/scenarios/${key}/draft`, { document })
      const response = await as.post(`/api/scenarios/${key}/draft/publish`)
      expect(response.status).toBe(409)
      expect(response.body.error.code).toBe('reference_missing')
      expect(await api.dataSource.getRepository(ScenarioEntity).countBy({ key })).toBe(0)
    })

    it('refuses a run that cannot be replayed (400) and stores nothing', async () => {
      // Out of time order (the grader's replay refuses such a log too: tests/unit/scenario/reference.test.ts).
      const events = [
        { t: 5000, type: 'power.off' },
        { t: 1000, type: 'power.on' },
      ]
      const response = await as.put(`/api/scenarios/${key}/draft/reference`, { events })
      expect(response.status).toBe(400)
      expect(response.body.error.code).toBe('validation_failed')
      expect(JSON.stringify(response.body.error.details)).toContain('1.t')
      const solutions = api.dataSource.getRepository(ScenarioReferenceSolutionEntity)
      expect(await solutions.existsBy({ key })).toBe(false)
    })

    it('keeps a run short of full marks, says what it misses, and refuses to publish', async () => {
      const recorded = await as.put(`/api/scenarios/${key}/draft/reference`, {
        events: mistake('potentiometer-reference--mistake-low-end-not-wired'),
      })
      expect(recorded.status).toBe(200)
      const missed = 'With the knob at minimum, the analog input reads about 0 V'
      expect(recorded.body.reference.result).toMatchObject({ fullMarks: false, missed: [missed] })
      expect(recorded.body.reference.recordedByName).toBe('Oriel Instructor')
      expect(recorded.body.publishable).toBe(false)
      const response = await as.post(`/api/scenarios/${key}/draft/publish`)
      expect(response.status).toBe(409)
      expect(response.body.error.code).toBe('reference_not_full')
      expect(response.body.error.message).toBe(`The reference solution misses 1 objective: ${missed}.`)
    })

    it('publishes a draft whose solution scores full marks: version 1, the draft gone, the result kept', async () => {
      const recorded = await as.put(`/api/scenarios/${key}/draft/reference`, {
        events: solution('potentiometer-reference'),
      })
      expect(recorded.body.reference).toMatchObject({
        actions: solution('potentiometer-reference').length,
        result: { fullMarks: true, score: 100 },
      })
      expect(recorded.body.reference.durationMs).toBeGreaterThan(0)
      expect(recorded.body.publishable).toBe(true)
      const published = await as.post(`/api/scenarios/${key}/draft/publish`)
      expect(published.status).toBe(201)
      expect(scenarioDetailSchema.parse(published.body)).toMatchObject({
        key,
        version: 1,
        title: 'Night-shift stirrer',
      })
      expect((await as.get(`/api/scenarios/${key}/draft`)).status).toBe(404)
      const [version] = await versionsOf(key)
      expect(version.reference).toMatchObject({ fullMarks: true, score: 100, missed: [] })
    })

    it('re-grades a later version against the solution: an objective it does not meet refuses it', async () => {
      const started = await as.post(`/api/scenarios/${key}/draft`)
      expect(started.body).toMatchObject({ baseVersion: 1, nextVersion: 2, publishable: true })
      const changed = structuredClone(started.body.document)
      const speed = changed.objectives.find((o: { kind: string }) => o.kind === 'speedHeld')
      speed.target = 30
      speed.title = 'Stirrer ran at 30 Hz (within 1 Hz) for 5 s'
      const saved = await as.put(`/api/scenarios/${key}/draft`, { document: changed })
      expect(saved.body.reference.result.missed).toEqual([speed.title])
      const refused = await as.post(`/api/scenarios/${key}/draft/publish`)
      expect(refused.status).toBe(409)
      expect(refused.body.error.code).toBe('reference_not_full')
      expect(refused.body.error.message).toContain(speed.title)
      expect((await versionsOf(key)).map((v: { version: number }) => v.version)).toEqual([1])

      // A change the solution still meets publishes as version 2, with its own result.
      await as.put(`/api/scenarios/${key}/draft`, {
        document: { ...changed, ...document, title: 'Stirrer B' },
      })
      const published = await as.post(`/api/scenarios/${key}/draft/publish`)
      expect(published.status).toBe(201)
      expect(published.body).toMatchObject({ version: 2, title: 'Stirrer B' })
      expect(published.body.document.version).toBe(2)
      const versions = await versionsOf(key)
      expect(versions.map((v: { version: number }) => v.version)).toEqual([2, 1])
      expect(versions[0].reference.fullMarks).toBe(true)
    })

    it('duplicates a scenario as a draft of a new key, with its reference solution', async () => {
      const response = await as.post(`/api/scenarios/${key}/duplicate`, {
        newKey: 'stirrer-copy',
        title: 'Stirrer C',
      })
      expect(response.status).toBe(201)
      expect(scenarioDraftSchema.parse(response.body)).toMatchObject({
        key: 'stirrer-copy',
        title: 'Stirrer C',
        baseVersion: null,
        nextVersion: 1,
        publishable: true,
      })
      expect(response.body.reference.result.fullMarks).toBe(true)
      expect((await as.post(`/api/scenarios/${key}/duplicate`, { newKey: 'stirrer-copy' })).status).toBe(409)
      expect((await as.post('/api/scenarios/no-such-one/duplicate', { newKey: 'other-copy' })).status).toBe(
        404,
      )
      // Discarding a never-published draft leaves no solution behind.
      await as.delete('/api/scenarios/stirrer-copy/draft')
      const solutions = api.dataSource.getRepository(ScenarioReferenceSolutionEntity)
      expect(await solutions.existsBy({ key: 'stirrer-copy' })).toBe(false)
    })
  })

  describe('packs', () => {
    it('exports the newest version of each key with its solution, as an attachment', async () => {
      const response = await as.get('/api/scenarios/export?keys=stirrer-night,kiln-fan-free,safe-isolation')
      expect(response.status).toBe(404)
      expect(response.body.error.message).toContain('kiln-fan-free')

      const ok = await as.get('/api/scenarios/export?keys=stirrer-night,safe-isolation')
      expect(ok.status).toBe(200)
      expect(ok.headers['content-disposition']).toMatch(
        /^attachment; filename="slipway-scenarios-\d{4}-\d{2}-\d{2}\.json"$/,
      )
      const pack = scenarioPackFileSchema.parse(ok.body)
      expect(pack.scenarios.map((s) => [s.document.id, s.document.version])).toEqual([
        ['stirrer-night', 2],
        ['safe-isolation', 1],
      ])
      expect(pack.scenarios[1].referenceSolution?.events).toEqual(solution('safe-isolation'))
    })

    it('imports an exported pack elsewhere: each re-graded and published, with its solution', async () => {
      const pack = (await as.get('/api/scenarios/export?keys=stirrer-night,safe-isolation')).body
      const other = await createTestApi({ scenarios: false })
      try {
        const there = client(other, await other.createUser('admin'))
        const response = await there.upload(JSON.stringify(pack))
        expect(response.status, response.text).toBe(201)
        const { items } = packImportResultSchema.parse(response.body)
        expect(items.map((i) => [i.key, i.outcome, i.version, i.reference?.fullMarks, i.draftNote])).toEqual([
          ['stirrer-night', 'published', 1, true, null],
          ['safe-isolation', 'published', 1, true, null],
        ])
        const versions = (await there.get('/api/scenarios/stirrer-night/versions')).body.items
        expect(versions[0].reference.fullMarks).toBe(true)
        const started = await there.post('/api/scenarios/stirrer-night/draft')
        expect(started.body.publishable).toBe(true)
      } finally {
        await other.close()
      }
    })

    it('keeps a pack scenario without a solution as a draft, replacing the draft of its key', async () => {
      await as.post('/api/scenarios/two-wire-run-stop/draft')
      const document = { ...shipped('two-wire-run-stop'), title: 'Fan from the pack' }
      const pack = { format: 'slipway-scenario-pack', formatVersion: 1, exportedAt: new Date().toISOString() }
      const response = await as.upload(
        JSON.stringify({ ...pack, scenarios: [{ document, referenceSolution: null }] }),
      )
      expect(response.status).toBe(201)
      expect(response.body.items).toEqual([
        expect.objectContaining({
          key: 'two-wire-run-stop',
          outcome: 'draft',
          version: null,
          reference: null,
          draftNote: 'It takes the place of the draft of this scenario that was in progress.',
        }),
      ])
      const draft = await as.get('/api/scenarios/two-wire-run-stop/draft')
      expect(draft.body).toMatchObject({ title: 'Fan from the pack', baseVersion: 1, nextVersion: 2 })
    })

    it('keeps a draft in progress when a pack publishes its key, moved onto the new version', async () => {
      const key = 'stirrer-night'
      const started = await as.post(`/api/scenarios/${key}/draft`)
      expect(started.body).toMatchObject({ baseVersion: 2, nextVersion: 3 })
      await as.put(`/api/scenarios/${key}/draft`, {
        document: { ...started.body.document, title: 'Stirrer D' },
      })
      const pack = (await as.get(`/api/scenarios/export?keys=${key}`)).body
      pack.scenarios[0].document.title = 'Stirrer from the pack'

      const response = await as.upload(JSON.stringify(pack))
      expect(response.status, response.text).toBe(201)
      const [item] = packImportResultSchema.parse(response.body).items
      expect(item).toMatchObject({ key, outcome: 'published', version: 3 })
      expect(item.draftNote).toBe(
        'A draft of this scenario was in progress; it is kept and now builds on version 3. ' +
          'Compare the two before publishing it: any changes this version brought are not in the draft.',
      )
      // The author's work is kept; what it is a draft of, and the number it would publish as, move on.
      const draft = scenarioDraftSchema.parse((await as.get(`/api/scenarios/${key}/draft`)).body)
      expect(draft).toMatchObject({ title: 'Stirrer D', baseVersion: 3, nextVersion: 4, publishable: true })
      expect(draft.document.version).toBe(4)
      const stored = await api.dataSource.getRepository(ScenarioDraftEntity).findOneByOrFail({ key })
      expect(JSON.parse(stored.document).version).toBe(4)
      // Publishing it then makes version 4 from the draft, after the pack's version 3.
      const published = await as.post(`/api/scenarios/${key}/draft/publish`)
      expect(published.status).toBe(201)
      expect(published.body).toMatchObject({ version: 4, title: 'Stirrer D' })
      expect((await versionsOf(key)).map((v: { title: string }) => v.title).slice(0, 2)).toEqual([
        'Stirrer D',
        'Stirrer from the pack',
      ])
    })

    it('refuses the whole pack when one solution is short of full marks, naming that scenario', async () => {
      const exportedAt = new Date().toISOString()
      const pack = {
        format: 'slipway-scenario-pack',
        formatVersion: 1,
        exportedAt,
        scenarios: [
          {
            document: { ...shipped('fan-ramp-or-coast'), id: 'pack-good' },
            referenceSolution: { events: solution('fan-ramp-or-coast') },
          },
          {
            document: { ...shipped('three-wire-start-stop'), id: 'pack-new-draft' },
            referenceSolution: null,
          },
          {
            document: { ...shipped('potentiometer-reference'), id: 'pack-short', title: 'Short stirrer' },
            referenceSolution: { events: mistake('potentiometer-reference--mistake-low-end-not-wired') },
          },
        ],
      }
      const countsBefore = await counts()
      const response = await as.upload(JSON.stringify(pack))
      expect(response.status).toBe(409)
      expect(response.body.error.code).toBe('reference_not_full')
      expect(response.body.error.message).toMatch(
        /^“Short stirrer”: The reference solution misses 1 objective/,
      )
      expect(await counts()).toEqual(countsBefore)

      // A scenario with a problem refuses it too, by its place in the pack.
      pack.scenarios[2] = {
        document: { ...pack.scenarios[2].document, passMark: 500 },
        referenceSolution: null,
      }
      const invalid = await as.upload(JSON.stringify(pack))
      expect(invalid.status).toBe(400)
      expect(await counts()).toEqual(countsBefore)
    })

    async function counts() {
      const ds = api.dataSource
      return [
        await ds.getRepository(ScenarioEntity).count(),
        await ds.getRepository(ScenarioDraftEntity).count(),
        await ds.getRepository(ScenarioReferenceSolutionEntity).count(),
      ]
    }
  })

  describe('reading drafts grades only what changed since', () => {
    const keys = [
      'safe-isolation',
      'two-wire-run-stop',
      'three-wire-start-stop',
      'fan-ramp-or-coast',
      'potentiometer-reference',
      'reference-memory',
    ]
    let own: TestApi
    let author: ReturnType<typeof client>
    /** Reference grades the grading pool has run, counted as each task ends. */
    let graded = 0
    beforeAll(async () => {
      const grading = createGradingPool({
        threads: 1,
        onTask: (kind, _seconds, outcome) => {
          if (kind === 'reference' && outcome === 'ok') graded++
        },
      })
      own = await createTestApi({ grading })
      author = client(own, await own.createUser('instructor'))
    })
    afterAll(() => own.close())

    const drafts = () => own.dataSource.getRepository(ScenarioDraftEntity)
    async function listed() {
      const before = graded
      const response = await author.get('/api/scenarios/drafts')
      expect(response.status).toBe(200)
      const { items } = scenarioDraftListSchema.parse(response.body)
      const publishable = Object.fromEntries(items.map((d) => [d.key, d.publishable]))
      return { graded: graded - before, publishable }
    }

    it('grades each draft once, then lists them from the grades kept', async () => {
      for (const key of keys) expect((await author.post(`/api/scenarios/${key}/draft`)).status).toBe(201)
      // Drafts kept before grades were (or whose grade was lost) are graded on the first listing only.
      await drafts().update({ key: In(keys) }, { referenceFingerprint: null, referenceResult: null })
      const first = await listed()
      expect(first.graded).toBe(keys.length)
      expect(first.publishable).toEqual(Object.fromEntries(keys.map((k) => [k, true])))
      const second = await listed()
      expect(second.graded).toBe(0)
      expect(second.publishable).toEqual(first.publishable)
    })

    it('grades again only the draft whose document or solution changed, however it changed', async () => {
      // The solution replaced behind the draft's back (as a pack does): short of full marks now.
      await own.dataSource
        .getRepository(ScenarioReferenceSolutionEntity)
        .update(
          { key: 'potentiometer-reference' },
          { events: JSON.stringify(mistake('potentiometer-reference--mistake-low-end-not-wired')) },
        )
      // A document changed directly: an objective the shipped run does not meet.
      const row = await drafts().findOneByOrFail({ key: 'fan-ramp-or-coast' })
      const document = JSON.parse(row.document)
      const speed = document.objectives.find((o: { kind: string }) => o.kind === 'speedHeld')
      Object.assign(speed, { target: 30, title: 'Fan ran at 30 Hz (within 0.5 Hz) for 10 s' })
      await drafts().update({ key: row.key }, { document: JSON.stringify(document) })

      const after = await listed()
      expect(after.graded).toBe(2)
      expect(after.publishable).toMatchObject({
        'potentiometer-reference': false,
        'fan-ramp-or-coast': false,
        'safe-isolation': true,
      })
      expect((await listed()).graded).toBe(0)
      // A save through the API is graded as it is saved; listing after it grades nothing.
      const saved = await author.put('/api/scenarios/safe-isolation/draft', {
        document: { ...shipped('safe-isolation'), title: 'Safe isolation, night shift' },
      })
      expect(saved.body.publishable).toBe(true)
      expect((await listed()).graded).toBe(0)
    })

    it('publishes only on a fresh grade, never on the grade kept for reading', async () => {
      const key = 'potentiometer-reference'
      const row = await drafts().findOneByOrFail({ key })
      const kept = JSON.parse(row.referenceResult!)
      expect(kept.fullMarks).toBe(false)
      // A kept grade claiming full marks for this very document and run: the list believes it …
      const claimed = { ...kept, fullMarks: true, passed: true, missed: [], score: 100 }
      await drafts().update({ key }, { referenceResult: JSON.stringify(claimed) })
      const list = await listed()
      expect(list.graded).toBe(0)
      expect(list.publishable[key]).toBe(true)
      // … the publish gate does not.
      const before = graded
      const refused = await author.post(`/api/scenarios/${key}/draft/publish`)
      expect(refused.status).toBe(409)
      expect(refused.body.error.code).toBe('reference_not_full')
      expect(graded - before).toBe(1)
      expect(await own.dataSource.getRepository(ScenarioEntity).countBy({ key })).toBe(1)
    })
  })
})
