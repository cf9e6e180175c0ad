// The simulation's entry points: build, apply an event, advance time (see README.md).
export { createSimulation, DEFAULT_LINE_VOLTS, DEFAULT_MACHINE } from './createSimulation'
export { applyEvent, applyEventCollecting } from './applyEvent'
export { advance, advanceForSample } from './time'
export { activeReference, isOutputOn, isRunning, rampRates } from './settle'
