// Troubleshooting graded on method: diagnosisCorrect, discriminatingMeasurement, noNeedlessReplacements.
import {
  DIAGNOSIS_FINDING_SHORT,
  faultPresent,
  sameDiagnosisTarget,
  type AttemptEvent,
  type DiagnosisTarget,
  type SimState,
} from '../../model'
import { formatTime, joinTexts, plural, upperFirst } from '../format'
import { faultAnswer, tellingReading, type DiagnosisAnswer, type TellingReading } from '../method'
import {
  deviceName,
  diagnosisName,
  diagnosisTargetName,
  meterReadingName,
  probePointsName,
  wireName,
} from '../names'
import type { Sample } from '../samples'
import type { Scenario } from '../schema'
import { fixed, folding, type Evaluator, type Verdict } from './types'

type Diagnosis = Extract<AttemptEvent, { type: 'diagnosis.recorded' }>

/** Every part the scenario has something wrong with: its injected faults and the start problems its objectives name. */
export function partsAtFault(scenario: Scenario): DiagnosisTarget[] {
  const fromFaults = scenario.faults.map((f) => faultAnswer(f).target)
  const fromStart = scenario.objectives.flatMap((o) =>
    o.kind === 'diagnosisCorrect' && o.expect ? [o.expect.target] : [],
  )
  return [...fromFaults, ...fromStart]
}

/** The moment the part a start problem names is first worked on (the repair of a built-in problem). */
function worksOn(target: DiagnosisTarget, sample: Sample, previous: Sample | undefined): boolean {
  const { event } = sample
  if (!event) return false
  if (sample.at === 'after' && event.type === 'settings.saved' && target.kind === 'setting')
    return (
      previous !== undefined &&
      previous.state.settings.active[target.key] !== sample.state.settings.active[target.key]
    )
  if (sample.at !== 'before') return false
  switch (target.kind) {
    case 'wire':
      return event.type === 'wire.removed' && event.id === target.wire
    case 'device':
      return event.type === 'device.contactFitted' && event.device === target.device
    case 'controlFuse':
      return event.type === 'fuse.replaced'
    case 'motorCable':
      return event.type === 'motor.cableReplaced' || event.type === 'motor.conductorLanded'
    case 'terminal': {
      if (event.type === 'wire.added') return event.from === target.point || event.to === target.point
      if (event.type !== 'wire.removed') return false
      const wire = sample.state.wires.find((w) => w.id === event.id)
      return wire !== undefined && (wire.from === target.point || wire.to === target.point)
    }
    default:
      return false
  }
}

interface DiagnosisWatch {
  diagnoses: readonly { event: Diagnosis; state: SimState }[]
  /** The moment of the repair; diagnoses after it do not count. */
  repairedAt: number | undefined
}

/**
 * Met when, before the repair, the last diagnosis naming this part had a right finding and no diagnosis
 * named a part with nothing wrong with it (so naming every part in turn does not pass). Not met while the
 * repair has not been made.
 */
export const diagnosisCorrect: Evaluator<'diagnosisCorrect'> = (objective, { scenario, start }) => {
  const fault = objective.fault === undefined ? undefined : scenario.faults[objective.fault]
  const answer: DiagnosisAnswer | undefined = fault ? faultAnswer(fault) : objective.expect
  if (!answer || (objective.fault !== undefined && !fault)) {
    return fixed({ met: false, evidence: 'The objective names a problem the scenario does not have.' })
  }
  const atFault = partsAtFault(scenario)
  const repaired = (sample: Sample, previous: Sample | undefined) =>
    fault ? !faultPresent(sample.state, fault) : worksOn(answer.target, sample, previous)
  return folding<DiagnosisWatch>(
    { diagnoses: [], repairedAt: repaired(start, undefined) ? start.t : undefined },
    (watch, sample, previous) => {
      if (watch.repairedAt !== undefined) return watch
      if (repaired(sample, previous)) return { ...watch, repairedAt: sample.t }
      const { event } = sample
      if (sample.at === 'after' && event?.type === 'diagnosis.recorded')
        return { ...watch, diagnoses: [...watch.diagnoses, { event, state: sample.state }] }
      return watch
    },
    ({ diagnoses, repairedAt }, end) => {
      const verdict = judgeDiagnosis(answer, atFault, diagnoses, repairedAt, end, start.state)
      // Judged only once the repair is made, so a live tick never confirms a guess before the repair.
      if (repairedAt !== undefined) return verdict
      return {
        met: false,
        evidence: `Not judged: it was not put right by the end (${formatTime(end.t)}). ${verdict.evidence}`,
        at: end.t,
      }
    },
  )
}

