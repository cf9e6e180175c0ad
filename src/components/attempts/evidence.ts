// The grader's stored result (shared/api gradeResultSchema, parsed with the attempt) as the attempt
// pages show it. Grades stored before hints kept their text show the hint's number instead.
import type { GradeResult } from '@shared/api'
import { formatTime } from '@shared/scenario/format'
import { objectiveKindLabel } from '@shared/scenario/kindLabels'

export interface ObjectiveLine {
  id: string
  title: string
  /** What kind of check it is, in words ("Input wiring"). */
  kind: string
  passed: boolean
  points: number
  possible: number
  detail: string
  atMs: number | null
  required: boolean
}

export interface ViolationLine {
  atMs: number
  /** Simulated time as the evidence writes it ("03:42.0"). */
  at: string
  text: string
}

export interface HintLine {
  id: string
  label: string
  cost: number
  atMs: number
  at: string
}

export interface EvidenceView {
  objectives: ObjectiveLine[]
  violations: ViolationLine[]
  hints: HintLine[]
  summary: string
}

const EMPTY: EvidenceView = { objectives: [], violations: [], hints: [], summary: '' }

export function readEvidence(evidence: GradeResult | null): EvidenceView {
  if (!evidence) return EMPTY
  return {
    objectives: evidence.objectives.map((o) => ({
      id: o.id,
      title: o.title,
      kind: objectiveKindLabel(o.kind),
      passed: o.met,
      points: o.pointsEarned,
      possible: o.pointsPossible,
      detail: o.evidence,
      atMs: o.at ?? null,
      required: o.required,
    })),
    violations: evidence.safetyViolations.map((v) => ({ atMs: v.t, at: formatTime(v.t), text: v.text })),
    hints: evidence.hintsUsed.map((h, i) => ({
      id: h.id,
      label: h.text ?? `Hint ${i + 1}`,
      cost: h.cost,
      atMs: h.t,
      at: formatTime(h.t),
    })),
    summary: evidence.summary,
  }
}
