// The drive's settings catalogue: Slipway's own keys and plain-language labels (no numeric codes).

export const INPUT_FUNCTIONS = [
  'none',
  'run',
  'start',
  'stop',
  'raise',
  'lower',
  'reverse',
  'faultReset',
  'externalFault',
  'preset',
] as const
export type InputFunction = (typeof INPUT_FUNCTIONS)[number]

const INPUT_FUNCTION_LABELS: Record<InputFunction, string> = {
  none: 'Not used',
  run: 'Run (maintained contact)',
  start: 'Start (momentary, normally open)',
  stop: 'Stop (momentary, normally closed)',
  raise: 'Raise speed',
  lower: 'Lower speed',
  reverse: 'Reverse direction',
  faultReset: 'Fault reset',
  externalFault: 'External fault (normally closed: opening trips)',
  preset: 'Preset speed',
}

export const SETTING_GROUPS = [
  { id: 'motor', label: 'Motor nameplate' },
  { id: 'control', label: 'Command source' },
  { id: 'inputs', label: 'Digital inputs' },
  { id: 'reference', label: 'Speed reference' },
  { id: 'limits', label: 'Speed limits' },
  { id: 'ramps', label: 'Ramps and stopping' },
  { id: 'raiseLower', label: 'Raise / lower' },
  { id: 'output', label: 'Relay output' },
] as const
export type SettingGroup = (typeof SETTING_GROUPS)[number]['id']

interface SettingBase {
  key: string
  label: string
  group: SettingGroup
  help: string
  /** false: the drive refuses to save a new value while the motor is turning. */
  changeWhileRunning: boolean
}
export interface NumberSettingDef extends SettingBase {
  kind: 'number'
  unit: string
  min: number
  max: number
  step: number
  default: number
}
export interface ChoiceSettingDef extends SettingBase {
  kind: 'choice'
  unit?: string
  options: readonly { value: string | number; label: string }[]
  default: string | number
}
export interface BooleanSettingDef extends SettingBase {
  kind: 'boolean'
  default: boolean
}
export type SettingDef = NumberSettingDef | ChoiceSettingDef | BooleanSettingDef

const inputFunctionOptions = INPUT_FUNCTIONS.map((value) => ({ value, label: INPUT_FUNCTION_LABELS[value] }))

function inputFunctionSetting<N extends 1 | 2 | 3 | 4 | 5 | 6>(n: N) {
  return {
    key: `di${n}.function` as const,
    label: `DI${n} function`,
    group: 'inputs' as const,
    kind: 'choice' as const,
    options: inputFunctionOptions as readonly { value: InputFunction; label: string }[],
    default: 'none' as InputFunction,
    help: `What digital input ${n} does when it is ON. Give each function to one input only.`,
    changeWhileRunning: false,
  }
}

