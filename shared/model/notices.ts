// Alarms (configuration conflicts that do not stop the drive) and fault texts, in plain words, each with
// our own short code for a small display: T-… for a trip (fault), W-… for a warning (alarm).
import { DIGITAL_INPUT_NUMBERS } from './points'
import { settingDef, type InputFunction, type SettingValues } from './settings'
import { inputFunctions } from './functions'
import type { AlarmCode, FaultCode, Notice } from './types'

function fnLabel(fn: InputFunction): string {
  const def = settingDef('di1.function')
  const option = def.kind === 'choice' ? def.options.find((o) => o.value === fn) : undefined
  return option ? option.label.toLowerCase() : fn
}

type AlarmEntry = { normal?: Notice<AlarmCode>[]; overloaded?: Notice<AlarmCode>[] }

const alarmCache = new WeakMap<SettingValues, AlarmEntry>()

// Every reading asks, and a replay's readings ask about the same settings object in long runs.
let lastSettings: SettingValues | null = null
let lastEntry: AlarmEntry = {}

/** Alarms for the saved settings (cached per settings object: settings are replaced, never mutated). */
export function alarmsFor(settings: SettingValues, referenceOverloaded: boolean): Notice<AlarmCode>[] {
  let entry = settings === lastSettings ? lastEntry : alarmCache.get(settings)
  if (!entry) {
    entry = {}
    alarmCache.set(settings, entry)
  }
  lastSettings = settings
  lastEntry = entry
  const slot = referenceOverloaded ? 'overloaded' : 'normal'
  return (entry[slot] ??= computeAlarms(settings, referenceOverloaded))
}

function computeAlarms(settings: SettingValues, referenceOverloaded: boolean): Notice<AlarmCode>[] {
  const fns = inputFunctions(settings)
  const has = (fn: InputFunction) => fns.includes(fn)
  const alarms: Notice<AlarmCode>[] = []
  const raiseLowerSource = settings['reference.remoteSource'] === 'raiseLower'
  if ((has('raise') || has('lower')) && !raiseLowerSource) {
    alarms.push({
      code: 'raiseLowerNotSelected',
      short: 'W-RLS',
      text: 'Raise/lower inputs are assigned, but the remote speed reference is not set to raise/lower.',
      check: 'Set "Remote speed reference" to "Raise / lower inputs" and save.',
    })
  }
  if (has('raise') && !has('lower')) {
    alarms.push({
      code: 'raiseWithoutLower',
      short: 'W-RNL',
      text: 'A raise input is assigned without a lower input.',
      check: 'Assign "Lower speed" to another input.',
    })
  }
  if (has('lower') && !has('raise')) {
    alarms.push({
      code: 'lowerWithoutRaise',
      short: 'W-LNR',
      text: 'A lower input is assigned without a raise input.',
      check: 'Assign "Raise speed" to another input.',
    })
  }
  if (raiseLowerSource && !has('raise') && !has('lower')) {
    alarms.push({
      code: 'raiseLowerWithoutInputs',
      short: 'W-RLN',
      text: 'The remote reference is raise/lower, but no input is assigned to raise or lower.',
      check: 'Assign "Raise speed" and "Lower speed" to two inputs.',
    })
  }
  const seen = new Map<InputFunction, number>()
  fns.forEach((fn, i) => {
    if (fn === 'none') return
    const first = seen.get(fn)
    if (first === undefined) seen.set(fn, DIGITAL_INPUT_NUMBERS[i])
    else
      alarms.push({
        code: 'duplicateFunction',
        short: 'W-DUP',
        text: `DI${first} and DI${DIGITAL_INPUT_NUMBERS[i]} both have the function "${fnLabel(fn)}".`,
        check: 'Give each function to one input only.',
      })
  })
  if (settings['control.source'] === 'terminals' && !has('run') && !has('start')) {
    alarms.push({
      code: 'noRunInput',
      short: 'W-RUN',
      text: 'Run commands come from the terminals, but no input is assigned to run or start.',
      check: 'Assign "Run" or "Start" to an input, or choose keypad control.',
    })
  }
  if (has('start') && !has('stop')) {
    alarms.push({
      code: 'startWithoutStop',
      short: 'W-STP',
      text: 'A momentary start input is assigned without a stop input.',
      check: 'Assign "Stop" to the input wired to the normally closed stop button.',
    })
  }
  if (has('reverse') && !settings['direction.reverseAllowed']) {
    alarms.push({
      code: 'reverseNotAllowed',
      short: 'W-REV',
      text: 'A reverse input is assigned, but reverse is not allowed: it will be ignored.',
      check: 'Allow reverse, or remove the reverse function.',
    })
  }
  if (referenceOverloaded) {
    alarms.push({
      code: 'referenceSupplyOverload',
      short: 'W-10V',
      text: 'The +10 V reference is overloaded and has switched itself off.',
      check: 'Look for a short between +10 and AIC/0V, or a potentiometer of too low a resistance.',
    })
  }
  return alarms
}

const FAULT_TEXTS: Record<FaultCode, { short: string; text: string; check: string }> = {
  externalFault: {
    short: 'T-EXT',
    text: 'External fault: the external fault input is OFF (its normally closed circuit opened).',
    check: 'Find why the external circuit opened; when the input is ON again, reset.',
  },
  supplyOverload: {
    short: 'T-24V',
    text: 'Control supply overloaded: the +24 V output is shorted or overloaded and has switched itself off.',
    check: 'Look for a wire or contact joining +24 to 0V or DIC; remove the short, then reset.',
  },
  powerLost: {
    short: 'T-LINE',
    text: 'Supply lost while running: the output switched off and the motor coasted.',
    check: 'Restore the supply, then reset.',
  },
  busOvervoltage: {
    short: 'T-BUS',
    text: 'DC bus overvoltage while slowing down: the load fed energy back faster than the drive can absorb.',
    check: 'Lengthen the deceleration time (or stop by coasting), then reset.',
  },
  motorPhaseLost: {
    short: 'T-MPH',
    text: 'Motor phase lost: an output phase (U, V or W) carries no current, so the motor circuit is open.',
    check:
      'Isolate and prove dead, then check the motor cable end to end and its landing on U1, V1, W1; reset.',
  },
}

export function faultNotice(code: FaultCode): Notice<FaultCode> {
  return { code, ...FAULT_TEXTS[code] }
}
