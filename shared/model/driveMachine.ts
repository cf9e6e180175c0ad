// The drive's discrete behaviour as a pure XState 5 machine: power, control, faults and alarms.
// The continuous part (bus volts, reference, speed) lives outside in closed form; the simulation
// tells this machine when a piece ends (BUS_CHARGED, CONTROL_OFF, TREND, STANDSTILL, OVERVOLTAGE) and
// when the output meets an open motor phase (PHASE_LOSS).
//
// Mapping onto the CiA 402 (IEC 61800-7-201) drive states, for readers who know that profile:
//
// | Slipway (power / control / fault)               | CiA 402 state            |
// | ----------------------------------------------- | ------------------------ |
// | off, or charging before the electronics wake    | Not ready to switch on   |
// | charging / discharging; ready with interlock    | Switch on disabled       |
// | ready, stopped, no fault                        | Ready to switch on       |
// | accelerating, atSpeed, decelerating             | Operation enabled        |
// | rampStopping (stop command, category 1)         | Operation enabled → Disable operation (ramp) |
// | coasting after a stop command (category 0)      | Switched on (output disabled)               |
// | coasting after a fault                          | Fault reaction active    |
// | tripped and stopped                             | Fault                    |
// Commands: run = Enable operation; stop = Disable operation; fault reset = Fault reset.
import { and, assign, not, setup, stateIn } from 'xstate'
import type { Direction, DriveConfig, DriveContext, DriveSignals, FaultCode } from './types'

export type DriveEvent =
  | { type: 'POWER_ON' }
  | { type: 'POWER_OFF'; controlOn: boolean }
  | { type: 'BUS_CHARGED' }
  | { type: 'CONTROL_OFF' }
  | { type: 'CONFIGURE'; config: DriveConfig }
  | { type: 'SIGNALS'; signals: DriveSignals }
  | { type: 'SUPPLY'; overloaded: boolean }
  | { type: 'ALARMS'; present: boolean }
  | { type: 'KEY'; key: 'run' | 'stop' | 'reset' }
  | { type: 'TREND'; trend: 'up' | 'down' | 'steady' }
  | { type: 'STANDSTILL' }
  | { type: 'OVERVOLTAGE' }
  | { type: 'PHASE_LOSS' }

type DriveMachineContext = DriveContext

export const NO_SIGNALS: DriveSignals = {
  run: false,
  start: false,
  stop: false,
  reverse: false,
  faultReset: false,
  externalFault: false,
}

export const DEFAULT_DRIVE_CONFIG: DriveConfig = {
  source: 'keypad',
  stopMode: 'ramp',
  runMode: 'none',
  reverseAllowed: false,
}

function withFault(faults: FaultCode[], code: FaultCode): FaultCode[] {
  return faults.includes(code) ? faults : [...faults, code]
}

function commanded(context: DriveMachineContext): boolean {
  if (context.config.source === 'keypad') return context.keypadRun
  if (context.config.runMode === 'run') return context.signals.run && !context.interlock
  if (context.config.runMode === 'start') return context.startLatch
  return false
}

function wantedDirection(context: DriveMachineContext, signals: DriveSignals): Direction {
  return context.config.source === 'terminals' && context.config.reverseAllowed && signals.reverse
    ? 'reverse'
    : 'forward'
}

function causeGone(context: DriveMachineContext): boolean {
  return !context.causes.externalFault && !context.causes.supplyOverload
}

// The three running states share one configuration: they differ only in the speed trend reported.
const RUNNING = {
  always: [
    { guard: 'hasFaults', target: 'coasting' },
    { guard: 'stopByCoast', target: 'coasting' },
    { guard: 'stopByRamp', target: 'rampStopping' },
  ],
  on: {
    TREND: [
      { guard: 'trendUp', target: 'accelerating' },
      { guard: 'trendDown', target: 'decelerating' },
      { target: 'atSpeed' },
    ],
    POWER_OFF: { target: 'coasting', actions: 'notePowerLost' },
  },
} as const

