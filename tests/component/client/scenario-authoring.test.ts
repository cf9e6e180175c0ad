// The authoring screens mounted as an instructor meets them: the draft card and its publish gate, the
// comparison of versions, and what the pack upload says became of each scenario. The server is a fetch
// stub answering in the shapes of shared/api/scenarioAuthoring.ts.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import ScenarioDetailView from '@/views/ScenarioDetailView.vue'
import ScenarioCompareView from '@/views/ScenarioCompareView.vue'
import UploadPackDialog from '@/components/scenarios/UploadPackDialog.vue'
import ScenarioLibraryView from '@/views/ScenarioLibraryView.vue'
import { stubFetch, testPlugins, type StubCall } from './helpers'
import {
  KEY,
  detail,
  documentV,
  draftBody,
  fullMarks,
  notFound,
  versionRow,
} from './scenarioAuthoringFixtures'

async function settle() {
  for (let i = 0; i < 3; i++) {
    await flushPromises()
    await new Promise((r) => setTimeout(r, 0))
  }
}

const path = (call: StubCall) => new URL(call.url, 'http://x').pathname

afterEach(() => {
  vi.unstubAllGlobals()
  document.body.innerHTML = ''
})

async function mountAt(component: object, url: string, routePath: string) {
  const { router, pinia, vuetify } = testPlugins([
    { path: routePath, component },
    // The page links to the panel by name.
    { path: '/simulator/:key/:version', name: 'simulator', component },
  ])
  await router.push(url)
  const wrapper = mount(component, { global: { plugins: [pinia, router, vuetify] }, attachTo: document.body })
  await settle()
  return { wrapper, router }
}

const button = (label: string | RegExp) =>
  [...document.body.querySelectorAll('button')].find((b) =>
    typeof label === 'string' ? b.textContent?.trim() === label : label.test(b.textContent ?? ''),
  )

