// The commissioning record of every fixture reference attempt (and one unsafe attempt), read back from
// the PDF: every changed setting with its value, every wire number, every objective with its points and
// the score as the grader gave them, unsafe acts, the review, dates in the centre's time zone.
import { beforeAll, describe, expect, it } from 'vitest'
import { SETTINGS } from '@shared/model'
import { grade, type GradeResult, type Scenario } from '@shared/scenario'
import {
  buildCommissioningView,
  commissioningRecordPdf,
  type CommissioningRecordInput,
  type CommissioningRecordView,
} from '../../../server/records'
import {
  attemptFixtures,
  endState,
  referenceFixtures,
  scenarioById,
  type AttemptFixture,
} from '../../support/shipped-attempts'
import { readPdf, type PdfContent } from './pdfText'

const CENTRE = { name: 'Kestrel Vale Electrical Training Centre', timeZone: 'Europe/London' }

function input(scenario: Scenario, fixture: AttemptFixture, result: GradeResult): CommissioningRecordInput {
  return {
    centre: CENTRE,
    scenario,
    events: fixture.events,
    grade: result,
    apprentice: { name: 'Ravi Lindqvist' },
    instructor: { name: 'Idris Penhallow' },
    attempt: {
      label: 'Attempt 2',
      startedAt: '2026-03-12T09:05:00Z',
      submittedAt: '2026-03-12T09:48:00Z',
      assistance: 'assessment',
    },
    review: {
      feedback: [{ author: 'Idris Penhallow', at: '2026-03-13T08:30:00Z', body: 'Clean proving sequence.' }],
      override: null,
    },
    generatedAt: '2026-03-14T10:00:00Z',
  }
}

interface Made {
  fixture: AttemptFixture
  scenario: Scenario
  result: GradeResult
  view: CommissioningRecordView
  pdf: PdfContent
}

async function make(
  fixture: AttemptFixture,
  edit: (i: CommissioningRecordInput) => void = () => {},
): Promise<Made> {
  const scenario = scenarioById(fixture.scenario)
  const result = grade(scenario, fixture.events)
  const recordInput = input(scenario, fixture, result)
  edit(recordInput)
  const view = buildCommissioningView(recordInput)
  const pdf = await readPdf(await commissioningRecordPdf(view))
  return { fixture, scenario, result, view, pdf }
}

/** `parts` appear in the text in this order. */
function inOrder(text: string, parts: string[]): boolean {
  let at = 0
  for (const part of parts) {
    const found = text.indexOf(part, at)
    if (found < 0) return false
    at = found + part.length
  }
  return true
}

const references = referenceFixtures()
const made = new Map<string, Made>()

beforeAll(async () => {
  for (const fixture of references) made.set(fixture.scenario, await make(fixture))
}, 180_000)

describe.each(references.map((f) => [f.scenario] as const))(
  'commissioning record of the %s reference attempt',
  (id) => {
    it('lists every changed setting with its catalogue label and value', () => {
      const { view, pdf } = made.get(id)!
      const changed = view.settings.filter((s) => s.changedFromDefault || s.changedInAttempt)
      expect(changed.length).toBeGreaterThan(0)
      for (const s of changed) expect(pdf.text, s.label).toContain(`${s.label} ${s.value}`)
      // Every setting of the catalogue is on the sheet, changed or not.
      expect(view.settings).toHaveLength(SETTINGS.length)
      for (const def of SETTINGS) expect(pdf.text).toContain(def.label)
    })

    it('shows every wire of the final wiring by its number, in the schematic and the wire list', () => {
      const { fixture, scenario, view, pdf } = made.get(id)!
      const wires = endState(scenario, fixture.events).wires
      expect(view.wires).toHaveLength(wires.length)
      for (const w of view.wires) {
        const marker = `${w.number} ${w.colour.split(' ')[0]}`
        // Once on the drawing's marker, once at the start of the wire list row.
        expect(pdf.text.split(marker).length - 1, marker).toBeGreaterThanOrEqual(2)
        expect(pdf.text).toContain(`${w.number} ${w.colour} ${w.from} ${w.to}`)
      }
    })

    it('draws the schematic and the trend as vectors, not pictures', () => {
      expect(made.get(id)!.pdf.rasterImages).toBe(0)
    })

    it('gives every objective with its result and points, and the score, as graded', () => {
      const { result, pdf } = made.get(id)!
      for (const o of result.objectives) {
        expect(
          inOrder(pdf.text, [o.title, o.met ? 'Met' : 'Missed', `${o.pointsEarned} / ${o.pointsPossible}`]),
          o.title,
        ).toBe(true)
      }
      expect(pdf.text).toContain(`Points: ${result.points.earned} earned of ${result.points.possible}`)
      expect(pdf.text).toContain(`Score ${result.score} %, ${result.passed ? 'passed' : 'not passed'}`)
      expect(result.score).toBe(100)
    })

    it('names the people, the exercise and the assistance level, with dates in the centre’s time zone', () => {
      const { scenario, pdf } = made.get(id)!
      expect(pdf.text).toContain(scenario.title)
      expect(pdf.text).toContain(scenario.site.name)
      expect(pdf.text).toContain('Ravi Lindqvist')
      expect(pdf.text).toContain('Assistance level')
      expect(pdf.text).toContain('Assessment')
      // 09:48 UTC on 12 March 2026 is 09:48 GMT in London (summer time starts on 29 March; IANA tz database).
      expect(pdf.text).toContain('Submitted 12 Mar 2026, 09:48 GMT')
      expect(pdf.text).toContain('No unsafe acts recorded')
      expect(pdf.text).toContain('Signatures Apprentice Ravi Lindqvist')
      expect(pdf.text).toContain('Instructor Idris Penhallow Signature Date')
      // Nothing left on a page of its own but the footer.
      for (const page of pdf.pages)
        expect(page.replace(/Commissioning record · .*Page \d+ of \d+$/, '').trim()).not.toBe('')
    })

    it('prints no internal id', () => {
      const { fixture, scenario, pdf } = made.get(id)!
      const ids = [
        ...scenario.start.devices.map((d) => d.id),
        ...fixture.events.flatMap((e) => (e.type === 'wire.added' ? [e.id] : [])),
        ...SETTINGS.map((s) => s.key),
      ]
      for (const internal of ids) expect(pdf.text).not.toContain(internal)
      expect(pdf.text).not.toMatch(/drive\.|"[a-z]+[A-Z][a-zA-Z]*"|undefined|NaN/)
    })
  },
)

