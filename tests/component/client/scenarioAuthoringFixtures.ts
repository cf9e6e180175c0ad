// Contract-shaped answers (shared/api/scenarioAuthoring.ts) for the authoring screens' component tests.
import type { ReferenceResult, ScenarioDraft } from '@shared/api'
import deadCircuit from '../../../scenarios/dead-control-circuit.json'

export const KEY = 'dead-control-circuit'
export const documentV = (version: number) => ({ ...structuredClone(deadCircuit), version })

export const fullMarks: ReferenceResult = {
  score: 100,
  passed: true,
  fullMarks: true,
  pointsEarned: 100,
  pointsPossible: 100,
  missed: [],
  safetyViolations: 0,
}

export function versionRow(version: number, reference: ReferenceResult | null = fullMarks) {
  return {
    id: `8f3a4b52-6c7d-4e8f-a091-a2b3c4d5e6f${version}`,
    key: KEY,
    version,
    title: deadCircuit.title,
    story: deadCircuit.story,
    difficulty: deadCircuit.difficulty,
    estimatedMinutes: deadCircuit.estimatedMinutes,
    status: 'active' as const,
    createdById: null,
    createdAt: '2026-11-0' + version + 'T09:00:00.000Z',
    reference,
  }
}

export function detail(version: number) {
  const { reference: _omitted, ...summary } = versionRow(version)
  return { ...summary, document: documentV(version) }
}

export function draftBody(edit: Partial<ScenarioDraft> = {}): ScenarioDraft {
  return {
    key: KEY,
    title: deadCircuit.title,
    document: documentV(3),
    baseVersion: 2,
    nextVersion: 3,
    createdAt: '2026-12-01T08:00:00.000Z',
    updatedAt: '2026-12-02T15:30:00.000Z',
    updatedByName: 'Tamsin Hale',
    problems: [],
    reference: null,
    publishable: false,
    ...edit,
  }
}

export const notFound = { status: 404, body: { error: { code: 'not_found', message: 'No draft' } } }