describe('the draft card on the scenario page', () => {
  it('keeps Publish disabled and says why while the reference solution is missing', async () => {
    stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft')) return { body: draftBody() }
      if (p.endsWith('/versions')) return { body: { items: [versionRow(2), versionRow(1, null)] } }
      return { body: detail(2) }
    })
    const { wrapper } = await mountAt(ScenarioDetailView, `/scenarios/${KEY}`, '/scenarios/:id')
    const card = wrapper.get('[data-testid="draft-card"]')
    expect(card.text()).toContain('Draft of version 2, last saved')
    expect(card.text()).toContain('by Tamsin Hale')
    expect(card.text()).toContain('Passes every check')
    expect(card.get('[data-testid="draft-reference"]').text()).toBe('None recorded yet')
    const publish = card.get('[data-testid="draft-publish"]')
    expect(publish.text()).toContain('Publish as version 3')
    expect(publish.attributes('disabled')).toBeDefined()
    expect(card.get('[data-testid="publish-reason"]').text()).toContain('Record the reference solution first')
    // The versions list says how each version's reference solution fared, and which one is current.
    const versions = wrapper.get('[data-testid="versions"]').text()
    expect(versions).toContain('Version 2 (current)')
    expect(versions).toContain('Reference solution: full marks')
    expect(versions).toContain('No reference solution')
    // Two ways onto the panel, told apart: the published version and the draft.
    const tries = [...document.body.querySelectorAll('a, button')]
      .map((e) => e.textContent?.trim() ?? '')
      .filter((label) => label.startsWith('Try'))
    expect(tries.sort()).toEqual(['Try the draft', 'Try version 2'])
  })

  it('lists the draft’s problems and a reference solution that misses an objective', async () => {
    const missed = {
      ...fullMarks,
      fullMarks: false,
      score: 80,
      pointsEarned: 80,
      missed: ['Fan ran at speed'],
    }
    stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft'))
        return {
          body: draftBody({
            problems: [
              { path: '$.hints[0].cost', place: 'Hint 1 (Start at the source)', message: 'Enter a number' },
            ],
            reference: {
              recordedAt: '2026-12-02T15:00:00.000Z',
              recordedByName: 'Tamsin Hale',
              actions: 14,
              durationMs: 125000,
              result: missed,
            },
          }),
        }
      if (p.endsWith('/versions')) return { body: { items: [versionRow(2)] } }
      return { body: detail(2) }
    })
    const { wrapper } = await mountAt(ScenarioDetailView, `/scenarios/${KEY}`, '/scenarios/:id')
    const card = wrapper.get('[data-testid="draft-card"]')
    expect(card.get('[data-testid="draft-problems"]').text()).toContain(
      'Hint 1 (Start at the source): Enter a number',
    )
    expect(card.get('[data-testid="draft-reference"]').text()).toMatch(
      /^Recorded .* by Tamsin Hale .*misses 1 objective: Fan ran at speed/,
    )
    expect(card.text()).not.toContain('$.')
    expect(card.get('[data-testid="publish-reason"]').text()).toContain('1 problem')
  })

  it('publishes a ready draft, says so and reloads the page', async () => {
    let published = false
    const calls = stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft/publish')) {
        published = true
        return { body: detail(3) }
      }
      if (p.endsWith('/draft'))
        return published
          ? notFound
          : {
              body: draftBody({
                publishable: true,
                reference: {
                  recordedAt: '2026-12-02T15:00:00.000Z',
                  recordedByName: null,
                  actions: 9,
                  durationMs: 60000,
                  result: fullMarks,
                },
              }),
            }
      if (p.endsWith('/versions'))
        return { body: { items: published ? [versionRow(3), versionRow(2)] : [versionRow(2)] } }
      return { body: detail(published ? 3 : 2) }
    })
    const { wrapper } = await mountAt(ScenarioDetailView, `/scenarios/${KEY}`, '/scenarios/:id')
    expect(wrapper.find('[data-testid="publish-reason"]').exists()).toBe(false)
    expect(wrapper.get('[data-testid="draft-reference"]').text()).toContain('full marks')
    await wrapper.get('[data-testid="draft-publish"]').trigger('click')
    await settle()
    expect(calls.some((c) => c.method === 'POST' && path(c).endsWith('/draft/publish'))).toBe(true)
    expect(wrapper.find('[data-testid="draft-card"]').exists()).toBe(false)
    expect(wrapper.text()).toContain('Version 3 (current)')
    const { useNotify } = await import('@/composables/useNotify')
    expect(useNotify().queue.value.map((n) => n.text)).toContain('Published as version 3')
  })

  it('shows the server’s words when a publish is refused', async () => {
    stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft/publish'))
        return {
          status: 409,
          body: {
            error: {
              code: 'draft_not_publishable',
              message: 'The reference solution no longer scores full marks.',
            },
          },
        }
      if (p.endsWith('/draft')) return { body: draftBody({ publishable: true }) }
      if (p.endsWith('/versions')) return { body: { items: [versionRow(2)] } }
      return { body: detail(2) }
    })
    const { wrapper } = await mountAt(ScenarioDetailView, `/scenarios/${KEY}`, '/scenarios/:id')
    await wrapper.get('[data-testid="draft-publish"]').trigger('click')
    await settle()
    expect(wrapper.get('[data-testid="draft-card"] [role="alert"]').text()).toContain(
      'The reference solution no longer scores full marks.',
    )
  })

  it('asks before discarding, and discards only when confirmed', async () => {
    const calls = stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft')) return call.method === 'DELETE' ? { status: 204 } : { body: draftBody() }
      if (p.endsWith('/versions')) return { body: { items: [versionRow(2)] } }
      return { body: detail(2) }
    })
    await mountAt(ScenarioDetailView, `/scenarios/${KEY}`, '/scenarios/:id')
    button('Discard draft')!.click()
    await settle()
    expect(document.body.textContent).toContain('Discard this draft?')
    expect(calls.some((c) => c.method === 'DELETE')).toBe(false)
    const confirm = [
      ...document.body.querySelectorAll('[role="alertdialog"] button, .v-overlay button'),
    ].find((b) => b.textContent?.trim() === 'Discard draft' && b.closest('.v-overlay')) as HTMLButtonElement
    confirm.click()
    await settle()
    expect(calls.filter((c) => c.method === 'DELETE').map(path)).toEqual([`/api/scenarios/${KEY}/draft`])
  })

  it('shows a key with only a draft from the draft’s own document', async () => {
    stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft'))
        return {
          body: draftBody({
            baseVersion: null,
            nextVersion: 1,
            title: 'Night-shift pump',
            document: { story: 'The pump at the far tank would not start after the storm.' },
          }),
        }
      return notFound
    })
    const { wrapper } = await mountAt(ScenarioDetailView, `/scenarios/${KEY}`, '/scenarios/:id')
    expect(wrapper.text()).toContain('Night-shift pump')
    expect(wrapper.text()).toContain('Not published yet')
    expect(wrapper.text()).toContain('The pump at the far tank would not start after the storm.')
    expect(wrapper.get('[data-testid="draft-status"]').text()).toContain('never published')
    expect(wrapper.get('[data-testid="draft-publish"]').text()).toContain('Publish as version 1')
    expect(wrapper.find('[role="alert"]').exists()).toBe(false)
  })
})