/** The diagnosis names a part with something wrong: the scenario's, or one an instructor put a fault in by then. */
function namesPartAtFault(
  d: DiagnosisWatch['diagnoses'][number],
  atFault: readonly DiagnosisTarget[],
): boolean {
  const { target } = d.event
  if (atFault.some((p) => sameDiagnosisTarget(p, target))) return true
  return (d.state.injected ?? []).some((f) => sameDiagnosisTarget(faultAnswer(f).target, target))
}

function judgeDiagnosis(
  answer: DiagnosisAnswer,
  atFault: readonly DiagnosisTarget[],
  diagnoses: DiagnosisWatch['diagnoses'],
  repairedAt: number | undefined,
  end: Sample,
  /** The moment the part is named in: the start, when the part at fault was still fitted (a wire replaced is gone at the end). */
  namedIn: SimState,
): Verdict {
  const findings = answer.findings.map((f) => DIAGNOSIS_FINDING_SHORT[f])
  const right = `${diagnosisTargetName(answer.target, namedIn)}: ${findings.length > 1 ? `${findings.slice(0, -1).join(', ')}, or ${findings.at(-1)}` : findings[0]}`
  const when =
    repairedAt === undefined
      ? `by the end (${formatTime(end.t)})`
      : `before the repair at ${formatTime(repairedAt)}`
  const named = (d: DiagnosisWatch['diagnoses'][number]) =>
    `${diagnosisName(d.event.target, d.event.finding, d.state)} at ${formatTime(d.event.t)}`
  const mine = diagnoses.filter((d) => sameDiagnosisTarget(d.event.target, answer.target))
  const last = mine.at(-1)
  if (!last) {
    const others = diagnoses.length > 0 ? ` (recorded: ${diagnoses.map(named).join('; ')})` : ''
    return { met: false, evidence: `No diagnosis named ${right} ${when}${others}.`, at: repairedAt ?? end.t }
  }
  if (!answer.findings.includes(last.event.finding)) {
    return {
      met: false,
      evidence: `The diagnosis ${when} was ${named(last)}; what was wrong was ${right}.`,
      at: last.event.t,
    }
  }
  const healthy = diagnoses.filter((d) => !namesPartAtFault(d, atFault))
  if (healthy.length > 0) {
    return {
      met: false,
      evidence: `Right diagnosis (${named(last)}), but ${when} ${plural(healthy.length, 'diagnosis', 'diagnoses')} also named a part with nothing wrong: ${healthy.map(named).join('; ')}.`,
      at: last.event.t,
    }
  }
  return { met: true, evidence: `Diagnosed ${named(last)}, ${when}.`, at: last.event.t }
}

interface MeasurementWatch {
  found: { t: number; telling: TellingReading; state: SimState } | undefined
  repairedAt: number | undefined
}

/**
 * Met when, while the fault was there and before it was first put right, the meter showed a reading that
 * the same moment with only that fault cleared would not show (method.ts: tellingReading). Not met while the
 * fault is still there.
 */