export const SETTINGS = [
  {
    key: 'motor.poles',
    label: 'Motor poles',
    group: 'motor',
    kind: 'choice',
    options: [
      { value: 2, label: '2 poles' },
      { value: 4, label: '4 poles' },
      { value: 6, label: '6 poles' },
      { value: 8, label: '8 poles' },
    ],
    default: 4,
    help: 'Number of magnetic poles of the motor. Synchronous speed = 120 × frequency ÷ poles.',
    changeWhileRunning: false,
  },
  {
    key: 'motor.ratedFrequency',
    label: 'Motor rated frequency',
    group: 'motor',
    kind: 'choice',
    unit: 'Hz',
    options: [
      { value: 50, label: '50 Hz' },
      { value: 60, label: '60 Hz' },
    ],
    default: 50,
    help: 'Frequency on the motor nameplate.',
    changeWhileRunning: false,
  },
  {
    key: 'motor.ratedSpeed',
    label: 'Motor rated speed',
    group: 'motor',
    kind: 'number',
    unit: 'rpm',
    min: 100,
    max: 3600,
    step: 1,
    default: 1460,
    help: 'Full-load speed on the nameplate; a little below synchronous speed (the difference is the slip).',
    changeWhileRunning: false,
  },
  {
    key: 'motor.ratedVoltage',
    label: 'Motor rated voltage',
    group: 'motor',
    kind: 'number',
    unit: 'V',
    min: 100,
    max: 690,
    step: 1,
    default: 400,
    help: 'Voltage on the nameplate for the connection used (star or delta).',
    changeWhileRunning: false,
  },
  {
    key: 'motor.ratedCurrent',
    label: 'Motor rated current',
    group: 'motor',
    kind: 'number',
    unit: 'A',
    min: 0.1,
    max: 100,
    step: 0.1,
    default: 7.5,
    help: 'Full-load current on the nameplate.',
    changeWhileRunning: false,
  },
  {
    key: 'control.source',
    label: 'Run commands from',
    group: 'control',
    kind: 'choice',
    options: [
      { value: 'keypad', label: 'Keypad (local)' },
      { value: 'terminals', label: 'Terminals (remote)' },
    ],
    default: 'keypad',
    help: 'Where run and stop commands come from. The keypad stop key stops the drive in either case.',
    changeWhileRunning: false,
  },
  {
    key: 'inputs.logic',
    label: 'Input logic',
    group: 'inputs',
    kind: 'choice',
    options: [
      { value: 'sink', label: 'Sink: common to 0 V, contact switches +24 V to the input' },
      { value: 'source', label: 'Source: common to +24 V, contact switches the input to 0 V' },
    ],
    default: 'sink',
    help: 'How the digital inputs are wired. Wiring for the other logic leaves every input OFF.',
    changeWhileRunning: false,
  },
  inputFunctionSetting(1),
  inputFunctionSetting(2),
  inputFunctionSetting(3),
  inputFunctionSetting(4),
  inputFunctionSetting(5),
  inputFunctionSetting(6),
  {
    key: 'reference.remoteSource',
    label: 'Remote speed reference',
    group: 'reference',
    kind: 'choice',
    options: [
      { value: 'keypad', label: 'Keypad setpoint' },
      { value: 'analog', label: 'Analog input (0–10 V)' },
      { value: 'raiseLower', label: 'Raise / lower inputs' },
      { value: 'preset', label: 'Preset speed' },
    ],
    default: 'analog',
    help: 'Where the speed reference comes from when run commands come from the terminals.',
    changeWhileRunning: false,
  },
  {
    key: 'reference.keypadSetpoint',
    label: 'Keypad setpoint',
    group: 'reference',
    kind: 'number',
    unit: 'Hz',
    min: 0,
    max: 120,
    step: 0.1,
    default: 25,
    help: 'Speed reference used in keypad control (and as the remote reference when chosen).',
    changeWhileRunning: true,
  },
  {
    key: 'speed.min',
    label: 'Minimum speed',
    group: 'limits',
    kind: 'number',
    unit: 'Hz',
    min: 0,
    max: 120,
    step: 0.1,
    default: 0,
    help: 'Lowest output frequency while running. On start the drive ramps at least to this speed.',
    changeWhileRunning: true,
  },
  {
    key: 'speed.max',
    label: 'Maximum speed',
    group: 'limits',
    kind: 'number',
    unit: 'Hz',
    min: 1,
    max: 120,
    step: 0.1,
    default: 50,
    help: 'Highest output frequency. Ramp times are measured from zero to this speed.',
    changeWhileRunning: true,
  },
  {
    key: 'ramp.accelSeconds',
    label: 'Acceleration time',
    group: 'ramps',
    kind: 'number',
    unit: 's',
    min: 0.1,
    max: 600,
    step: 0.1,
    default: 5,
    help: 'Time to accelerate from zero to maximum speed.',
    changeWhileRunning: true,
  },
  {
    key: 'ramp.decelSeconds',
    label: 'Deceleration time',
    group: 'ramps',
    kind: 'number',
    unit: 's',
    min: 0.1,
    max: 600,
    step: 0.1,
    default: 5,
    help: 'Time to decelerate from maximum speed to zero. Too short for a heavy load trips on bus overvoltage.',
    changeWhileRunning: true,
  },
  {
    key: 'stop.mode',
    label: 'Stop method',
    group: 'ramps',
    kind: 'choice',
    options: [
      { value: 'ramp', label: 'Ramp to standstill, then output off' },
      { value: 'coast', label: 'Output off at once, motor coasts' },
    ],
    default: 'ramp',
    help: 'Ramp is a controlled stop (IEC 60204-1 category 1); coast removes power at once (category 0).',
    changeWhileRunning: true,
  },
  {
    key: 'raiseLower.rate',
    label: 'Raise / lower rate',
    group: 'raiseLower',
    kind: 'number',
    unit: 'Hz/s',
    min: 0.1,
    max: 50,
    step: 0.1,
    default: 2,
    help: 'How fast the reference changes while raise or lower is held.',
    changeWhileRunning: true,
  },
  {
    key: 'raiseLower.bothHeld',
    label: 'Raise and lower held together',
    group: 'raiseLower',
    kind: 'choice',
    options: [
      { value: 'hold', label: 'Hold the reference' },
      { value: 'firstWins', label: 'The button pressed first wins' },
    ],
    default: 'hold',
    help: 'What happens when both buttons are held at once.',
    changeWhileRunning: true,
  },
  {
    key: 'raiseLower.memoryAtStop',
    label: 'Reference after a stop',
    group: 'raiseLower',
    kind: 'choice',
    options: [
      { value: 'keep', label: 'Keep the last reference' },
      { value: 'reset', label: 'Return to minimum speed' },
    ],
    default: 'keep',
    help: 'Whether the raise/lower reference is remembered when the drive stops.',
    changeWhileRunning: true,
  },
  {
    key: 'raiseLower.memoryAtPowerLoss',
    label: 'Reference after power loss',
    group: 'raiseLower',
    kind: 'choice',
    options: [
      { value: 'keep', label: 'Keep the last reference' },
      { value: 'reset', label: 'Return to minimum speed' },
    ],
    default: 'reset',
    help: 'Whether the raise/lower reference survives the drive losing power (like a retained value).',
    changeWhileRunning: true,
  },
  {
    key: 'preset.speed1',
    label: 'Preset speed',
    group: 'reference',
    kind: 'number',
    unit: 'Hz',
    min: 0,
    max: 120,
    step: 0.1,
    default: 10,
    help: 'Reference used while a preset-speed input is ON, or when chosen as the remote reference.',
    changeWhileRunning: true,
  },
  {
    key: 'relay.function',
    label: 'Relay closes when',
    group: 'output',
    kind: 'choice',
    options: [
      { value: 'running', label: 'Running' },
      { value: 'ready', label: 'Ready to run' },
      { value: 'fault', label: 'Tripped on a fault' },
      { value: 'atSpeed', label: 'At the reference speed' },
    ],
    default: 'running',
    help: 'When the relay output contact K1A–K1B closes.',
    changeWhileRunning: true,
  },
  {
    key: 'direction.reverseAllowed',
    label: 'Reverse allowed',
    group: 'control',
    kind: 'boolean',
    default: false,
    help: 'Whether a reverse input may turn the motor the other way.',
    changeWhileRunning: false,
  },
] as const satisfies readonly SettingDef[]

