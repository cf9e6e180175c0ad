// Building a simulation from a scenario's starting state (validated; bad setups get a clear error).
import { z } from 'zod'
import { nominalBusVolts } from './bus'
import { initialDrive, sendDrive } from './driveTransitions'
import { ModelInputError } from './errors'
import { driveConfig } from './functions'
import { STRAIGHT_CABLE } from './motorCable'
import { deviceFaultOf, injectFault } from './injection'
import { nameplateFromSettings, nameplateProblems } from './nameplate'
import { crossCheckSettings, DEFAULT_SETTINGS, validateSetting, type SettingValues } from './settings'
import { simulationSetupSchema, type SimulationSetup } from './setup'
import { settle } from './settle'
import type { DeviceState, SimState } from './types'

export const DEFAULT_LINE_VOLTS = 400
/**
 * Default load: coast time constant 4 s; any decel ramp tolerated; a constant-torque machine needing 70 %
 * of the motor's rated torque (ours, for the demo machine).
 */
export const DEFAULT_MACHINE = {
  coastSeconds: 4,
  minDecelSeconds: 0,
  loadKind: 'constantTorque',
  loadFraction: 0.7,
} as const satisfies SimState['machine']

function fail(message: string): never {
  throw new ModelInputError(message)
}

function checkSetup(setup: SimulationSetup): SettingValues {
  const ids = new Set<string>()
  for (const d of setup.devices) {
    if (ids.has(d.id)) fail(`Two devices are called "${d.id}".`)
    ids.add(d.id)
  }
  const wireIds = new Set<string>()
  for (const w of setup.wires) {
    if (wireIds.has(w.id)) fail(`Two wires are called "${w.id}".`)
    wireIds.add(w.id)
  }
  for (const f of setup.faults) {
    if (f.kind === 'brokenWire' && !wireIds.has(f.wireId))
      fail(`The broken-wire fault names no wire "${f.wireId}".`)
    if ('device' in f) {
      const device = setup.devices.find((d) => d.id === f.device)
      if (!device) fail(`The ${f.kind} fault names no device "${f.device}".`)
      if (device.kind === 'potentiometer')
        fail(`The ${f.kind} fault needs a device with a contact, not "${f.device}".`)
    }
  }
  const changed = new Set<string>()
  for (const f of setup.faults) {
    if (f.kind !== 'settingChanged') continue
    if (changed.has(f.key)) fail(`Two setting faults change "${f.key}".`)
    changed.add(f.key)
  }
  if (setup.power.on && setup.power.locked) fail('The disconnect cannot be locked while it is on.')
  if (setup.power.on && setup.power.supervisorLock)
    fail(`The disconnect cannot carry ${setup.power.supervisorLock.name}'s lock while it is on.`)
  if (setup.motor) {
    const problem = nameplateProblems(setup.motor)[0]
    if (problem) fail(`Motor nameplate ${setup.motor.serial}: ${problem.message}`)
  }
  const active: Record<string, unknown> = { ...DEFAULT_SETTINGS }
  for (const [key, value] of Object.entries(setup.settings)) {
    const check = validateSetting(key, value)
    if (!check.ok) fail(`Starting setting ${key}: ${check.message}`)
    active[key] = check.value
  }
  const problems = crossCheckSettings(active as SettingValues)
  if (problems.length > 0) fail(`Starting settings: ${problems[0].message}`)
  for (const f of setup.faults) {
    if (f.kind !== 'settingChanged') continue
    const check = validateSetting(f.key, f.value)
    if (!check.ok) fail(`The setting fault on ${f.key}: ${check.message}`)
    if (check.value === active[f.key])
      fail(`The setting fault on ${f.key} changes nothing: it is already ${String(check.value)}.`)
    const clash = crossCheckSettings({ ...active, [f.key]: check.value } as SettingValues)[0]
    if (clash) fail(`The setting fault on ${f.key}: ${clash.message}`)
  }
  return active as SettingValues
}

export function createSimulation(setup: SimulationSetup): SimState {
  const parsed = simulationSetupSchema.safeParse(setup)
  if (!parsed.success) fail(`The simulation setup is not valid: ${z.prettifyError(parsed.error)}`)
  const valid = parsed.data
  const active = checkSetup(valid)
  const devices: Record<string, DeviceState> = {}
  for (const spec of valid.devices) {
    const fault = valid.faults.find((f) => 'device' in f && f.device === spec.id)
    devices[spec.id] = {
      spec,
      contact: spec.contact ?? 'NO',
      pressed: false,
      position: spec.position ?? 0,
      fault: fault && 'device' in fault ? deviceFaultOf(fault.kind) : 'none',
    }
  }
  const lineVolts = valid.lineVolts ?? DEFAULT_LINE_VOLTS
  let state: SimState = {
    t: 0,
    devices,
    deviceOrder: valid.devices.map((d) => d.id),
    wires: valid.wires,
    brokenWires: valid.faults.flatMap((f) => (f.kind === 'brokenWire' ? [f.wireId] : [])),
    fuseBlown: valid.faults.some((f) => f.kind === 'blownFuse'),
    power: valid.power.supervisorLock
      ? { ...valid.power, supervisorLock: { ...valid.power.supervisorLock } }
      : { ...valid.power },
    lineVolts,
    machine: { ...DEFAULT_MACHINE, ...valid.machine },
    motor: {
      nameplate: valid.motor ?? nameplateFromSettings(active),
      cable: valid.motorCable ?? STRAIGHT_CABLE,
      openConductors: valid.faults.flatMap((f) => (f.kind === 'motorConductorOpen' ? [f.conductor] : [])),
    },
    settings: { active, pending: {} },
    meter: { red: null, black: null, mode: 'off' },
    inputs: [false, false, false, false, false, false],
    raiseLowerFirst: null,
    drive: sendDrive(initialDrive(), { type: 'CONFIGURE', config: driveConfig(active) }),
    circuit: {
      key: '',
      analogVolts: 0,
      supplyOverloaded: false,
      referenceOverloaded: false,
      relayClosed: false,
    },
    bus: valid.power.on
      ? { mode: 'steady', since: 0, volts: nominalBusVolts(lineVolts), controlOn: true }
      : { mode: 'decayIdle', since: 0, volts: 0, controlOn: false },
    speed: { mode: 'still', since: 0, hz: 0, slope: 0, targetHz: 0, targetSlope: 0 },
    reference: { since: 0, hz: active['speed.min'], slope: 0 },
    messages: [],
  }
  // Faults held outside the circuit (a dead input, a setting changed from the intended one) go in as an
  // instructor's would; the motor's nameplate above still matches the intended settings.
  for (const fault of valid.faults) {
    if (fault.kind === 'inputUnresponsive' || fault.kind === 'settingChanged') injectFault(state, fault)
  }
  if (valid.power.on) {
    // Powered at the start: as if switched on long ago (bus charged, electronics awake).
    state = settle({ ...state, drive: sendDrive(state.drive, { type: 'POWER_ON' }) }, 0)
    state = { ...state, drive: sendDrive(state.drive, { type: 'BUS_CHARGED' }) }
  }
  return settle(state, 0)
}
