// The objectives the live task sheet lists: the scenario's own, then those a fault put in by an instructor
// brought (from the live grader, which adds them at the injection). Their titles never name the fault; they
// show only where live ticks are shown, so an assessment's sheet stays the scenario's alone.
import type { GradeResult } from '@shared/scenario/grade'
import type { Scenario } from '@shared/scenario/schema'
import type { ObjectiveTick } from './PanelTaskPanel.vue'

export function liveObjectiveTicks(
  scenario: Scenario,
  grade: GradeResult | null,
  liveTicks: boolean,
): ObjectiveTick[] {
  const met = (id: string) => liveTicks && !!grade?.objectives.find((r) => r.id === id)?.met
  const own = scenario.objectives.map((o): ObjectiveTick => ({
    id: o.id,
    title: o.title,
    required: !!o.required,
    state: met(o.id) ? 'met' : 'open',
  }))
  if (!liveTicks) return own
  const injected = (grade?.objectives ?? [])
    .filter((r) => r.injection)
    .map((r): ObjectiveTick => ({
      id: r.id,
      title: r.title,
      required: r.required,
      state: r.met ? 'met' : 'open',
      points: r.pointsPossible,
    }))
  return [...own, ...injected]
}