type Catalogue = (typeof SETTINGS)[number]
export type SettingKey = Catalogue['key']
type ValueOf<D> = D extends { kind: 'number' }
  ? number
  : D extends { kind: 'boolean' }
    ? boolean
    : D extends { options: readonly { value: infer V }[] }
      ? V
      : never
export type SettingValues = { [K in SettingKey]: ValueOf<Extract<Catalogue, { key: K }>> }
export type SettingValue = SettingValues[SettingKey]

export const SETTING_KEYS = SETTINGS.map((s) => s.key) as unknown as readonly [SettingKey, ...SettingKey[]]

const byKey = new Map<string, SettingDef>(SETTINGS.map((s) => [s.key, s]))

export function isSettingKey(key: string): key is SettingKey {
  return byKey.has(key)
}

export function settingDef(key: SettingKey): SettingDef {
  return byKey.get(key) as SettingDef
}

export const DEFAULT_SETTINGS: SettingValues = Object.fromEntries(
  SETTINGS.map((s) => [s.key, s.default]),
) as SettingValues

export type SettingCheck = { ok: true; value: SettingValue } | { ok: false; message: string }

function formatNumber(value: number, unit: string): string {
  return unit ? `${value} ${unit}` : String(value)
}

/** Checks one value against its catalogue entry; the message says what is allowed. */
export function validateSetting(key: string, value: unknown): SettingCheck {
  const def = byKey.get(key)
  if (!def) return { ok: false, message: `"${key}" is not a drive setting.` }
  if (def.kind === 'number') {
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      return { ok: false, message: `${def.label} must be a number.` }
    }
    if (value < def.min || value > def.max) {
      return {
        ok: false,
        message: `${def.label} must be between ${formatNumber(def.min, def.unit)} and ${formatNumber(def.max, def.unit)}.`,
      }
    }
    const steps = (value - def.min) / def.step
    if (Math.abs(steps - Math.round(steps)) > 1e-6) {
      return { ok: false, message: `${def.label} goes in steps of ${formatNumber(def.step, def.unit)}.` }
    }
    return { ok: true, value }
  }
  if (def.kind === 'boolean') {
    if (typeof value !== 'boolean') return { ok: false, message: `${def.label} must be yes or no.` }
    return { ok: true, value }
  }
  const option = def.options.find((o) => o.value === value)
  if (!option) {
    const allowed = def.options.map((o) => o.label).join(', ')
    return { ok: false, message: `${def.label} must be one of: ${allowed}.` }
  }
  return { ok: true, value: option.value as SettingValue }
}

/** Rules between settings, checked when settings are saved. Returns one message per broken rule. */
export function crossCheckSettings(values: SettingValues): { keys: SettingKey[]; message: string }[] {
  const problems: { keys: SettingKey[]; message: string }[] = []
  if (values['speed.min'] >= values['speed.max']) {
    problems.push({ keys: ['speed.min', 'speed.max'], message: 'Minimum speed must be below maximum speed.' })
  }
  const synchronous = (120 * values['motor.ratedFrequency']) / values['motor.poles']
  if (values['motor.ratedSpeed'] >= synchronous || values['motor.ratedSpeed'] < 0.8 * synchronous) {
    problems.push({
      keys: ['motor.ratedSpeed', 'motor.poles', 'motor.ratedFrequency'],
      message: `Rated speed must be a little below the synchronous speed of ${synchronous} rpm (within 20 %).`,
    })
  }
  return problems
}

export function inputFunctionKey(n: number): SettingKey {
  return `di${n}.function` as SettingKey
}
