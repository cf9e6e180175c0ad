// Public state and reading types of the model. Everything is plain data: JSON-serialisable.
import type { DigitalInputNumber, PointId } from './points'
import type { InputFunction, SettingKey, SettingValue, SettingValues } from './settings'
import type { ContactType, DeviceSpec, MachineLoad, WireSpec } from './setup'

export type PowerState = 'off' | 'charging' | 'ready' | 'discharging'
export type ControlState =
  'stopped' | 'accelerating' | 'atSpeed' | 'decelerating' | 'rampStopping' | 'coasting'
export type Direction = 'forward' | 'reverse'

export type FaultCode = 'externalFault' | 'supplyOverload' | 'powerLost' | 'busOvervoltage'
export type AlarmCode =
  | 'raiseLowerNotSelected'
  | 'raiseWithoutLower'
  | 'lowerWithoutRaise'
  | 'raiseLowerWithoutInputs'
  | 'duplicateFunction'
  | 'noRunInput'
  | 'startWithoutStop'
  | 'reverseNotAllowed'
  | 'referenceSupplyOverload'

export interface Notice<C extends string = string> {
  code: C
  /** Plain words for the apprentice. */
  text: string
  /** What to check (faults and alarms). */
  check?: string
}

/** A message about the last event: refused actions, refused settings. */
export interface EventMessage {
  code:
    | 'settingRefused'
    | 'settingsSaved'
    | 'saveNeedsPower'
    | 'powerOnLocked'
    | 'lockNeedsPowerOff'
    | 'unknownDevice'
    | 'wrongDeviceKind'
    | 'unknownPoint'
    | 'wireRefused'
    | 'unknownWire'
    | 'resetRefused'
    | 'keypadDark'
  text: string
  key?: SettingKey
}

export interface DeviceState {
  spec: DeviceSpec
  /** The contact type actually fitted now (the label shows spec.contact until a block is fitted). */
  contact: ContactType
  pressed: boolean
  /** Selector 0|1, potentiometer 0..1. */
  position: number
  fault: 'none' | 'failedOpen' | 'welded' | 'wrongType'
}

/** Continuous quantities as closed-form pieces, anchored at `since` (ms, may be fractional). */
export interface BusPiece {
  /** charging: linear rise; steady: nominal; decayLoaded: electronics still drawing; decayIdle: bleed only. */
  mode: 'charging' | 'steady' | 'decayLoaded' | 'decayIdle'
  since: number
  volts: number
  /** Control electronics (keypad display, +24 V, +10 V) powered from the bus. */
  controlOn: boolean
}
export interface SpeedPiece {
  /** ramp: linear towards the target; track: equal to the target; coast: exponential decay; still: 0. */
  mode: 'still' | 'ramp' | 'track' | 'coast'
  since: number
  /** Signed output frequency in Hz (negative = reverse) at `since`. */
  hz: number
  /** Hz per ms (signed) in ramp and track modes. */
  slope: number
  /** The target line the piece was planned against: signed Hz at `since` and its slope (Hz per ms). */
  targetHz: number
  targetSlope: number
}
export interface ReferencePiece {
  since: number
  /** Raise/lower (electronic potentiometer) value in Hz at `since`. */
  hz: number
  /** Hz per ms while raise or lower acts (0 otherwise). */
  slope: number
}

export interface DriveMachineValue {
  power: PowerState
  control: ControlState
  fault: 'clear' | 'tripped'
  alarm: 'clear' | 'present'
}

export interface DriveConfig {
  source: 'keypad' | 'terminals'
  stopMode: 'ramp' | 'coast'
  /** Maintained run input, momentary start input, or no run command input assigned. */
  runMode: 'run' | 'start' | 'none'
  reverseAllowed: boolean
}

export interface DriveContext {
  config: DriveConfig
  /** Fault causes still present (a reset is refused while one is). */
  causes: { externalFault: boolean; supplyOverload: boolean }
  faults: FaultCode[]
  /** Keypad run latch (keypad control). */
  keypadRun: boolean
  /** Start/stop latch (momentary start with NC stop). */
  startLatch: boolean
  /** Restart interlock: a maintained run command must go OFF before it can start the drive. */
  interlock: boolean
  direction: Direction
  /** Logical levels of the input functions last seen (for edges). */
  signals: DriveSignals
}

export interface DriveSignals {
  run: boolean
  start: boolean
  stop: boolean
  reverse: boolean
  faultReset: boolean
  externalFault: boolean
}

