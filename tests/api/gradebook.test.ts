// Gradebook: apprentices × assignments with best score, attempts, last activity and status; server-side
// paging, sorting and filtering; a CSV export with formula cells neutralised; per-assignment statistics.
import { parse } from 'csv-parse/sync'
import { mean, median } from 'mathjs'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assignmentStatsSchema, gradebookSchema, type Assignment, type Cohort } from '../../shared/api'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createAssignment, createCohort, submit } from '../support/world'

describe('gradebook', () => {
  let api: TestApi
  let instructor: TestUser
  let people: TestUser[]
  let cohort: Cohort
  let first: Assignment
  let second: Assignment
  // Final scores set by override so the expected numbers are known: [person, assignment, score, passed].
  const plan: [number, 'first' | 'second', number, boolean][] = [
    [0, 'first', 90, true],
    [0, 'first', 70, false], // a worse second attempt: best stays 90
    [1, 'first', 40, false],
    [2, 'first', 65, true],
    [3, 'second', 100, true],
  ]

  beforeAll(async () => {
    api = await createTestApi()
    instructor = await api.createUser('instructor')
    people = [
      await api.createUser('apprentice', { name: 'Carys Abernethy' }),
      await api.createUser('apprentice', { name: 'Bartholomew Yelland' }),
      await api.createUser('apprentice', { name: 'Aino Sturrock' }),
      await api.createUser('apprentice', { name: '=HYPERLINK("http://evil.test","click")' }),
      await api.createUser('apprentice', { name: 'Dov Nuttall' }),
    ]
    cohort = await createCohort(api, instructor, 'Gradebook cohort', people)
    const scenarios = (await supertest(api.app).get('/api/scenarios').set(bearer(instructor.token))).body
      .items
    const scenarioId = scenarios.find((s: { key: string }) => s.key === 'two-wire-run-stop').id
    first = await createAssignment(api, instructor, cohort, scenarioId, { title: 'First job' })
    second = await createAssignment(api, instructor, cohort, scenarioId, {
      title: 'Second job',
      dueAt: new Date(Date.now() + 14 * 86_400_000).toISOString(),
    })
    for (const [who, which, score, passed] of plan) {
      const assignmentId = (which === 'first' ? first : second).id
      const attempt = await submit(api, people[who]!, { assignmentId })
      await supertest(api.app)
        .post(`/api/attempts/${attempt.body.id}/grade-override`)
        .set(bearer(instructor.token))
        .send({ score, passed, reason: 'Test plan score' })
    }
    // Dov only saves progress on the second job.
    await submit(api, people[4]!, { assignmentId: second.id, status: 'inProgress' })
  })
  afterAll(() => api.close())

  const gradebook = (query = '') =>
    supertest(api.app).get(`/api/cohorts/${cohort.id}/gradebook${query}`).set(bearer(instructor.token))

  it('shows best score, attempt count and status for each apprentice and assignment', async () => {
    const response = await gradebook()
    expect(response.status).toBe(200)
    const book = gradebookSchema.parse(response.body)
    expect(book.assignments.map((a) => a.title)).toEqual(['First job', 'Second job'])
    const carys = book.rows.find((r) => r.name === 'Carys Abernethy')!
    expect(carys.cells[0]).toMatchObject({ bestScore: 90, attempts: 2, status: 'passed' })
    expect(carys.cells[1]).toMatchObject({ bestScore: null, attempts: 0, status: 'notStarted' })
    expect(book.rows.find((r) => r.name === 'Dov Nuttall')!.cells[1]!.status).toBe('inProgress')
    expect(book.rows.find((r) => r.name === 'Bartholomew Yelland')!.cells[0]!.status).toBe('failed')
  })

  it('pages on the server', async () => {
    const page1 = gradebookSchema.parse((await gradebook('?pageSize=2&page=1')).body)
    const page3 = gradebookSchema.parse((await gradebook('?pageSize=2&page=3')).body)
    expect(page1.total).toBe(5)
    expect(page1.rows).toHaveLength(2)
    expect(page3.rows).toHaveLength(1)
  })

  it('sorts by name, and by average with empty values last', async () => {
    const byName = gradebookSchema.parse((await gradebook('?sort=name')).body).rows.map((r) => r.name)
    expect(byName).toEqual([...byName].sort((a, b) => a.localeCompare(b)))
    const byAverage = gradebookSchema.parse((await gradebook('?sort=average&order=desc')).body).rows
    expect(byAverage.map((r) => r.average)).toEqual([100, 90, 65, 40, null])
  })

  it('filters by name and by status in one column', async () => {
    const named = gradebookSchema.parse((await gradebook('?q=yell')).body)
    expect(named.rows.map((r) => r.name)).toEqual(['Bartholomew Yelland'])
    const passedFirst = gradebookSchema.parse(
      (await gradebook(`?status=passed&assignmentId=${first.id}`)).body,
    )
    expect(passedFirst.rows.map((r) => r.name).sort()).toEqual(['Aino Sturrock', 'Carys Abernethy'])
  })

  it('rejects an unknown sort column with a field error', async () => {
    const response = await gradebook('?sort=password')
    expect(response.status).toBe(400)
    expect(response.body.error.details.fields).toHaveProperty('sort')
  })

  it('exports the same rows as CSV, neutralising a cell that a spreadsheet would run as a formula', async () => {
    const response = await supertest(api.app)
      .get(`/api/cohorts/${cohort.id}/gradebook.csv?sort=name`)
      .set(bearer(instructor.token))
    expect(response.status).toBe(200)
    expect(response.headers['content-type']).toMatch(/^text\/csv/)
    expect(response.headers['content-disposition']).toMatch(
      /^attachment; filename="gradebook-Gradebook-cohort-\d{4}-\d{2}-\d{2}\.csv"$/,
    )
    const records: string[][] = parse(response.text.replace(/^\uFEFF/, ''))
    expect(records[0]!.slice(0, 4)).toEqual(['Name', 'E-mail', 'Passed', 'Set'])
    expect(records[0]![4]).toMatch(/^Average \(.*missed work counts 0/)
    expect(records[0]![6]).toMatch(/^First job: status \(due .*pass mark \d+/)
    expect(records).toHaveLength(6)
    const formula = records.find((r) => r[0]!.includes('HYPERLINK'))!
    expect(formula[0]).toBe(`'=HYPERLINK("http://evil.test","click")`)
    const carys = records.find((r) => r[0] === 'Carys Abernethy')!
    // Passed 1 of 2 set; average over graded work only (nothing is past due yet).
    expect(carys.slice(2, 5)).toEqual(['1', '2', '90.0'])
    expect(carys.slice(6, 9)).toEqual(['Passed', '90.0', '2'])
  })

  it('gives per-assignment statistics of best scores that agree with mathjs', async () => {
    const response = await supertest(api.app)
      .get(`/api/assignments/${first.id}/stats`)
      .set(bearer(instructor.token))
    expect(response.status).toBe(200)
    const stats = assignmentStatsSchema.parse(response.body)
    const best = [90, 40, 65] // Carys's best, Bartholomew, Aino
    expect(stats).toMatchObject({ apprentices: 5, attempted: 3, passRate: 2 / 3 })
    // Reference values from mathjs (a general-purpose library the project did not write).
    expect(stats.mean).toBeCloseTo(Number(mean(best)), 10)
    expect(stats.median).toBe(Number(median(best)))
    expect(stats.histogram).toHaveLength(10)
    expect(stats.histogram.find((b) => b.from === 90)!.count).toBe(1)
    expect(stats.histogram.find((b) => b.from === 40)!.count).toBe(1)
    expect(stats.histogram.find((b) => b.from === 60)!.count).toBe(1)
    expect(stats.histogram.reduce((n, b) => n + b.count, 0)).toBe(3)
  })

  it('is not open to apprentices or other instructors', async () => {
    const other = await api.createUser('instructor')
    expect(
      (await supertest(api.app).get(`/api/cohorts/${cohort.id}/gradebook`).set(bearer(other.token))).status,
    ).toBe(403)
    expect(
      (await supertest(api.app).get(`/api/cohorts/${cohort.id}/gradebook`).set(bearer(people[0]!.token)))
        .status,
    ).toBe(403)
  })
})
