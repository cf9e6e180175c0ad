// Public state and reading types of the model. Everything is plain data: JSON-serialisable.
import type { MeterMode } from './meterModes'
import type { DigitalInputNumber, OutputPhase, PointId } from './points'
import type { InputFunction, SettingKey, SettingValue, SettingValues } from './settings'
import type {
  ContactType,
  DeviceSpec,
  InjectedFault,
  LockTag,
  MachineLoad,
  MotorCable,
  MotorNameplate,
  SupervisorLock,
  WireSpec,
} from './setup'

export type PowerState = 'off' | 'charging' | 'ready' | 'discharging'
export type ControlState =
  'stopped' | 'accelerating' | 'atSpeed' | 'decelerating' | 'rampStopping' | 'coasting'
export type Direction = 'forward' | 'reverse'

export type FaultCode = 'externalFault' | 'supplyOverload' | 'powerLost' | 'busOvervoltage' | 'motorPhaseLost'
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
  /** Our own short code, as a small display shows it (faults T-…, alarms W-…). */
  short: string
  /** Plain words for the apprentice: what is wrong. */
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
    | 'lockNotYours'
    | 'noLockToRemove'
    | 'unknownDevice'
    | 'wrongDeviceKind'
    | 'unknownPoint'
    | 'wireRefused'
    | 'unknownWire'
    | 'resetRefused'
    | 'keypadDark'
    | 'terminalOccupied'
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
  /**
   * The disconnect. `locked`: the apprentice's own lock (with `tag`, what they wrote on it, when the log
   * recorded one); `supervisorLock`: someone else's lock from the story. Power stays off while either is on.
   */
  power: { on: boolean; locked: boolean; tag?: LockTag; supervisorLock?: SupervisorLock }
  lineVolts: number
  machine: Required<MachineLoad>
  /** The motor and its cable (the nameplate never changes; the cable changes with motor events). */
  motor: MotorState
  settings: { active: SettingValues; pending: Partial<Record<SettingKey, SettingValue>> }
  /** Probe positions and the selector position. */
  meter: { red: PointId | null; black: PointId | null; mode: MeterMode }
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
  /**
   * Drive inputs that stopped responding (an injected fault): read OFF whatever their terminal sees. They
   * stay dead (the damage is in the drive); absent on a bench without one.
   */
  deadInputs?: readonly DigitalInputNumber[]
  /**
   * Settings changed behind the apprentice's back (an injected fault), with the value each had before;
   * a key leaves when the setting is saved back to that value. Absent on a bench without one.
   */
  settingsBefore?: Partial<Record<SettingKey, SettingValue>>
  /** Faults an instructor put in mid-attempt (live classroom), in order; absent before the first. */
  injected?: readonly InjectedFault[]
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

export interface MotorState {
  nameplate: MotorNameplate
  cable: MotorCable
  /** Conductors broken inside the cable (an injected fault until the cable is replaced). */
  openConductors: OutputPhase[]
}

/**
 * What the meter's window shows: nothing (off); a voltage (`volts`, null while a probe is lifted: the
 * window reads zero); a resistance (`ohms`); over-range ("OL": open circuit, or above the range); or a
 * voltage-present warning when resistance or continuity is selected across a voltage.
 */
export type MeterShows = 'blank' | 'volts' | 'ohms' | 'overRange' | 'voltagePresent'

export interface MeterReading {
  red: PointId | null
  black: PointId | null
  /** The selector position. */
  mode: MeterMode
  shows: MeterShows
  /** The voltage shown on V AC or V DC (red − black; AC is a magnitude); null on other modes or with a probe lifted. */
  volts: number | null
  /** The resistance shown on resistance or continuity; null when over-range or on other modes. */
  ohms: number | null
  /** Continuity mode: the tone sounds (and the window's tone mark lights) below the threshold. */
  tone: boolean
  /** The probes are on circuits with no connection between them (isolated from each other). */
  floating: boolean
  /**
   * Not shown by the meter (for the grader's safety record): resistance or continuity is selected with a
   * probe on an energised circuit — a live control circuit, a live line or charged DC bus, the proving unit.
   */
  liveResistanceTest: boolean
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
  /** Shaft speed in rpm as the drive computes it from its motor settings (signed: negative in reverse). */
  speedRpm: number
  synchronousRpm: number
  /** Output voltage, line to line RMS (fundamental): V/Hz up to base frequency, constant above; 0 when off. */
  outputVolts: number
  /** Output current, RMS per phase, from the motor's nameplate and the machine's load; 0 when off. */
  outputAmps: number
  /** Motor torque as a percentage of its rated torque (the load's need at this speed); 0 when off. */
  torquePercent: number
  /**
   * The real shaft, as someone at the machine sees it turn (signed, + = the machine's forward): the drive's
   * speed, reversed when the motor cable has a pair of phases swapped.
   */
  motorRpm: number
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

/** One line of the drive's I/O status screen. */
export interface FrontPanelInput {
  input: DigitalInputNumber
  function: InputFunction
  on: boolean
}

/** What the drive's display shows while it is lit (never while it is dark). */
export interface FrontPanelStatus {
  /** What the drive is doing: power-up and power-down, tripped, or its control state. */
  state: 'startingUp' | 'poweringDown' | 'tripped' | ControlState
  commandSource: 'keypad' | 'terminals'
  direction: Direction
  outputOn: boolean
  outputHz: number
  referenceHz: number
  outputVolts: number
  outputAmps: number
  torquePercent: number
  busVolts: number
  /** The drive's own estimate from its motor settings. */
  speedRpm: number
  faults: Notice<FaultCode>[]
  alarms: Notice<AlarmCode>[]
  restartInterlock: boolean
}

/** The I/O status screen (our own design): input states, the relay, the analog input as the drive reads it. */
export interface FrontPanelIo {
  inputs: FrontPanelInput[]
  relayClosed: boolean
  analogVolts: number
}

/**
 * Everything the drive's front panel shows — and nothing else. A screen built from this cannot show what a
 * person at a real drive could not see: no display while the electronics are dark, and no input voltages
 * or currents (those are for the meter).
 */
export interface FrontPanelReading {
  /** Display and keypad lit: the control electronics are powered. */
  lit: boolean
  /** The charge lamp, fed from the DC bus itself: lit while the bus is above 60 V, dark display or not. */
  chargeLamp: boolean
  status: FrontPanelStatus | null
  io: FrontPanelIo | null
}