export const driveMachine = setup({
  types: {
    context: {} as DriveMachineContext,
    events: {} as DriveEvent,
  },
  guards: {
    hasFaults: ({ context }) => context.faults.length > 0,
    noFaults: ({ context }) => context.faults.length === 0,
    runCommanded: ({ context }) => context.faults.length === 0 && commanded(context),
    stopByCoast: ({ context }) => !commanded(context) && context.config.stopMode === 'coast',
    stopByRamp: ({ context }) => !commanded(context) && context.config.stopMode === 'ramp',
    trendUp: ({ event }) => event.type === 'TREND' && event.trend === 'up',
    trendDown: ({ event }) => event.type === 'TREND' && event.trend === 'down',
    controlStaysOn: ({ event }) => event.type === 'POWER_OFF' && event.controlOn,
    resetAllowed: ({ context }) => context.faults.length > 0 && causeGone(context),
    resetEdgeAllowed: ({ context, event }) =>
      event.type === 'SIGNALS' &&
      event.signals.faultReset &&
      !context.signals.faultReset &&
      context.faults.length > 0 &&
      !event.signals.externalFault &&
      !context.causes.supplyOverload,
    alarmsPresent: ({ event }) => event.type === 'ALARMS' && event.present,
    alarmsGone: ({ event }) => event.type === 'ALARMS' && !event.present,
  },
  actions: {
    takeSignals: assign(({ context, event }) => {
      if (event.type !== 'SIGNALS') return {}
      const s = event.signals
      const was = context.signals
      let startLatch = context.startLatch
      if (context.config.runMode === 'start') {
        if (s.start && !was.start && s.stop) startLatch = true
        if (!s.stop) startLatch = false
      } else startLatch = false
      return {
        signals: s,
        startLatch,
        interlock: context.interlock && s.run,
        direction: wantedDirection(context, s),
        causes: { ...context.causes, externalFault: s.externalFault },
        faults: s.externalFault ? withFault(context.faults, 'externalFault') : context.faults,
      }
    }),
    takeConfig: assign(({ context, event }) => {
      if (event.type !== 'CONFIGURE') return {}
      const config = event.config
      return {
        config,
        keypadRun: config.source === 'keypad' && context.keypadRun,
        startLatch: config.runMode === 'start' && context.startLatch,
        direction: wantedDirection({ ...context, config }, context.signals),
      }
    }),
    takeSupply: assign(({ context, event }) => {
      if (event.type !== 'SUPPLY') return {}
      return {
        causes: { ...context.causes, supplyOverload: event.overloaded },
        faults: event.overloaded ? withFault(context.faults, 'supplyOverload') : context.faults,
      }
    }),
    keypadRun: assign(({ context }) => ({ keypadRun: context.config.source === 'keypad' })),
    keypadStop: assign(({ context }) => ({
      keypadRun: false,
      startLatch: false,
      // Keypad stop also stops a terminal-controlled drive; a held run input must then be cycled.
      interlock: context.config.source === 'terminals' ? context.signals.run : context.interlock,
    })),
    clearFaults: assign(({ context }) => ({ faults: [], keypadRun: false, interlock: context.signals.run })),
    notePowerLost: assign(({ context }) => ({ faults: withFault(context.faults, 'powerLost') })),
    noteOvervoltage: assign(({ context }) => ({ faults: withFault(context.faults, 'busOvervoltage') })),
    notePhaseLoss: assign(({ context }) => ({ faults: withFault(context.faults, 'motorPhaseLost') })),
    armRestartInterlock: assign(({ context }) => ({ interlock: context.signals.run })),
    resetElectronics: assign(() => ({
      faults: [],
      keypadRun: false,
      startLatch: false,
      interlock: false,
      signals: NO_SIGNALS,
      causes: { externalFault: false, supplyOverload: false },
    })),
  },
}).createMachine({
  id: 'drive',
  type: 'parallel',
  context: {
    faults: [],
    keypadRun: false,
    startLatch: false,
    interlock: false,
    direction: 'forward',
    signals: NO_SIGNALS,
    config: DEFAULT_DRIVE_CONFIG,
    causes: { externalFault: false, supplyOverload: false },
  },
  on: {
    SIGNALS: [
      { guard: 'resetEdgeAllowed', actions: ['takeSignals', 'clearFaults'] },
      { actions: 'takeSignals' },
    ],
    CONFIGURE: { actions: 'takeConfig' },
    SUPPLY: { actions: 'takeSupply' },
    // Run and stop keys act in every state; run is only honoured in keypad control.
    KEY: [
      { guard: ({ event }) => event.key === 'run', actions: 'keypadRun' },
      { guard: ({ event }) => event.key === 'stop', actions: 'keypadStop' },
    ],
    OVERVOLTAGE: { guard: not('hasFaults'), actions: 'noteOvervoltage' },
    // The output met an open motor phase; a reset is allowed, and the next start trips again if still open.
    PHASE_LOSS: { guard: not('hasFaults'), actions: 'notePhaseLoss' },
  },
  states: {
    power: {
      initial: 'off',
      states: {
        off: { on: { POWER_ON: 'charging' } },
        charging: {
          on: {
            BUS_CHARGED: { target: 'ready', actions: 'armRestartInterlock' },
            POWER_OFF: [
              { guard: 'controlStaysOn', target: 'discharging' },
              { target: 'off', actions: 'resetElectronics' },
            ],
          },
        },
        ready: {
          on: {
            POWER_OFF: [
              { guard: 'controlStaysOn', target: 'discharging' },
              { target: 'off', actions: 'resetElectronics' },
            ],
          },
        },
        discharging: {
          on: { POWER_ON: 'charging', CONTROL_OFF: { target: 'off', actions: 'resetElectronics' } },
        },
      },
    },
    control: {
      initial: 'stopped',
      states: {
        stopped: {
          always: { guard: and(['runCommanded', stateIn({ power: 'ready' })]), target: 'accelerating' },
        },
        accelerating: RUNNING,
        atSpeed: RUNNING,
        decelerating: RUNNING,
        rampStopping: {
          always: [
            { guard: 'hasFaults', target: 'coasting' },
            { guard: and(['runCommanded', stateIn({ power: 'ready' })]), target: 'accelerating' },
            { guard: 'stopByCoast', target: 'coasting' },
          ],
          on: { STANDSTILL: 'stopped', POWER_OFF: { target: 'coasting', actions: 'notePowerLost' } },
        },
        coasting: { on: { STANDSTILL: 'stopped' } },
      },
    },
    fault: {
      initial: 'clear',
      states: {
        clear: { always: { guard: 'hasFaults', target: 'tripped' } },
        tripped: {
          always: { guard: 'noFaults', target: 'clear' },
          on: {
            KEY: {
              guard: and(['resetAllowed', ({ event }) => event.key === 'reset']),
              actions: 'clearFaults',
            },
          },
        },
      },
    },
    alarm: {
      initial: 'clear',
      states: {
        clear: { on: { ALARMS: { guard: 'alarmsPresent', target: 'present' } } },
        present: { on: { ALARMS: { guard: 'alarmsGone', target: 'clear' } } },
      },
    },
  },
})

export type DriveMachine = typeof driveMachine
