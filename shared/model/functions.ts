// From input ON/OFF states and the saved settings to the drive's logical signals and configuration.
import { DIGITAL_INPUT_NUMBERS } from './points'
import { inputFunctionKey, type InputFunction, type SettingValues } from './settings'
import type { DriveConfig, DriveSignals } from './types'

const functionsCache = new WeakMap<SettingValues, InputFunction[]>()
let lastFunctionsOf: SettingValues | null = null
let lastFunctions: InputFunction[] = []

/** Function of DI1..DI6 (cached per settings object: settings are replaced, never mutated). */
export function inputFunctions(settings: SettingValues): InputFunction[] {
  if (settings === lastFunctionsOf) return lastFunctions
  let fns = functionsCache.get(settings)
  if (!fns) {
    fns = DIGITAL_INPUT_NUMBERS.map((n) => settings[inputFunctionKey(n)] as InputFunction)
    functionsCache.set(settings, fns)
  }
  lastFunctionsOf = settings
  lastFunctions = fns
  return fns
}

type Levels = Record<InputFunction, boolean>
/** Levels by the ON/OFF pattern of DI1..DI6 (a 6-bit mask), per input-function list. */
const levelsTables = new WeakMap<InputFunction[], Levels[]>()

let lastInputs: readonly boolean[] | null = null
let lastSettings: SettingValues | null = null
let lastLevels: Levels | null = null

/** ON if any input with that function is ON (one shared object per function list and input pattern). */
export function functionLevels(settings: SettingValues, inputs: readonly boolean[]): Levels {
  // Settling asks several times in a row for the same inputs: answer those without any lookup.
  if (inputs === lastInputs && settings === lastSettings) return lastLevels!
  const fns = inputFunctions(settings)
  let mask = 0
  for (let i = 0; i < fns.length; i++) if (inputs[i]) mask |= 1 << i
  let table = levelsTables.get(fns)
  if (!table) {
    table = []
    levelsTables.set(fns, table)
  }
  const levels = (table[mask] ??= levelsFor(fns, inputs))
  lastInputs = inputs
  lastSettings = settings
  lastLevels = levels
  return levels
}

function levelsFor(fns: InputFunction[], inputs: readonly boolean[]): Levels {
  const levels: Levels = {
    none: false,
    run: false,
    start: false,
    stop: false,
    raise: false,
    lower: false,
    reverse: false,
    faultReset: false,
    externalFault: false,
    preset: false,
  }
  for (let i = 0; i < fns.length; i++) if (inputs[i]) levels[fns[i]] = true
  return levels
}

export function isAssigned(settings: SettingValues, fn: InputFunction): boolean {
  return inputFunctions(settings).includes(fn)
}

/**
 * The signals the drive logic sees. The external-fault input is fail-safe (normally closed): the
 * fault is present while the assigned input is OFF (common practice for monitoring contacts).
 */
export function driveSignals(
  settings: SettingValues,
  levels: Record<InputFunction, boolean>,
  controlOn: boolean,
): DriveSignals {
  return {
    run: levels.run,
    start: levels.start,
    stop: levels.stop,
    reverse: levels.reverse,
    faultReset: levels.faultReset,
    externalFault: controlOn && isAssigned(settings, 'externalFault') && !levels.externalFault,
  }
}

/** Whether driveSignals(settings, levels, true) would equal `seen` (without building it). */
export function signalsMatch(
  settings: SettingValues,
  levels: Record<InputFunction, boolean>,
  seen: DriveSignals,
): boolean {
  return (
    levels.run === seen.run &&
    levels.start === seen.start &&
    levels.stop === seen.stop &&
    levels.reverse === seen.reverse &&
    levels.faultReset === seen.faultReset &&
    (isAssigned(settings, 'externalFault') && !levels.externalFault) === seen.externalFault
  )
}

export function driveConfig(settings: SettingValues): DriveConfig {
  const fns = inputFunctions(settings)
  return {
    source: settings['control.source'],
    stopMode: settings['stop.mode'],
    runMode: fns.includes('run') ? 'run' : fns.includes('start') ? 'start' : 'none',
    reverseAllowed: settings['direction.reverseAllowed'],
  }
}

export function sameSignals(a: DriveSignals, b: DriveSignals): boolean {
  return (
    a.run === b.run &&
    a.start === b.start &&
    a.stop === b.stop &&
    a.reverse === b.reverse &&
    a.faultReset === b.faultReset &&
    a.externalFault === b.externalFault
  )
}

export function sameConfig(a: DriveConfig, b: DriveConfig): boolean {
  return (
    a.source === b.source &&
    a.stopMode === b.stopMode &&
    a.runMode === b.runMode &&
    a.reverseAllowed === b.reverseAllowed
  )
}
