// Where a scenario problem is, and what is wrong, in words an instructor reads: "Objective 3 (Fan ran
// at 40 Hz): the target …" rather than `$.objectives[2].target`. The JSON path stays on the problem for
// tools and the API's field errors; screens show these words.
import type { z } from 'zod'
import type { MotorNameplate } from '../model/setup'

/** The parts of a scenario file, named as the editor names them. */
const TOP_LEVEL: Record<string, string> = {
  id: 'Key',
  version: 'Version',
  title: 'Title',
  story: 'Story',
  learningOutcomes: 'Learning outcomes',
  difficulty: 'Difficulty',
  estimatedMinutes: 'Estimated minutes',
  safetyNotes: 'Safety notes',
  passMark: 'Pass mark',
}
const SITE: Record<string, string> = { name: 'Site', machine: 'Machine', people: 'People in the story' }
const LISTS: Record<string, string> = {
  faults: 'Fault',
  hints: 'Hint',
  objectives: 'Objective',
}
const START_LISTS: Record<string, string> = { devices: 'Starting device', wires: 'Starting wire' }
const START_PARTS: Record<string, string> = {
  settings: 'Starting setting',
  power: 'Starting power and lock',
  motor: 'Motor nameplate',
  machine: 'Driven machine',
}

/** The figures of a motor's rating plate, as the editor labels them. */
export const NAMEPLATE_FIELD_WORDS: Record<keyof MotorNameplate, string> = {
  serial: 'Serial number',
  ratedVolts: 'Rated voltage',
  ratedHz: 'Rated frequency',
  ratedPower: 'Rated output',
  powerUnit: 'Output given in',
  fullLoadAmps: 'Full-load current',
  powerFactor: 'Power factor (cos φ)',
  efficiencyPercent: 'Efficiency',
  connection: 'Winding connection',
  ratedRpm: 'Rated speed',
  duty: 'Duty',
  insulationClass: 'Insulation class',
}

/** A field name inside an item, in words: `fromAtLeastHz` → "from at least hz", `wireId` → "wire". */
function fieldWords(key: string): string {
  const spaced = key.replace(/Id$/, '').replace(/([a-z])([A-Z])/g, '$1 $2')
  return spaced.toLowerCase()
}

type Named = { title?: unknown; label?: unknown; text?: unknown }

function itemName(item: unknown): string {
  if (!item || typeof item !== 'object') return ''
  const { title, label, text } = item as Named
  const name = [title, label, text].find((v): v is string => typeof v === 'string' && v.trim() !== '')
  if (!name) return ''
  return ` (${name.length > 48 ? `${name.slice(0, 47)}…` : name})`
}

/**
 * The place a path points at, in words, using the document for names where it has them. Returns '' for
 * the whole document.
 */
