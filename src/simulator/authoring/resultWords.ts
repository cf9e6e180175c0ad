// A draft run's grade and the server's verdict on a reference solution, in the author's words.
import type { ReferenceResult } from '@shared/api/scenarioAuthoring'
import type { GradeResult } from '@shared/scenario/grade'

export interface ResultWords {
  /** The headline, as the panel words a graded attempt. */
  title: string
  good: boolean
  /** What it misses, one line each (objective titles, safety). */
  lines: string[]
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`

/** Objectives named one by one in the bar; the task sheet lists every one. */
export const MISSED_SHOWN = 4

/** The panel's own grade of a finished run on the draft. */
export function runGradeWords(grade: GradeResult): ResultWords {
  const notMet = grade.objectives.filter((o) => !o.met).map((o) => `Not met: ${o.title}`)
  const more = notMet.length - MISSED_SHOWN
  const missed =
    more > 0
      ? [
          ...notMet.slice(0, MISSED_SHOWN),
          `…and ${plural(more, 'more objective', 'more objectives')} not met`,
        ]
      : notMet
  const unsafe = grade.safetyViolations.length
  return {
    title: `Graded: ${grade.score} / 100 — ${grade.passed ? 'passed' : 'not passed'}`,
    good: grade.passed,
    lines: [
      ...missed,
      ...(unsafe ? [`${plural(unsafe, 'safety violation', 'safety violations')} recorded`] : []),
    ],
  }
}

/** How the reference solution fares on the draft, as the server graded it. */
export function referenceWords(result: ReferenceResult): ResultWords {
  if (result.problem)
    return { title: 'The run cannot be replayed on this draft', good: false, lines: [result.problem] }
  const points = `${result.pointsEarned} of ${result.pointsPossible} points`
  if (result.fullMarks)
    return {
      title: `Full marks: ${points}, no hints, no safety violations`,
      good: true,
      lines: ['This run proves the exercise can be passed; the draft can be published once its checks pass.'],
    }
  return {
    title: `Not full marks: ${result.score} / 100 (${points})`,
    good: false,
    lines: [
      ...result.missed.map((title) => `Misses: ${title}`),
      ...(result.safetyViolations
        ? [
            `${plural(result.safetyViolations, 'safety violation', 'safety violations')}: a reference run must be safe throughout`,
          ]
        : []),
      ...(result.missed.length === 0 && result.safetyViolations === 0
        ? ['Every objective is met, but hints cost points: record it again without hints.']
        : []),
      'Publishing needs a reference solution with full marks: start again and record another run.',
    ],
  }
}