export const discriminatingMeasurement: Evaluator<'discriminatingMeasurement'> = (
  objective,
  { scenario },
) => {
  const fault = scenario.faults[objective.fault]
  if (!fault)
    return fixed({
      met: false,
      evidence: 'The objective names an injected fault the scenario does not have.',
    })
  return folding<MeasurementWatch>(
    { found: undefined, repairedAt: undefined },
    (watch, sample) => {
      if (watch.repairedAt !== undefined) return watch
      if (!faultPresent(sample.state, fault)) return { ...watch, repairedAt: sample.t }
      if (watch.found) return watch
      // A reading is taken once an event has applied (probes placed, selector turned, a switch moved).
      if (sample.at !== 'after' && sample.at !== 'start') return watch
      const telling = tellingReading(sample.state, fault)
      return telling ? { ...watch, found: { t: sample.t, telling, state: sample.state } } : watch
    },
    ({ found, repairedAt }, end) => {
      // Judged only once the repair is made, so a live tick never tells which reading found the fault.
      if (found && repairedAt === undefined) {
        return {
          met: false,
          evidence: `Not judged: the fault was not put right by the end (${formatTime(end.t)}).`,
          at: end.t,
        }
      }
      if (found) {
        const { reading, healthy, because } = found.telling
        const tells = because ?? `a healthy circuit would read ${meterReadingName(healthy)}`
        return {
          met: true,
          evidence: `At ${formatTime(found.t)} the meter on ${probePointsName(reading, found.state)} read ${meterReadingName(reading)}; ${tells}.`,
          at: found.t,
        }
      }
      const when =
        repairedAt === undefined
          ? `by the end (${formatTime(end.t)})`
          : `before the repair at ${formatTime(repairedAt)}`
      return {
        met: false,
        evidence: `No meter reading ${when} told this fault apart from a healthy circuit.`,
        at: repairedAt ?? end.t,
      }
    },
  )
}

interface ReplacementWatch {
  needless: readonly { t: number; text: string }[]
  /** Healthy wires taken off, waiting to see whether they are made again between the same terminals. */
  lifted: readonly { t: number; from: string; to: string; name: string }[]
}

/** The replacement this moment is the start of, when the part was healthy (else undefined). */
function needlessReplacement(watch: ReplacementWatch, sample: Sample): ReplacementWatch | undefined {
  const { event, state, t } = sample
  switch (event?.type) {
    case 'fuse.replaced':
      return state.fuseBlown
        ? undefined
        : {
            ...watch,
            needless: [
              ...watch.needless,
              { t, text: `the control fuse at ${formatTime(t)}, which was not blown` },
            ],
          }
    case 'device.contactFitted': {
      const device = state.devices[event.device]
      if (!device || device.fault !== 'none' || device.contact !== device.spec.contact) return undefined
      const text = `the contact block of ${deviceName(event.device, state)} at ${formatTime(t)}, which was right`
      return { ...watch, needless: [...watch.needless, { t, text }] }
    }
    case 'motor.cableReplaced': {
      const { motor } = state
      const healthy =
        motor.openConductors.length === 0 &&
        motor.cable.u === 'u1' &&
        motor.cable.v === 'v1' &&
        motor.cable.w === 'w1'
      if (!healthy) return undefined
      return {
        ...watch,
        needless: [...watch.needless, { t, text: `the motor cable at ${formatTime(t)}, which was healthy` }],
      }
    }
    case 'wire.removed': {
      const wire = state.wires.find((w) => w.id === event.id)
      if (!wire || state.brokenWires.includes(wire.id)) return undefined
      const name = `wire ${wireName(wire.id, state) ?? ''}`.trim()
      return { ...watch, lifted: [...watch.lifted, { t, from: wire.from, to: wire.to, name }] }
    }
    case 'wire.added': {
      const same = watch.lifted.find(
        (w) => (w.from === event.from && w.to === event.to) || (w.from === event.to && w.to === event.from),
      )
      if (!same) return undefined
      const text = `${same.name}, taken off at ${formatTime(same.t)} and made again at ${formatTime(t)} although it was not broken`
      return { needless: [...watch.needless, { t, text }], lifted: watch.lifted.filter((w) => w !== same) }
    }
    default:
      return undefined
  }
}

/** Each healthy part replaced costs `costEach` points; the evidence names each one. */
export const noNeedlessReplacements: Evaluator<'noNeedlessReplacements'> = (objective) =>
  folding<ReplacementWatch>(
    { needless: [], lifted: [] },
    (watch, sample) => (sample.at === 'before' ? (needlessReplacement(watch, sample) ?? watch) : watch),
    ({ needless }) => {
      if (needless.length === 0) return { met: true, evidence: 'No healthy part was replaced.' }
      const lost = Math.min(objective.weight, objective.costEach * needless.length)
      return {
        met: false,
        points: objective.weight - lost,
        evidence: `${upperFirst(plural(needless.length, 'healthy part'))} replaced (${lost} points lost): ${joinTexts(needless.map((n) => n.text))}.`,
        at: needless[0]!.t,
      }
    },
  )
