// The scenario editor's working copy: plain-text fields for the story side, JSON for the technical
// side (starting state, faults, hints, objectives), checked live by the shared checkScenario.
import { checkScenario, type Scenario, type ScenarioProblem } from '@shared/scenario'

export interface ScenarioDraft {
  id: string
  version: number
  title: string
  story: string
  siteName: string
  siteMachine: string
  sitePeople: string // one per line
  learningOutcomes: string // one per line
  safetyNotes: string // one per line
  difficulty: 'introductory' | 'intermediate' | 'advanced'
  estimatedMinutes: number | string
  passMark: number | string
  technical: string // JSON: { start, faults, hints, objectives }
}

const lines = (text: string) =>
  text
    .split('\n')
    .map((l) => l.trim())
    .filter(Boolean)

type Doc = Record<string, unknown>

export function draftFrom(doc: Doc, key: string, nextVersion: number): ScenarioDraft {
  const site = (doc.site ?? {}) as { name?: string; machine?: string; people?: string[] }
  const technical = {
    start: doc.start,
    faults: doc.faults ?? [],
    hints: doc.hints ?? [],
    objectives: doc.objectives ?? [],
  }
  return {
    id: key,
    version: nextVersion,
    title: String(doc.title ?? ''),
    story: String(doc.story ?? ''),
    siteName: site.name ?? '',
    siteMachine: site.machine ?? '',
    sitePeople: (site.people ?? []).join('\n'),
    learningOutcomes: ((doc.learningOutcomes as string[] | undefined) ?? []).join('\n'),
    safetyNotes: ((doc.safetyNotes as string[] | undefined) ?? []).join('\n'),
    difficulty: (doc.difficulty as ScenarioDraft['difficulty']) ?? 'introductory',
    estimatedMinutes: (doc.estimatedMinutes as number | undefined) ?? 20,
    passMark: (doc.passMark as number | undefined) ?? 0,
    technical: JSON.stringify(technical, null, 2),
  }
}

/** A blank but valid-shaped start for a brand-new scenario (an invented site, as every scenario must be). */
export function blankDocument(): Doc {
  return {
    title: '',
    site: { name: '', machine: '', people: [] },
    story: '',
    learningOutcomes: [],
    difficulty: 'introductory',
    estimatedMinutes: 20,
    start: { devices: [], wires: [], settings: {}, power: { on: false, locked: true } },
    faults: [],
    hints: [],
    safetyNotes: [],
    objectives: [],
    passMark: 0,
  }
}

export interface DraftCheck {
  /** The checked scenario, only when there is no problem. */
  scenario: Scenario | null
  problems: ScenarioProblem[]
  /** First problem per editor field, for the field's error message. */
  byField: Partial<Record<keyof ScenarioDraft, string>>
}

const FIELD_OF: [RegExp, keyof ScenarioDraft][] = [
  [/^\$\.id\b/, 'id'],
  [/^\$\.title\b/, 'title'],
  [/^\$\.story\b/, 'story'],
  [/^\$\.site\.name\b/, 'siteName'],
  [/^\$\.site\.machine\b/, 'siteMachine'],
  [/^\$\.site\.people\b/, 'sitePeople'],
  [/^\$\.learningOutcomes\b/, 'learningOutcomes'],
  [/^\$\.safetyNotes\b/, 'safetyNotes'],
  [/^\$\.difficulty\b/, 'difficulty'],
  [/^\$\.estimatedMinutes\b/, 'estimatedMinutes'],
  [/^\$\.passMark\b/, 'passMark'],
  [/^\$\.(start|faults|hints|objectives)\b/, 'technical'],
]

export function checkDraft(d: ScenarioDraft): DraftCheck {
  let technical: Doc
  try {
    const parsed: unknown = JSON.parse(d.technical)
    if (!parsed || typeof parsed !== 'object' || Array.isArray(parsed))
      throw new Error('must be a JSON object')
    technical = parsed as Doc
  } catch (e) {
    const message = `The technical part is not valid JSON: ${(e as Error).message}`
    return {
      scenario: null,
      problems: [{ path: '$', place: 'Technical part', message }],
      byField: { technical: message },
    }
  }
  const document: Doc = {
    id: d.id,
    version: d.version,
    title: d.title.trim(),
    site: { name: d.siteName.trim(), machine: d.siteMachine.trim(), people: lines(d.sitePeople) },
    story: d.story.trim(),
    learningOutcomes: lines(d.learningOutcomes),
    difficulty: d.difficulty,
    estimatedMinutes: Number(d.estimatedMinutes),
    start: technical.start,
    faults: technical.faults,
    hints: technical.hints,
    safetyNotes: lines(d.safetyNotes),
    objectives: technical.objectives,
    passMark: Number(d.passMark),
  }
  const check = checkScenario(document)
  if (check.ok) return { scenario: check.scenario, problems: [], byField: {} }
  const byField: DraftCheck['byField'] = {}
  for (const p of check.problems) {
    const field = FIELD_OF.find(([re]) => re.test(p.path))?.[1] ?? 'technical'
    byField[field] ??= field === 'technical' ? `${p.place}: ${p.message}` : p.message
  }
  return { scenario: null, problems: check.problems, byField }
}
