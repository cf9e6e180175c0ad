// What an apprentice says is wrong before a repair: a part of the bench and a finding, from fixed lists in
// our own words. The model gives a diagnosis no effect; the grader compares it with the injected faults.
import { z } from 'zod'
import { pointIdSchema } from './setup'
import { SETTING_KEYS } from './settings'

const id = z.string().min(1).max(64)

/** The part of the bench a diagnosis names. */
export const diagnosisTargetSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('wire'), wire: id }),
  z.strictObject({ kind: z.literal('device'), device: id }),
  z.strictObject({ kind: z.literal('controlFuse') }),
  z.strictObject({ kind: z.literal('motorCable') }),
  z.strictObject({ kind: z.literal('setting'), key: z.enum(SETTING_KEYS) }),
  /** A terminal with nothing (or the wrong thing) on it, e.g. the input common left unconnected. */
  z.strictObject({ kind: z.literal('terminal'), point: pointIdSchema }),
])
export type DiagnosisTarget = z.infer<typeof diagnosisTargetSchema>

/** What is wrong with it (ours; the words the panel shows are in DIAGNOSIS_FINDING_LABELS). */
export const DIAGNOSIS_FINDINGS = [
  'open',
  'notLanded',
  'blown',
  'wrongContactType',
  'stuckClosed',
  'shorted',
  'wrongTerminal',
  'wrongSetting',
  /** A drive input that does not see what its terminal is given (the input stage inside the drive). */
  'notResponding',
] as const
export type DiagnosisFinding = (typeof DIAGNOSIS_FINDINGS)[number]

/** Plain words for each finding, as the diagnosis list shows them. */
export const DIAGNOSIS_FINDING_LABELS: Record<DiagnosisFinding, string> = {
  open: 'Open circuit: does not conduct',
  notLanded: 'Loose, or not connected at all',
  blown: 'Blown',
  wrongContactType: 'Wrong contact type fitted (closed where it should be open, or the reverse)',
  stuckClosed: 'Stuck closed: conducts when it should not',
  shorted: 'Short circuit to another conductor',
  wrongTerminal: 'Landed on the wrong terminal',
  wrongSetting: 'Set to the wrong value',
  notResponding: 'Input does not respond: the drive shows it OFF while its terminal is switched ON',
}

/** The same in a few words, for lists and evidence ("open circuit"). */
export const DIAGNOSIS_FINDING_SHORT: Record<DiagnosisFinding, string> = {
  open: 'open circuit',
  notLanded: 'not connected',
  blown: 'blown',
  wrongContactType: 'wrong contact type',
  stuckClosed: 'stuck closed',
  shorted: 'short circuit',
  wrongTerminal: 'on the wrong terminal',
  wrongSetting: 'set wrong',
  notResponding: 'input not responding',
}

export function sameDiagnosisTarget(a: DiagnosisTarget, b: DiagnosisTarget): boolean {
  switch (a.kind) {
    case 'wire':
      return b.kind === 'wire' && a.wire === b.wire
    case 'device':
      return b.kind === 'device' && a.device === b.device
    case 'setting':
      return b.kind === 'setting' && a.key === b.key
    case 'terminal':
      return b.kind === 'terminal' && a.point === b.point
    default:
      return a.kind === b.kind
  }
}
