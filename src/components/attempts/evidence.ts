// Reads the grader's stored result (shared/scenario GradeResult) for display. The grader (shared/scenario) owns the shape; this reader
// is tolerant so an older stored result still shows what it can instead of failing the page.

export interface ObjectiveLine {
  id: string
  title: string
  passed: boolean
  points: number | null
  possible: number | null
  detail: string
  atMs: number | null
  required: boolean
}

export interface ViolationLine {
  atMs: number | null
  text: string
}

export interface HintLine {
  id: string
  cost: number | null
  atMs: number | null
}

export interface EvidenceView {
  objectives: ObjectiveLine[]
  violations: ViolationLine[]
  hints: HintLine[]
  summary: string
}

type Loose = Record<string, unknown>
const asObj = (v: unknown): Loose => (v && typeof v === 'object' ? (v as Loose) : {})
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null)
const str = (...vs: unknown[]): string => {
  for (const v of vs) if (typeof v === 'string' && v) return v
  return ''
}
const list = (v: unknown): unknown[] => (Array.isArray(v) ? v : [])

function objectiveLine(raw: unknown, index: number): ObjectiveLine {
  const o = asObj(raw)
  const ev = asObj(o.evidence)
  return {
    id: str(o.id, o.objectiveId) || `objective-${index + 1}`,
    title: str(o.title, o.label, o.name, o.id) || `Objective ${index + 1}`,
    passed: o.passed === true || o.met === true,
    points: num(o.points) ?? num(o.earned) ?? num(o.pointsEarned),
    possible: num(o.possible) ?? num(o.weight) ?? num(o.pointsPossible) ?? num(o.max),
    detail: str(
      o.detail,
      o.message,
      o.summary,
      ev.summary,
      ev.text,
      ev.message,
      typeof o.evidence === 'string' ? o.evidence : '',
    ),
    atMs: num(o.at) ?? num(o.t) ?? num(o.atMs) ?? num(ev.t) ?? num(ev.atMs),
    required: o.required === true,
  }
}

export function readEvidence(evidence: unknown): EvidenceView {
  const e = asObj(evidence)
  const objectives = list(e.objectives ?? e.results ?? (Array.isArray(evidence) ? evidence : [])).map(
    objectiveLine,
  )
  const violations = list(e.safetyViolations ?? e.violations).map((raw) => {
    const v = asObj(raw)
    return {
      atMs: num(v.t) ?? num(v.atMs),
      text: str(v.message, v.text, v.description, v.kind, typeof raw === 'string' ? raw : ''),
    }
  })
  const hints = list(e.hintsUsed ?? e.hints).map((raw) => {
    const h = asObj(raw)
    return {
      id: str(h.id, h.hintId, typeof raw === 'string' ? raw : ''),
      cost: num(h.cost),
      atMs: num(h.t) ?? num(h.atMs),
    }
  })
  return { objectives, violations, hints, summary: str(e.summary) }
}