describe('editing and the library', () => {
  it('starts a draft when Edit is pressed on a scenario without one, then opens the editor', async () => {
    let started = false
    const calls = stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft')) {
        if (call.method === 'POST') started = true
        return started ? { body: draftBody() } : notFound
      }
      if (p.endsWith('/versions')) return { body: { items: [versionRow(2)] } }
      return { body: detail(2) }
    })
    const { router } = await mountAt(ScenarioDetailView, `/scenarios/${KEY}`, '/scenarios/:id')
    expect(document.body.querySelector('[data-testid="draft-card"]')).toBeNull()
    button('Edit')!.click()
    await settle()
    expect(calls.filter((c) => c.method === 'POST').map(path)).toEqual([`/api/scenarios/${KEY}/draft`])
    expect(router.currentRoute.value.fullPath).toBe(`/scenarios/${KEY}/edit`)
  })

  it('lists drafts of keys never published, and exports the scenarios ticked', async () => {
    const summary = (d: ReturnType<typeof draftBody>) => ({
      key: d.key,
      title: d.title,
      baseVersion: d.baseVersion,
      nextVersion: d.nextVersion,
      updatedAt: d.updatedAt,
      updatedByName: d.updatedByName,
      publishable: d.publishable,
    })
    const calls = stubFetch((call) => {
      const p = path(call)
      if (p === '/api/scenarios/drafts')
        return {
          body: {
            items: [
              summary(
                draftBody({
                  key: 'night-shift-pump',
                  title: 'Night-shift pump',
                  baseVersion: null,
                  nextVersion: 1,
                }),
              ),
              summary(draftBody()),
            ],
          },
        }
      if (p === '/api/scenarios/export') return { body: { format: 'slipway-scenario-pack' } }
      return { body: { items: [{ ...versionRow(2), origin: 'shipped', learningOutcomes: [] }] } }
    })
    // The download itself needs a browser; the request is what is checked here.
    URL.createObjectURL = vi.fn(() => 'blob:pack')
    URL.revokeObjectURL = vi.fn()
    const { wrapper } = await mountAt(ScenarioLibraryView, '/scenarios', '/scenarios')
    const drafts = wrapper.get('[data-testid="library-drafts"]')
    expect(drafts.text()).toContain('Night-shift pump')
    expect(drafts.findAll('a')).toHaveLength(1)
    expect(drafts.get('a').attributes('href')).toBe('/scenarios/night-shift-pump')
    expect(wrapper.text()).toContain('Draft in progress')
    button('Export a pack')!.click()
    await settle()
    expect(wrapper.get('[data-testid="export-download"]').attributes('disabled')).toBeDefined()
    await wrapper.get('[data-testid="export-choice"] input').setValue(true)
    await wrapper.get('[data-testid="export-download"]').trigger('click')
    await settle()
    const exported = calls.find((c) => path(c) === '/api/scenarios/export')
    expect(new URL(exported!.url, 'http://x').searchParams.get('keys')).toBe(KEY)
  })
})

