// Setups and small helpers shared by the model tests (an invented bench: the "Harbour Lane" test rig).
import {
  applyEvent,
  createSimulation,
  readDrive,
  type AttemptEvent,
  type SimState,
  type SimulationSetup,
  type WireSpec,
} from '../../../shared/model/index'

export const wire = (id: string, from: string, to: string): WireSpec => ({ id, from, to, colour: 'blue' })

/** Sink wiring: DIC to 0V, each contact switches +24 V into its input. */
export function raiseLowerSetup(overrides: Partial<SimulationSetup> = {}): SimulationSetup {
  return {
    devices: [
      { id: 'runSel', kind: 'selector', label: 'Run / stop', contact: 'NO' },
      { id: 'raisePb', kind: 'pushbutton', label: 'Raise', contact: 'NO' },
      { id: 'lowerPb', kind: 'pushbutton', label: 'Lower', contact: 'NO' },
    ],
    wires: [
      wire('c', 'drive.dcom', 'drive.0v'),
      wire('r1', 'drive.p24', 'runSel.a'),
      wire('r2', 'runSel.b', 'drive.di1'),
      wire('u1', 'drive.p24', 'raisePb.a'),
      wire('u2', 'raisePb.b', 'drive.di2'),
      wire('d1', 'drive.p24', 'lowerPb.a'),
      wire('d2', 'lowerPb.b', 'drive.di3'),
    ],
    settings: {
      'control.source': 'terminals',
      'di1.function': 'run',
      'di2.function': 'raise',
      'di3.function': 'lower',
      'reference.remoteSource': 'raiseLower',
      'speed.min': 5,
      'speed.max': 50,
      'ramp.accelSeconds': 5,
      'ramp.decelSeconds': 5,
      'raiseLower.rate': 2,
    },
    power: { on: true, locked: false },
    faults: [],
    ...overrides,
  }
}

/** Applies events in order; each event's t is taken as given. */
export function run(state: SimState, events: AttemptEvent[]): SimState {
  return events.reduce(applyEvent, state)
}

export function start(setup: SimulationSetup = raiseLowerSetup()): SimState {
  return createSimulation(setup)
}

export const hz = (state: SimState) => readDrive(state).outputHz
export const control = (state: SimState) => readDrive(state).control
