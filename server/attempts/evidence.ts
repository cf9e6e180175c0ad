// Reading the grader's stored evidence (attempts.evidence, JSON) for reports: objectives met and missed,
// safety violations. Tolerant: a grade stored by an older grader, or none, reads as nothing.
import { safetyViolationLabel } from '@shared/progress'

export interface EvidenceObjective {
  id: string
  title: string
  required: boolean
  met: boolean
}

export interface EvidenceViolation {
  kind: string
  /** The kind in words. */
  label: string
  text: string
}

interface StoredEvidence {
  objectives?: { id?: unknown; title?: unknown; required?: unknown; met?: unknown }[]
  safetyViolations?: { kind?: unknown; text?: unknown }[]
}

function parse(evidence: string | null): StoredEvidence {
  if (!evidence) return {}
  try {
    const value = JSON.parse(evidence) as unknown
    return value && typeof value === 'object' ? (value as StoredEvidence) : {}
  } catch {
    return {}
  }
}

export function objectivesOf(evidence: string | null): EvidenceObjective[] {
  return (parse(evidence).objectives ?? []).flatMap((o) =>
    typeof o.id === 'string' && typeof o.title === 'string'
      ? [{ id: o.id, title: o.title, required: Boolean(o.required), met: Boolean(o.met) }]
      : [],
  )
}

export function violationsOf(evidence: string | null): EvidenceViolation[] {
  return (parse(evidence).safetyViolations ?? []).flatMap((v) =>
    typeof v.kind === 'string'
      ? [
          {
            kind: v.kind,
            label: safetyViolationLabel(v.kind),
            text: typeof v.text === 'string' ? v.text : '',
          },
        ]
      : [],
  )
}