export function problemPlace(path: readonly PropertyKey[], document: unknown): string {
  const doc = (document && typeof document === 'object' ? document : {}) as Record<string, unknown>
  const [head, second, third, ...rest] = path.map((p) => (typeof p === 'symbol' ? String(p) : p))
  if (head === undefined) return ''
  const tail = (parts: (string | number)[]) =>
    parts.filter((p) => typeof p === 'string').map((p) => fieldWords(p as string))
  if (typeof head === 'string' && head in TOP_LEVEL) {
    const item = typeof second === 'number' ? ` line ${second + 1}` : ''
    return `${TOP_LEVEL[head]}${item}`
  }
  if (head === 'site' && typeof second === 'string') return SITE[second] ?? 'Site'
  if (typeof head === 'string' && head in LISTS) {
    if (typeof second !== 'number') return `${LISTS[head]}s`
    const list = Array.isArray(doc[head]) ? (doc[head] as unknown[]) : []
    const words = tail([third, ...rest].filter((p) => p !== undefined) as (string | number)[])
    return [`${LISTS[head]} ${second + 1}${itemName(list[second])}`, ...words.slice(0, 1)].join(', ')
  }
  if (head === 'start') {
    const start = (doc.start && typeof doc.start === 'object' ? doc.start : {}) as Record<string, unknown>
    if (typeof second === 'string' && second in START_LISTS) {
      if (typeof third !== 'number') return `${START_LISTS[second]}s`
      const list = Array.isArray(start[second]) ? (start[second] as unknown[]) : []
      const words = tail(rest as (string | number)[])
      return [`${START_LISTS[second]} ${third + 1}${itemName(list[third])}`, ...words.slice(0, 1)].join(', ')
    }
    if (second === 'settings' && typeof third === 'string') return `Starting setting “${third}”`
    if (second === 'motor' && typeof third === 'string' && third in NAMEPLATE_FIELD_WORDS) {
      const figure = NAMEPLATE_FIELD_WORDS[third as keyof MotorNameplate]
      return `${START_PARTS.motor}, ${figure.charAt(0).toLowerCase()}${figure.slice(1)}`
    }
    if (typeof second === 'string' && second in START_PARTS) {
      const words = tail([third, ...rest].filter((p) => p !== undefined) as (string | number)[])
      return [START_PARTS[second], ...words.slice(0, 1)].join(', ')
    }
    return 'Starting state'
  }
  return tail(path.filter((p): p is string => typeof p === 'string')).join(', ')
}

/**
 * A schema issue in plain words. zod's defaults read like "Too small: expected string to have >=2
 * characters"; an instructor needs "at least 2 characters" or "fill this in".
 */
export function plainIssueMessage(issue: z.core.$ZodIssue): string {
  // A message the schema wrote itself is already in words; only zod's own defaults are replaced.
  if (!/^(Too small|Too big|Invalid input|Invalid option|Unrecognized key|Invalid)/.test(issue.message))
    return issue.message
  switch (issue.code) {
    case 'too_small': {
      const min = Number(issue.minimum)
      if (issue.origin === 'string') return min <= 1 ? 'Fill this in' : `Write at least ${min} characters`
      if (issue.origin === 'array') return min <= 1 ? 'Add at least one' : `Add at least ${min}`
      // A strict bound (zod's positive(), gt()) excludes the figure itself: "At least 0" would admit 0.
      return issue.inclusive === false ? `More than ${min}` : `At least ${min}`
    }
    case 'too_big': {
      const max = Number(issue.maximum)
      if (issue.origin === 'string') return `At most ${max} characters`
      if (issue.origin === 'array') return `At most ${max}`
      return issue.inclusive === false ? `Less than ${max}` : `At most ${max}`
    }
    case 'invalid_type':
      // zod leaves the input off its issues, but its message says what was received.
      if (/received undefined/.test(issue.message)) return 'Missing: fill this in'
      if (issue.expected === 'number' || issue.expected === 'int') return 'Enter a number'
      return `Must be ${issue.expected === 'string' ? 'text' : `a ${issue.expected}`}`
    case 'invalid_value':
      return issue.values.length <= 6
        ? `Choose one of: ${issue.values.map((v) => String(v)).join(', ')}`
        : 'Choose one of the values offered'
    case 'invalid_union':
      return 'Not one of the kinds this field takes'
    case 'unrecognized_keys':
      return `Not a part of a scenario: ${issue.keys.join(', ')}`
    case 'invalid_format':
      return issue.message
    default:
      return issue.message
  }
}

/** The parts of a JSON path as `jsonPath` writes it (`$.a[2]["b.c"]` → a, 2, b.c), for a path from the API. */
export function parseJsonPath(path: string): (string | number)[] {
  const parts: (string | number)[] = []
  const re = /\.([A-Za-z_$][\w$]*)|\[(\d+)\]|\[("(?:[^"\\]|\\.)*")\]/g
  for (const m of path.replace(/^\$/, '').matchAll(re)) {
    if (m[1] !== undefined) parts.push(m[1])
    else if (m[2] !== undefined) parts.push(Number(m[2]))
    else parts.push(JSON.parse(m[3]!) as string)
  }
  return parts
}
