// Where a refused pack's problem is, in words: "Scenario 2: Objective 3 (Fan ran), title" instead of the
// path the server's validation reports (`scenarios.1.document.objectives.2.title`).
import { parseJsonPath, problemPlace } from '@shared/scenario/problemWords'

function parts(path: string): (string | number)[] {
  if (path.startsWith('$')) return parseJsonPath(path)
  return path
    .split('.')
    .filter(Boolean)
    .map((p) => (/^\d+$/.test(p) ? Number(p) : p))
}

/** The place of a problem in an uploaded file, in words ('' for the file as a whole). */
export function packProblemPlace(path: string): string {
  let rest = parts(path)
  let prefix = ''
  if (rest[0] === 'scenarios' && typeof rest[1] === 'number') {
    prefix = `Scenario ${rest[1] + 1}`
    rest = rest.slice(2)
    if (rest[0] === 'referenceSolution') return `${prefix}: its reference solution`
    if (rest[0] === 'document') rest = rest.slice(1)
  } else if (typeof rest[0] === 'number') {
    // A bare array of scenario documents.
    prefix = `Scenario ${rest[0] + 1}`
    rest = rest.slice(1)
  }
  // Setting keys hold dots of their own; the place is the starting settings as a whole.
  const settings = rest.indexOf('settings')
  if (rest[0] === 'start' && settings === 1) rest = rest.slice(0, 2)
  const known = ['format', 'formatVersion', 'exportedAt', 'scenarios']
  const place =
    rest.length === 1 && known.includes(String(rest[0]))
      ? 'The file’s heading (is it a Slipway scenario pack?)'
      : problemPlace(rest, null)
  return [prefix, place].filter(Boolean).join(': ')
}
