// settingEquals / settingInRange: judged on the active (saved) value at the end of the attempt.
import { isSettingKey, settingDef, type SettingKey } from '../../model'
import { formatTime, formatValue } from '../format'
import type { AttemptTrace } from '../samples'
import type { Evaluator, Verdict } from './types'

function valueLabel(key: SettingKey, value: unknown): string {
  const def = settingDef(key)
  if (def.kind === 'choice') {
    const option = def.options.find((o) => o.value === value)
    if (option) return `“${option.label}”`
  }
  if (def.kind === 'number') return `${value} ${def.unit}`.trim()
  return formatValue(value)
}

/** When the active value last became what it is at the end (undefined: it was so from the start). */
function activeSince(trace: AttemptTrace, key: SettingKey): number | undefined {
  const { samples } = trace
  const final = samples[samples.length - 1].state.settings.active[key]
  for (let i = samples.length - 1; i > 0; i--) {
    if (samples[i - 1].state.settings.active[key] !== final) return samples[i].t
  }
  return undefined
}

function judge(
  trace: AttemptTrace,
  key: string,
  wanted: string,
  accepts: (value: unknown) => boolean,
): Verdict {
  if (!isSettingKey(key)) return { met: false, evidence: `"${key}" is not a drive setting.` }
  const final = trace.samples[trace.samples.length - 1].state
  const active = final.settings.active[key]
  const label = settingDef(key).label
  if (accepts(active)) {
    const since = activeSince(trace, key)
    const when = since === undefined ? 'from the start' : `since ${formatTime(since)}`
    return { met: true, evidence: `${label} is ${valueLabel(key, active)}, active ${when}.`, at: since }
  }
  const pending = final.settings.pending[key]
  const unsaved =
    pending !== undefined && accepts(pending)
      ? ` A change to ${valueLabel(key, pending)} was never saved.`
      : ''
  return {
    met: false,
    evidence: `${label} is ${valueLabel(key, active)} at the end (${formatTime(final.t)}); wanted ${wanted}.${unsaved}`,
  }
}

export const settingEquals: Evaluator<'settingEquals'> = (objective, { trace }) =>
  judge(
    trace,
    objective.key,
    isSettingKey(objective.key) ? valueLabel(objective.key, objective.value) : formatValue(objective.value),
    (value) => value === objective.value,
  )

export const settingInRange: Evaluator<'settingInRange'> = (objective, { trace }) =>
  judge(
    trace,
    objective.key,
    `${objective.min} to ${objective.max}`,
    (value) => typeof value === 'number' && value >= objective.min && value <= objective.max,
  )
