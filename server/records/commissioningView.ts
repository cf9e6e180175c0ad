// Builds a commissioning record's view model from a scenario, the attempt's event log and its grade,
// with the people and dates the caller supplies. Pure: the log is replayed with shared/model to get the
// wiring, the settings and the trend as they were at submission; nothing is read from a database.
import {
  SETTINGS,
  SETTING_GROUPS,
  createSimulation,
  replay,
  sampleTimeline,
  shaftRpm,
  type AttemptEvent,
  type SettingKey,
  type SimState,
  type Timeline,
} from '@shared/model'
import { toSimulationSetup, type GradeResult, type Scenario } from '@shared/scenario'
import { drawSchematic, wiringOfState } from '@shared/schematic'
import { formatSettingValue, type AssistanceLevel } from './format'
import type {
  CommissioningRecordView,
  CommissioningTrend,
  FeedbackLine,
  GradeOverrideLine,
  RecordCentre,
  RecordPerson,
  SettingLine,
  TrendPoint,
} from './types'

export interface CommissioningRecordInput {
  centre: RecordCentre
  scenario: Scenario
  events: readonly AttemptEvent[]
  /** The grader's result for these events (shared/scenario grade). */
  grade: GradeResult
  apprentice: RecordPerson
  instructor?: RecordPerson | null
  attempt: { label: string; startedAt: string; submittedAt: string | null; assistance: AssistanceLevel }
  review?: { feedback: FeedbackLine[]; override: GradeOverrideLine | null }
  generatedAt: string
}

const GROUP_LABEL = new Map<string, string>(SETTING_GROUPS.map((g) => [g.id, g.label]))

const GROUP_ORDER = new Map<string, number>(SETTING_GROUPS.map((g, i) => [g.id, i]))

/** Every setting of the catalogue, group by group (catalogue order within a group). */
function settingLines(start: SimState, end: SimState): SettingLine[] {
  const ordered = [...SETTINGS].sort(
    (a, b) => (GROUP_ORDER.get(a.group) ?? 99) - (GROUP_ORDER.get(b.group) ?? 99),
  )
  return ordered.map((def) => {
    const key = def.key as SettingKey
    const value = end.settings.active[key]
    return {
      group: GROUP_LABEL.get(def.group) ?? def.group,
      label: def.label,
      value: formatSettingValue(key, value),
      defaultValue: formatSettingValue(key, def.default),
      changedFromDefault: value !== def.default,
      changedInAttempt: value !== start.settings.active[key],
    }
  })
}

function unsavedSettings(end: SimState): { label: string; value: string }[] {
  return SETTINGS.flatMap((def) => {
    const key = def.key as SettingKey
    const pending = end.settings.pending[key]
    return pending === undefined || pending === end.settings.active[key]
      ? []
      : [{ label: def.label, value: formatSettingValue(key, pending) }]
  })
}

/** Samples across the attempt, plus every moment a piece of the speed curve starts or ends. */
const TREND_SAMPLES = 360

function trendOf(timeline: Timeline, endMs: number, end: SimState): CommissioningTrend {
  const times = new Set<number>()
  for (let i = 0; i <= TREND_SAMPLES; i++) times.add(Math.round((endMs * i) / TREND_SAMPLES))
  for (const b of timeline.breakpoints) if (b.t <= endMs) times.add(Math.round(b.t))
  for (const s of timeline.segments) if (s.from <= endMs) times.add(s.from)
  const points: TrendPoint[] = [...times]
    .sort((a, b) => a - b)
    .map((t) => {
      const sample = sampleTimeline(timeline, t)
      return { tMs: t, referenceHz: sample.displayOn ? sample.referenceHz : null, outputHz: sample.outputHz }
    })
  const s = end.settings.active
  const rpmPerHz = shaftRpm(1, s['motor.poles'], s['motor.ratedFrequency'], s['motor.ratedSpeed'])
  return { endMs, points, rpmPerHz }
}

export function buildCommissioningView(input: CommissioningRecordInput): CommissioningRecordView {
  const { scenario, grade } = input
  const setup = toSimulationSetup(scenario)
  const start = createSimulation(setup)
  const timeline = replay(setup, input.events)
  const end = timeline.segments[timeline.segments.length - 1].state
  const endMs = Math.max(timeline.end, grade.endedAt)
  const drawing = drawSchematic(wiringOfState(end), { title: `Control circuit as wired: ${scenario.title}` })
  const override = input.review?.override ?? null
  return {
    centre: input.centre,
    generatedAt: input.generatedAt,
    scenario: {
      title: scenario.title,
      version: scenario.version,
      site: scenario.site.name,
      machine: scenario.site.machine,
    },
    apprentice: input.apprentice,
    instructor: input.instructor ?? null,
    attempt: {
      label: input.attempt.label,
      startedAt: input.attempt.startedAt,
      submittedAt: input.attempt.submittedAt,
      simulatedMs: endMs,
      assistance: input.attempt.assistance,
    },
    result: {
      score: override ? override.to.score : grade.score,
      passed: override ? override.to.passed : grade.passed,
      autoScore: grade.score,
      autoPassed: grade.passed,
      points: grade.points,
      summary: grade.summary,
    },
    objectives: grade.objectives.map((o) => ({
      title: o.title,
      required: o.required,
      safety: o.safety,
      met: o.met,
      pointsEarned: o.pointsEarned,
      pointsPossible: o.pointsPossible,
      evidence: o.evidence,
    })),
    hintsUsed: grade.hintsUsed.map((h) => ({
      text: scenario.hints.find((hint) => hint.id === h.id)?.text ?? 'A hint',
      atMs: h.t,
      cost: h.cost,
    })),
    safetyViolations: grade.safetyViolations.map((v) => ({ atMs: v.t, text: v.text })),
    schematic: { svg: drawing.svg, width: drawing.layout.width, height: drawing.layout.height },
    wires: drawing.layout.wires.map((w) => ({
      number: w.number,
      colour: `${w.colour.code} ${w.colour.name.toLowerCase()}`,
      from: w.fromName,
      to: w.toName,
    })),
    settings: settingLines(start, end),
    unsavedSettings: unsavedSettings(end),
    trend: trendOf(timeline, endMs, end),
    review: input.review ?? { feedback: [], override: null },
  }
}
