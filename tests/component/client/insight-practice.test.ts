// Class insight, the practice policy and the library's filters on the client: what is shown in words, and
// what a switch sends.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import type { AssignmentInsight, CohortPractice, ScenarioLibraryItem } from '@shared/api'
import CohortPracticePanel from '@/components/practice/CohortPracticePanel.vue'
import AssignmentInsightCard from '@/components/insight/AssignmentInsightCard.vue'
import { filterLibrary, noLibraryFilters, outcomeChoices } from '@/components/scenarios/libraryFilters'
import { ids, stubFetch, testPlugins } from './helpers'

async function settle() {
  for (let i = 0; i < 3; i++) {
    await flushPromises()
    await new Promise((r) => setTimeout(r, 0))
  }
}

const item = (over: Partial<ScenarioLibraryItem>): ScenarioLibraryItem => ({
  id: ids.scenario,
  key: 'safe-isolation',
  version: 1,
  title: 'Safe isolation',
  story: 'A conveyor drive to make safe.',
  difficulty: 'introductory',
  estimatedMinutes: 10,
  status: 'active',
  createdById: null,
  createdAt: '2026-09-01T08:00:00.000Z',
  origin: 'shipped',
  learningOutcomes: ['Prove absence of voltage'],
  ...over,
})

describe('the library filters', () => {
  const items = [
    item({}),
    item({
      key: 'kiln-fan',
      title: 'Kiln fan ramp',
      difficulty: 'advanced',
      origin: 'centre',
      learningOutcomes: ['Choose a stop method', 'Prove absence of voltage'],
    }),
  ]

  it('filters by difficulty, outcome and whose, together with the words', () => {
    const f = noLibraryFilters()
    expect(filterLibrary(items, f)).toHaveLength(2)
    expect(filterLibrary(items, { ...f, difficulty: 'advanced' }).map((s) => s.key)).toEqual(['kiln-fan'])
    expect(filterLibrary(items, { ...f, origin: 'shipped' }).map((s) => s.key)).toEqual(['safe-isolation'])
    expect(filterLibrary(items, { ...f, outcome: 'Prove absence of voltage' })).toHaveLength(2)
    expect(filterLibrary(items, { ...f, outcome: 'Choose a stop method', q: 'isolation' })).toHaveLength(0)
  })

  it('offers each learning outcome once, in order', () => {
    expect(outcomeChoices(items)).toEqual(['Choose a stop method', 'Prove absence of voltage'])
  })
})

describe('the cohort’s practice panel', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  const page = (policy: CohortPractice['policy']): CohortPractice => ({
    cohortId: ids.cohort,
    policy,
    scenarios: [
      {
        key: 'safe-isolation',
        title: 'Safe isolation',
        difficulty: 'introductory',
        open: true,
        attempts: 3,
        apprentices: 2,
      },
      {
        key: 'kiln-fan',
        title: 'Kiln fan ramp',
        difficulty: 'advanced',
        open: true,
        attempts: 0,
        apprentices: 0,
      },
    ],
    apprentices: [
      {
        userId: ids.user,
        name: 'Wren Maddox',
        attempts: 3,
        submitted: 2,
        passed: 1,
        lastAt: '2026-11-30T09:00:00.000Z',
      },
    ],
  })

  it('closes one scenario by sending the others as the open ones, and shows the practice counts', async () => {
    const calls = stubFetch((call) =>
      call.method === 'PUT'
        ? {
            body: {
              ...page({ mode: 'chosen', keys: ['kiln-fan'] }),
              scenarios: page({ mode: 'all' }).scenarios.map((s) => ({ ...s, open: s.key === 'kiln-fan' })),
            },
          }
        : { body: page({ mode: 'all' }) },
    )
    const { pinia, router, vuetify } = testPlugins()
    mount(CohortPracticePanel, {
      props: { cohortId: ids.cohort },
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
    await settle()
    expect(document.body.textContent).toContain('Every scenario is open')
    expect(document.body.textContent).toContain('by 2 apprentices')
    expect(document.body.textContent).toContain('Wren Maddox')
    const toggle = document.body.querySelector<HTMLInputElement>(
      'input[aria-label="Safe isolation: open for practice"]',
    )!
    toggle.click()
    await settle()
    const put = calls.find((c) => c.method === 'PUT')!
    expect(put.url).toContain(`/cohorts/${ids.cohort}/practice`)
    expect(put.body).toEqual({ mode: 'chosen', keys: ['kiln-fan'] })
    expect(document.body.textContent).toContain('1 of 2 scenarios are open')
  })
})

describe('the assignment’s insight card', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('says in words what the class missed, how it got to a pass and what unsafe work it did', async () => {
    const insight: AssignmentInsight = {
      assignmentId: ids.assignment,
      title: 'Safe isolation',
      apprentices: 4,
      submittedAttempts: 5,
      objectives: [
        {
          title: 'Absence of voltage proved',
          required: true,
          graded: 5,
          missed: 3,
          missRate: 0.6,
          notMetBy: 1,
        },
        { title: 'Ramp time set', required: false, graded: 5, missed: 0, missRate: 0, notMetBy: 0 },
      ],
      safety: [{ label: 'Work before proving dead', violations: 2, attempts: 2, apprentices: 2 }],
      unsafeAttempts: 2,
      toPass: {
        passed: 2,
        notYet: 1,
        notAttempted: 1,
        medianAttempts: 1.5,
        medianMinutes: 22.5,
        byAttempts: [
          { label: '1st', apprentices: 1 },
          { label: '2nd', apprentices: 1 },
          { label: '3rd', apprentices: 0 },
          { label: '4th', apprentices: 0 },
          { label: '5th or later', apprentices: 0 },
        ],
      },
    }
    stubFetch(() => ({ body: insight }))
    const { pinia, router, vuetify } = testPlugins()
    mount(AssignmentInsightCard, {
      props: { assignmentId: ids.assignment, title: 'Safe isolation' },
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
    await settle()
    const text = document.body.textContent ?? ''
    expect(text).toContain('missed in 3 of 5 attempts (60 %) · not met yet by 1 apprentice')
    expect(text).toContain('met by everyone who tried')
    expect(text).toContain('typically at attempt 1.5, after 23 min at the bench')
    expect(text).toContain('Work before proving dead: 2 times in 2 attempts, by 2 apprentices')
    expect(text).not.toMatch(/workWith|missRate|notMetBy/)
  })
})
