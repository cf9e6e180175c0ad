// Training data → what the screens and the PDF show: the outcome list (one policy for both: an outcome is
// shown by the first passed attempt on its exercise), the training record's view model, the JSON summary.
import type {
  CommissioningRecord,
  OutcomeSignOff,
  TrainingOutcome,
  TrainingRecordSummary,
  WithdrawnSignOff,
} from '@shared/api/records'
import type { OutcomeSignOffRow, OutcomeSignOffWithdrawalRow } from '../entities'
import type { RecordAttempt, TrainingData } from './trainingData'
import { ASSISTANCE_LEVELS, formatAttemptTime, formatDateTime, formatDuration } from './format'
import { trendChartSvg } from './trendChart'
import type { CommissioningRecordView, RecordCentre, TrainingRecordView } from './types'

/** Exercise keys in the order the record lists them (set work first, then practice), each at its newest version. */
function exercises(data: TrainingData) {
  const newest = new Map<string, { key: string; title: string; outcomes: string[]; version: number }>()
  const ids = [...data.assignedScenarioIds, ...data.attempts.map((a) => a.scenarioId)]
  for (const id of ids) {
    const row = data.scenarios.get(id)
    if (!row) continue
    const known = newest.get(row.key)
    if (!known || known.version < row.version) {
      newest.set(row.key, {
        key: row.key,
        title: row.parsed.title,
        outcomes: row.parsed.learningOutcomes ?? [],
        version: row.version,
      })
    }
  }
  return [...newest.values()]
}

const keyOfAttempt = (data: TrainingData, attempt: RecordAttempt) =>
  data.scenarios.get(attempt.scenarioId)?.key

export const presentSignOff = (row: OutcomeSignOffRow, byName: string): OutcomeSignOff => ({
  id: row.id,
  cohortId: row.cohortId,
  byName,
  at: row.signedAt,
  note: row.note,
})

export const presentWithdrawnSignOff = (
  row: OutcomeSignOffWithdrawalRow,
  names: ReadonlyMap<string, string>,
): WithdrawnSignOff => ({
  ...presentSignOff(row, names.get(row.signedById) ?? ''),
  withdrawnByName: names.get(row.withdrawnById) ?? '',
  withdrawnAt: row.withdrawnAt,
  reason: row.reason,
})

export function trainingOutcomes(data: TrainingData): TrainingOutcome[] {
  return exercises(data).flatMap((exercise) => {
    const shown = data.attempts.find((a) => a.passed === true && keyOfAttempt(data, a) === exercise.key)
    return exercise.outcomes.map((outcome) => {
      const signOff = data.signOffs.find((s) => s.scenarioKey === exercise.key && s.outcome === outcome)
      return {
        scenarioKey: exercise.key,
        scenarioTitle: exercise.title,
        outcome,
        shownBy: shown
          ? {
              attemptId: shown.id,
              attemptLabel: shown.label,
              at: shown.submittedAt ?? shown.updatedAt,
              score: shown.score ?? 0,
            }
          : null,
        signOff: signOff ? presentSignOff(signOff, data.names.get(signOff.signedById) ?? '') : null,
        withdrawnSignOffs: data.withdrawals
          .filter((w) => w.scenarioKey === exercise.key && w.outcome === outcome)
          .map((w) => presentWithdrawnSignOff(w, data.names)),
      }
    })
  })
}

const titleOf = (data: TrainingData, attempt: RecordAttempt) =>
  data.scenarios.get(attempt.scenarioId)?.parsed.title ?? 'An exercise'

export function presentTrainingSummary(data: TrainingData): TrainingRecordSummary {
  return {
    apprentice: { id: data.apprentice.id, name: data.apprentice.name },
    cohorts: data.cohorts.map((c) => ({ id: c.id, name: c.name })),
    outcomes: trainingOutcomes(data),
    attempts: data.attempts.length,
    safetyViolations: data.attempts.reduce((n, a) => n + (a.grade?.safetyViolations.length ?? 0), 0),
  }
}

export function trainingRecordView(
  data: TrainingData,
  centre: RecordCentre,
  generatedAt: string,
): TrainingRecordView {
  const owner = data.cohorts[0] ? data.names.get(data.cohorts[0].ownerId) : undefined
  return {
    centre,
    generatedAt,
    apprentice: { name: data.apprentice.name },
    cohorts: data.cohorts.map((c) => c.name),
    instructor: owner ? { name: owner } : null,
    outcomes: trainingOutcomes(data).map((o) => ({
      outcome: o.outcome,
      scenarioTitle: o.scenarioTitle,
      shownBy: o.shownBy && {
        attemptLabel: o.shownBy.attemptLabel,
        at: o.shownBy.at,
        score: o.shownBy.score,
      },
      signOff: o.signOff && { by: o.signOff.byName, at: o.signOff.at, note: o.signOff.note },
      withdrawn: o.withdrawnSignOffs.map((w) => ({
        by: w.byName,
        at: w.at,
        withdrawnBy: w.withdrawnByName,
        withdrawnAt: w.withdrawnAt,
        reason: w.reason,
      })),
    })),
    attempts: data.attempts.map((a) => ({
      scenarioTitle: titleOf(data, a),
      attemptLabel: a.label,
      submittedAt: a.submittedAt ?? a.updatedAt,
      score: a.score ?? 0,
      passed: a.passed === true,
      overridden: a.score !== a.autoScore || Boolean(a.passed) !== Boolean(a.autoPassed),
      safetyViolations: a.grade?.safetyViolations.length ?? 0,
    })),
    safety: data.attempts.flatMap((a) =>
      (a.grade?.safetyViolations ?? []).map((v) => ({
        scenarioTitle: titleOf(data, a),
        attemptLabel: a.label,
        at: a.submittedAt ?? a.updatedAt,
        atMs: v.t,
        text: v.text,
      })),
    ),
  }
}

/** A file name part from a person's or exercise's name: ASCII letters and digits joined by hyphens. */
export function fileSlug(text: string): string {
  const slug = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
  return slug || 'record'
}

/** The commissioning record for the print view: the PDF's view model, the trend drawn, levels in words. */
export function presentCommissioningRecord(view: CommissioningRecordView): CommissioningRecord {
  const clock = { timeZone: view.centre.timeZone, locale: view.centre.locale ?? 'en-GB' }
  const at = (iso: string) => formatDateTime(iso, clock)
  const { trend, generatedAt: _generatedAt, ...rest } = view
  return {
    ...rest,
    generated: at(view.generatedAt),
    attempt: {
      label: view.attempt.label,
      started: at(view.attempt.startedAt),
      submitted: view.attempt.submittedAt ? at(view.attempt.submittedAt) : null,
      timeOnBench: formatDuration(view.attempt.simulatedMs),
      assistance: ASSISTANCE_LEVELS[view.attempt.assistance],
    },
    hintsUsed: view.hintsUsed.map((h) => ({ text: h.text, at: formatAttemptTime(h.atMs), cost: h.cost })),
    safetyViolations: view.safetyViolations.map((v) => ({ text: v.text, at: formatAttemptTime(v.atMs) })),
    trendSvg: trendChartSvg(trend),
    review: {
      feedback: view.review.feedback.map((f) => ({ ...f, at: at(f.at) })),
      override: view.review.override && { ...view.review.override, at: at(view.review.override.at) },
    },
  }
}