export interface SimState {
  /** Simulated time, integer ms. */
  t: number
  devices: Record<string, DeviceState>
  /** Order of devices as declared. */
  deviceOrder: string[]
  wires: WireSpec[]
  brokenWires: string[]
  fuseBlown: boolean
  power: { on: boolean; locked: boolean }
  lineVolts: number
  machine: Required<MachineLoad>
  settings: { active: SettingValues; pending: Partial<Record<SettingKey, SettingValue>> }
  meter: { red: PointId | null; black: PointId | null }
  /** Latched ON/OFF of DI1..DI6 (index 0 = DI1): inputs in the transition band keep this. */
  inputs: boolean[]
  /** Raise/lower: which was pressed first while both are held ('firstWins'). */
  raiseLowerFirst: 'raise' | 'lower' | null
  drive: { value: DriveMachineValue; context: DriveContext }
  /** Summary of the last control-network solve (the network itself is memoised outside the state). */
  circuit: {
    key: string
    analogVolts: number
    supplyOverloaded: boolean
    referenceOverloaded: boolean
    relayClosed: boolean
  }
  bus: BusPiece
  speed: SpeedPiece
  reference: ReferencePiece
  /** Messages from the last event applied (refusals, save results). */
  messages: EventMessage[]
}

export interface InputReading {
  input: DigitalInputNumber
  point: PointId
  function: InputFunction
  /** Voltage across the input in its conducting direction (V). */
  volts: number
  /** Input current in mA (positive when the opto input conducts). */
  milliamps: number
  region: 'off' | 'transition' | 'on'
  on: boolean
}

export interface MeterReading {
  red: PointId | null
  black: PointId | null
  /** null when a probe is lifted. */
  volts: number | null
  mode: 'DC' | 'AC'
  /** The probes are on circuits with no connection between them (isolated from each other). */
  floating: boolean
}

export interface CircuitReading {
  /** +24 V output energised (electronics on, fuse intact, not folded back). */
  supplyOn: boolean
  supplyVolts: number
  supplyMilliamps: number
  /** The +24 V output would exceed its current limit (short or overload). */
  supplyOverloaded: boolean
  referenceVolts: number
  referenceOverloaded: boolean
  analogVolts: number
  relayClosed: boolean
  /** Voltage of every control-network point relative to drive 0 V. */
  nodes: Record<PointId, number>
  inputs: InputReading[]
  meter: MeterReading
}

/** Read-only: shares arrays (inputs, messages, alarms, faults) with its state and other readings. */
export interface DriveReading {
  t: number
  power: PowerState
  /** Supply disconnect closed. */
  lineOn: boolean
  locked: boolean
  busVolts: number
  /** DC bus above 50 V (NEC 460.6 / IEC 60204-1 6.2.4 thresholds in REFERENCES.md). */
  busHazard: boolean
  /** Control electronics and keypad display alive. Dark does NOT mean the bus is safe. */
  displayOn: boolean
  control: ControlState
  controlSource: 'keypad' | 'terminals'
  /** Output stage on (motor driven). */
  outputOn: boolean
  direction: Direction
  /** Reference in use, in Hz (before clamping to limits). */
  referenceHz: number
  /** What the output ramps towards now (0 when stopping). */
  targetHz: number
  /** Output frequency magnitude in Hz. */
  outputHz: number
  /** Shaft speed in rpm (signed: negative in reverse). */
  speedRpm: number
  synchronousRpm: number
  alarms: Notice<AlarmCode>[]
  faults: Notice<FaultCode>[]
  tripped: boolean
  /** A maintained run command is ON but must be cycled before the drive starts. */
  restartInterlock: boolean
  relayClosed: boolean
  /** DI1..DI6 ON/OFF. */
  inputs: boolean[]
  messages: EventMessage[]
}

/** One piece of a replay: from one event to the next everything follows closed forms. */
export interface TimelineSegment {
  /** Start (ms): the event's time, or 0 for the starting state. */
  from: number
  /** Start of the next segment (the last one ends at the last event's time). */
  to: number
  cause: { kind: 'start' } | { kind: 'event'; index: number; type: string }
  /** The full model state just after the event; sample inside the segment with sampleTimeline. */
  state: SimState
}

/** Moments inside segments where a closed-form piece ends (for timeline markers). */
export type BreakpointKind =
  | 'controlOn'
  | 'busCharged'
  | 'controlOff'
  | 'speedReached'
  | 'zeroSpeed'
  | 'standstill'
  | 'referenceLimit'
  | 'busOvervoltage'

export interface Timeline {
  segments: TimelineSegment[]
  breakpoints: { t: number; what: BreakpointKind }[]
  /** Time of the last event (or 0). */
  end: number
  eventCount: number
}

export type TimelineSample = DriveReading & { circuit: CircuitReading; segment: number }
