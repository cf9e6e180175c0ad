// Grading evidence reaches screens and printed records, so it speaks in the words on the bench: wire
// numbers as on their markers, devices by their labels, settings by their catalogue labels and values,
// never an internal id.
import { describe, expect, it } from 'vitest'
import { SETTINGS } from '@shared/model'
import { grade } from '@shared/scenario'
import { attemptFixtures, scenarioById } from '../../support/shipped-attempts'

describe('grading evidence', () => {
  it.each(attemptFixtures().map((f) => [`${f.scenario} ${f.name}`, f] as const))(
    'of %s names no internal id',
    (_name, fixture) => {
      const scenario = scenarioById(fixture.scenario)
      const result = grade(scenario, fixture.events)
      const texts = [
        ...result.objectives.map((o) => o.evidence),
        ...result.safetyViolations.map((v) => v.text),
        result.summary,
      ]
      const ids = [
        ...scenario.start.devices.map((d) => d.id),
        ...scenario.start.wires.map((w) => w.id),
        ...fixture.events.flatMap((e) => (e.type === 'wire.added' ? [e.id] : [])),
        ...SETTINGS.map((s) => s.key),
      ]
      for (const text of texts) {
        for (const id of ids) expect(text, text).not.toMatch(new RegExp(`\\b${id.replace('.', '\\.')}\\b`))
        expect(text).not.toMatch(/drive\.|"[a-z]+[A-Z]\w*"/)
      }
    },
  )
})