describe('commissioning record of an unsafe attempt', () => {
  it('lists each unsafe act and the missed objectives', async () => {
    const [fixture] = attemptFixtures((name) => name === 'three-wire-start-stop--mistake-not-proved-dead')
    const { result, pdf } = await make(fixture)
    expect(result.passed).toBe(false)
    expect(result.safetyViolations.length).toBeGreaterThan(0)
    expect(pdf.text).toMatch(/\d+ unsafe acts? recorded/)
    for (const v of result.safetyViolations) expect(pdf.text).toContain(v.text.replace(/\s+/g, ' '))
    for (const o of result.objectives.filter((x) => !x.met))
      expect(inOrder(pdf.text, [o.title, 'Missed'])).toBe(true)
  }, 60_000)
})

describe('commissioning record with an instructor override', () => {
  it('shows the score that counts, the grader’s score and the reason', async () => {
    const { pdf } = await make(references[0], (i) => {
      i.review = {
        feedback: [],
        override: {
          by: 'Idris Penhallow',
          at: '2026-03-15T16:20:00Z',
          from: { score: 100, passed: true },
          to: { score: 60, passed: false },
          reason: 'Probed the DC bus before the wait time on the label had passed.',
        },
      }
      i.centre = { ...CENTRE, timeZone: 'America/Toronto' }
    })
    expect(pdf.text).toContain('60 %, not passed (changed by the instructor; the grader gave 100 %, passed)')
    expect(pdf.text).toContain('Reason: Probed the DC bus before the wait time on the label had passed.')
    expect(pdf.text).toContain('No feedback written yet')
    // 16:20 UTC on 15 March 2026 is 12:20 in Toronto, four hours behind UTC (daylight time from 8 March; IANA tz database).
    expect(pdf.text).toContain('15 Mar 2026, 12:20 GMT-4')
  }, 60_000)
})

describe('commissioning view model', () => {
  it('replays the log: settings changed in the attempt, the trend and the wiring at submission', () => {
    const { view, fixture } = made.get('raise-lower-commissioning')!
    const savedKeys = new Set(fixture.events.flatMap((e) => (e.type === 'setting.changed' ? [e.key] : [])))
    const labels = SETTINGS.filter((s) => savedKeys.has(s.key)).map((s) => s.label)
    expect(
      view.settings
        .filter((s) => s.changedInAttempt)
        .map((s) => s.label)
        .sort(),
    ).toEqual(labels.sort())
    expect(view.unsavedSettings).toEqual([])
    // The trend: in time order, dark before the first power-on, up to the ~41 Hz the chain was held at
    // (1200 rpm on a 4-pole 60 Hz motor rated 1750 rpm: 1200 / 1750 × 60 ≈ 41.1 Hz).
    const { points } = view.trend
    expect(points.every((p, i) => i === 0 || p.tMs > points[i - 1].tMs)).toBe(true)
    expect(points[0].referenceHz).toBeNull()
    const top = Math.max(...points.map((p) => p.outputHz))
    expect(top).toBeGreaterThan(40.5)
    expect(top).toBeLessThan(42)
    expect(view.trend.rpmPerHz * 60).toBeCloseTo(1750, 0)
    expect(view.schematic.svg.startsWith('<svg')).toBe(true)
    expect(view.wires.map((w) => w.number)).toEqual(['W1', 'W2', 'W3', 'W4', 'W5', 'W6', 'W7'])
  })
})
