// The data stores: the right requests, replies checked by the shared schemas, races settled.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { useGradebookStore } from '@/stores/gradebook'
import { useCohortsStore } from '@/stores/cohorts'
import { useAssignmentsStore } from '@/stores/assignments'
import { ids, stubFetch } from './helpers'

const gradebookReply = (name: string) => ({
  cohortId: ids.cohort,
  assignments: [],
  rows: [
    {
      userId: ids.user,
      name,
      email: 'x@bench.example',
      average: null,
      completion: { passed: 0, assigned: 0 },
      lastActivity: null,
      cells: [],
    },
  ],
  total: 1,
  page: 1,
  pageSize: 10,
})

describe('the data stores', () => {
  beforeEach(() => setActivePinia(createPinia()))
  afterEach(() => vi.unstubAllGlobals())

  it('keeps the newest gradebook when an older reply arrives late', async () => {
    const releases: (() => void)[] = []
    stubFetch(
      (call) =>
        new Promise((resolve) => {
          const name = call.url.includes('q=first') ? 'First query' : 'Second query'
          releases.push(() => resolve({ body: gradebookReply(name) }))
        }),
    )
    const gradebook = useGradebookStore()
    const first = gradebook.load(ids.cohort, { q: 'first' })
    const second = gradebook.load(ids.cohort, { q: 'second' })
    await vi.waitFor(() => expect(releases).toHaveLength(2))
    releases[1]()
    await second
    releases[0]()
    await first
    expect(gradebook.data?.rows[0].name).toBe('Second query')
    expect(gradebook.loading).toBe(false)
  })

  it('keeps a failed gradebook load as an error to show, not an exception', async () => {
    stubFetch(() => ({ status: 403, body: { error: { code: 'forbidden', message: 'Not your cohort' } } }))
    const gradebook = useGradebookStore()
    await gradebook.load(ids.cohort, {})
    expect(gradebook.error).toMatchObject({ code: 'forbidden', message: 'Not your cohort' })
  })

  it('uploads a roster as multipart form data in the field the server reads', async () => {
    const calls = stubFetch(() => ({ status: 201, body: { items: [] } }))
    const cohorts = useCohortsStore()
    await cohorts.uploadRoster(ids.cohort, new File(['name,email\n'], 'roster.csv', { type: 'text/csv' }))
    expect(calls[0].url).toBe(`/api/cohorts/${ids.cohort}/invitations/roster?rows=all`)
    expect(calls[0].body).toBeInstanceOf(FormData)
    expect((calls[0].body as FormData).get('roster')).toBeInstanceOf(File)
    // After the preview, the valid rows alone.
    await cohorts.uploadRoster(ids.cohort, new File(['name,email\n'], 'roster.csv'), 'valid')
    expect(calls[1].url).toBe(`/api/cohorts/${ids.cohort}/invitations/roster?rows=valid`)
  })

  it('creates an assignment under its cohort', async () => {
    const assignment = {
      id: ids.assignment,
      cohortId: ids.cohort,
      cohortName: 'Autumn intake',
      scenarioId: ids.scenario,
      scenarioKey: 'safe-isolation',
      scenarioTitle: 'Safe isolation of a conveyor drive',
      scenarioVersion: 1,
      title: 'Safe isolation',
      opensAt: '2026-12-01T09:00:00.000Z',
      dueAt: '2026-12-08T17:00:00.000Z',
      attemptLimit: 3,
      assistanceLevel: 'standard' as const,
      hintsAllowed: true,
      scorePolicy: 'best' as const,
      latePolicy: 'acceptLate',
      latePenalty: 0,
      targeted: false,
      createdAt: '2026-12-01T09:00:00.000Z',
      myProgress: null,
    }
    const calls = stubFetch(() => ({ status: 201, body: assignment }))
    const created = await useAssignmentsStore().create(ids.cohort, {
      scenarioId: ids.scenario,
      opensAt: assignment.opensAt,
      dueAt: assignment.dueAt,
      attemptLimit: 3,
      hintsAllowed: true,
      scorePolicy: 'best',
    })
    expect(calls[0]).toMatchObject({ url: `/api/cohorts/${ids.cohort}/assignments`, method: 'POST' })
    expect(created.title).toBe('Safe isolation')
  })

  it('refuses a cohort list that does not match the shared schema', async () => {
    stubFetch(() => ({ body: { items: [{ id: 'not-a-uuid' }] } }))
    const cohorts = useCohortsStore()
    await cohorts.load()
    expect(cohorts.error).toMatchObject({ code: 'bad_response' })
    expect(cohorts.items).toEqual([])
  })
})