describe('the comparison of versions', () => {
  function stubVersions(second: Record<string, unknown>) {
    return stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft')) return notFound
      if (p.endsWith('/versions')) return { body: { items: [versionRow(2), versionRow(1)] } }
      if (p.endsWith('/versions/1')) return { body: { ...detail(1), document: documentV(1) } }
      return { body: { ...detail(2), document: second } }
    })
  }

  it('lists the changes grouped by section, in words', async () => {
    const changed = documentV(2)
    changed.title = 'The fan that would not start'
    changed.hints = changed.hints.slice(1)
    stubVersions(changed)
    const { wrapper } = await mountAt(
      ScenarioCompareView,
      `/scenarios/${KEY}/compare?from=1&to=2`,
      '/scenarios/:id/compare',
    )
    const sections = wrapper.findAll('[data-testid="compare-section"]').map((s) => s.find('h2').text())
    expect(sections).toEqual(['The exercise', 'Hints'])
    expect(wrapper.text()).toContain('Title: “')
    expect(wrapper.text()).toContain('→ “The fan that would not start”')
    expect(wrapper.text()).toContain('Hint removed: “Start at the source')
    expect(wrapper.text()).toContain('2 changes from version 1 to version 2')
  })

  it('says when two versions do not differ', async () => {
    stubVersions(documentV(2))
    const { wrapper } = await mountAt(
      ScenarioCompareView,
      `/scenarios/${KEY}/compare?from=1&to=2`,
      '/scenarios/:id/compare',
    )
    expect(wrapper.text()).toContain('No differences')
    expect(wrapper.findAll('[data-testid="compare-section"]')).toHaveLength(0)
  })

  it('shows an error with a retry when a version cannot be read', async () => {
    stubFetch((call) => {
      const p = path(call)
      if (p.endsWith('/draft')) return notFound
      if (p.endsWith('/versions')) return { body: { items: [versionRow(1)] } }
      return { status: 500, body: { error: { code: 'server_error', message: 'The server had a problem.' } } }
    })
    const { wrapper } = await mountAt(
      ScenarioCompareView,
      `/scenarios/${KEY}/compare?from=1&to=2`,
      '/scenarios/:id/compare',
    )
    expect(wrapper.get('[role="alert"]').text()).toContain('The server had a problem.')
  })
})

describe('the pack upload dialog', () => {
  async function uploadWith(respond: Parameters<typeof stubFetch>[0]) {
    const calls = stubFetch(respond)
    const { pinia, router, vuetify } = testPlugins()
    const wrapper = mount(UploadPackDialog, {
      props: { modelValue: true },
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
    await settle()
    const input = document.body.querySelector('input[type="file"]') as HTMLInputElement
    const file = new File(['{}'], 'pack.json', { type: 'application/json' })
    Object.defineProperty(input, 'files', { value: [file] })
    input.dispatchEvent(new Event('change'))
    await settle()
    button('Upload')!.click()
    await settle()
    return { wrapper, calls }
  }

  it('says what became of each scenario of the pack', async () => {
    const { calls } = await uploadWith(() => ({
      body: {
        items: [
          {
            key: 'night-pump',
            title: 'Night-shift pump',
            outcome: 'published',
            version: 3,
            scenarioId: '8f3a4b52-6c7d-4e8f-a091-a2b3c4d5e6f3',
            reference: fullMarks,
            draftNote: 'A draft of this scenario was in progress; it is kept and now builds on version 3.',
          },
          {
            key: 'fan-coast',
            title: 'Fan coasts to a stop',
            outcome: 'draft',
            version: null,
            scenarioId: null,
            reference: null,
            draftNote: null,
          },
        ],
      },
    }))
    expect(calls.map((c) => c.method + ' ' + path(c))).toEqual(['POST /api/scenarios/upload'])
    const results = document.body.querySelector('[data-testid="pack-results"]')!.textContent ?? ''
    expect(results).toContain('Night-shift pump')
    expect(results).toContain('Published as version 3 (reference solution: full marks)')
    expect(results).toContain('Fan coasts to a stop')
    expect(results).toContain('Kept as a draft: it has no reference solution')
    // What became of a draft already in progress is said under its scenario, and only there.
    const notes = [...document.body.querySelectorAll('[data-testid="pack-draft-note"]')].map(
      (n) => n.textContent,
    )
    expect(notes).toEqual([
      'A draft of this scenario was in progress; it is kept and now builds on version 3.',
    ])
    expect(button('Done')).toBeTruthy()
  })

  it('places a refusal in words, never the path the server reports', async () => {
    await uploadWith(() => ({
      status: 400,
      body: {
        error: {
          code: 'validation_failed',
          message: 'The pack does not match the scenario format.',
          details: {
            issues: [
              {
                path: ['scenarios', 1, 'document', 'objectives', 2, 'title'],
                message: 'Write at least 3 characters',
              },
            ],
          },
        },
      },
    }))
    const problems = document.body.querySelector('[data-testid="pack-problems"]')!.textContent ?? ''
    expect(problems).toContain('Scenario 2: Objective 3')
    expect(problems).toContain('Write at least 3 characters')
    expect(problems).not.toMatch(/scenarios\.1|document\.objectives/)
    expect(document.body.textContent).toContain('The pack does not match the scenario format.')
  })
})
