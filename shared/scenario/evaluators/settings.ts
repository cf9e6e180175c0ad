// settingEquals / settingInRange: judged on the active (saved) value at the end of the attempt.
import { isSettingKey } from '../../model'
import { formatTime } from '../format'
import { settingName, settingValueName } from '../names'
import type { Sample } from '../samples'
import { fixed, folding, type Folding } from './types'
import type { Evaluator } from './types'

interface Watch {
  /** The active value at the last sample. */
  value: unknown
  /** When the active value last changed (undefined: it has been so from the start). */
  since: number | undefined
}

function judge(start: Sample, key: string, wanted: string, accepts: (value: unknown) => boolean): Folding {
  if (!isSettingKey(key)) {
    return fixed({ met: false, evidence: 'The objective names a setting the drive does not have.' })
  }
  const label = settingName(key)
  const initial: Watch = { value: start.state.settings.active[key], since: undefined }
  return folding(
    initial,
    (watch, sample) => {
      const value = sample.state.settings.active[key]
      return value === watch.value ? watch : { value, since: sample.t }
    },
    ({ since }, end) => {
      const active = end.state.settings.active[key]
      if (accepts(active)) {
        const when = since === undefined ? 'from the start' : `since ${formatTime(since)}`
        return {
          met: true,
          evidence: `The setting ${label} is ${settingValueName(key, active)}, active ${when}.`,
          at: since,
        }
      }
      const pending = end.state.settings.pending[key]
      const unsaved =
        pending !== undefined && accepts(pending)
          ? ` A change to ${settingValueName(key, pending)} was never saved.`
          : ''
      return {
        met: false,
        evidence: `The setting ${label} is ${settingValueName(key, active)} at the end (${formatTime(end.t)}); wanted ${wanted}.${unsaved}`,
      }
    },
  )
}

export const settingEquals: Evaluator<'settingEquals'> = (objective, { start }) =>
  judge(
    start,
    objective.key,
    settingValueName(objective.key, objective.value),
    (value) => value === objective.value,
  )

export const settingInRange: Evaluator<'settingInRange'> = (objective, { start }) =>
  judge(
    start,
    objective.key,
    `${objective.min} to ${settingValueName(objective.key, objective.max)}`,
    (value) => typeof value === 'number' && value >= objective.min && value <= objective.max,
  )
