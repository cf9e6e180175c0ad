// Applying one attempt event: advance to its time, change the state, settle. User mistakes are
// refused with a message (never thrown); only out-of-order times throw.
import { busVoltsAt } from './bus'
import { pointsOf } from './circuit/config'
import { copyState } from './copyState'
import { sendDrive, type DrivePlain } from './driveTransitions'
import { ModelInputError } from './errors'
import type { AttemptEvent } from './events'
import { driveConfig, sameConfig } from './functions'
import { STRAIGHT_CABLE } from './motorCable'
import { isDrivePowerPoint, isMotorPoint, isProverPoint, POINT_LABELS } from './points'
import {
  crossCheckSettings,
  settingDef,
  SETTINGS,
  validateSetting,
  type SettingKey,
  type SettingValue,
  type SettingValues,
} from './settings'
import { settle } from './settle'
import { advancePieces, type BreakpointSink } from './time'
import { forgetRestoredSettings, injectFault } from './injection'
import type { LockTag } from './setup'
import type { BreakpointKind, DeviceState, EventMessage, SimState } from './types'

// Handlers complete a draft made for this event (a fresh copy of the state nobody else holds):
// they assign new values to its fields and never change objects the draft shares with other states.

function withDrive(draft: SimState, drive: DrivePlain): SimState {
  draft.drive = drive
  return draft
}

function refuse(draft: SimState, message: EventMessage): SimState {
  draft.messages = [message]
  return draft
}

/** The draft with one device replaced (field by field: this runs for every button press). */
function withDevice(
  draft: SimState,
  id: string,
  d: DeviceState,
  { contact = d.contact, pressed = d.pressed, position = d.position, fault = d.fault }: Partial<DeviceState>,
): SimState {
  const devices = { ...draft.devices }
  devices[id] = { spec: d.spec, contact, pressed, position, fault }
  draft.devices = devices
  return draft
}

function deviceFor(
  state: SimState,
  id: string,
  kinds: readonly DeviceState['spec']['kind'][],
  action: string,
): DeviceState | EventMessage {
  const device = state.devices[id]
  if (!device) return { code: 'unknownDevice', text: `There is no device "${id}" on this panel.` }
  if (!kinds.includes(device.spec.kind)) {
    return {
      code: 'wrongDeviceKind',
      text: `${device.spec.label} is a ${device.spec.kind}: it cannot be ${action}.`,
    }
  }
  return device
}

function isKnownPoint(state: SimState, point: string): boolean {
  return (
    pointsOf(state).index.has(point) ||
    isDrivePowerPoint(point) ||
    isMotorPoint(point) ||
    isProverPoint(point)
  )
}

/** Why a wire cannot end on this point, if it cannot. */
function wireEndRefusal(state: SimState, point: string): EventMessage | undefined {
  if (isDrivePowerPoint(point) || isMotorPoint(point)) {
    return {
      code: 'wireRefused',
      text: 'Power terminals are not wired on this panel; measure them with the meter.',
    }
  }
  if (isProverPoint(point)) {
    return { code: 'wireRefused', text: 'The proving unit is for checking the meter; it cannot be wired.' }
  }
  if (!pointsOf(state).index.has(point)) {
    return { code: 'unknownPoint', text: `There is no terminal "${point}" on this panel.` }
  }
  return undefined
}

function saveSettings(state: SimState): SimState {
  if (!state.bus.controlOn) {
    return refuse(state, {
      code: 'saveNeedsPower',
      text: 'The drive is not powered (keypad dark): settings cannot be saved. Your edits are kept.',
    })
  }
  const messages: EventMessage[] = []
  const turning = state.drive.value.control !== 'stopped'
  const candidate: Record<string, SettingValue> = { ...state.settings.active }
  const accepted: SettingKey[] = []
  const refused: Partial<Record<SettingKey, SettingValue>> = {}
  for (const def of SETTINGS) {
    const key = def.key as SettingKey
    if (!(key in state.settings.pending)) continue
    const value = state.settings.pending[key]
    const check = validateSetting(key, value)
    if (!check.ok) {
      messages.push({ code: 'settingRefused', key, text: check.message })
      refused[key] = value
    } else if (turning && !settingDef(key).changeWhileRunning && check.value !== state.settings.active[key]) {
      messages.push({
        code: 'settingRefused',
        key,
        text: `Stop the drive before changing ${def.label.toLowerCase()}.`,
      })
      refused[key] = value
    } else {
      candidate[key] = check.value
      accepted.push(key)
    }
  }
  for (const problem of crossCheckSettings(candidate as SettingValues)) {
    for (const key of problem.keys) {
      if (!accepted.includes(key)) continue
      accepted.splice(accepted.indexOf(key), 1)
      candidate[key] = state.settings.active[key]
      refused[key] = state.settings.pending[key]
      messages.push({ code: 'settingRefused', key, text: problem.message })
    }
  }
  messages.push({
    code: 'settingsSaved',
    text: accepted.length === 1 ? 'Saved 1 setting.' : `Saved ${accepted.length} settings.`,
  })
  const active = candidate as SettingValues
  state.settings = { active, pending: refused }
  state.messages = messages
  const config = driveConfig(active)
  if (!sameConfig(config, state.drive.context.config)) {
    withDrive(state, sendDrive(state.drive, { type: 'CONFIGURE', config }))
  }
  return state
}

function pressKey(state: SimState, key: 'run' | 'stop' | 'reset'): SimState {
  if (!state.bus.controlOn)
    return refuse(state, { code: 'keypadDark', text: 'The keypad is dark: the drive has no power.' })
  const wasTripped = state.drive.value.fault === 'tripped'
  const next = withDrive(state, sendDrive(state.drive, { type: 'KEY', key }))
  if (key === 'reset' && wasTripped && next.drive.value.fault === 'tripped') {
    return refuse(next, {
      code: 'resetRefused',
      text: 'Reset refused: the cause of the fault is still there. Find and clear it first.',
    })
  }
  return next
}

function powerOn(state: SimState): SimState {
  if (state.power.on) return state
  if (state.power.supervisorLock) {
    const { name } = state.power.supervisorLock
    return refuse(state, {
      code: 'powerOnLocked',
      text: `${name}'s lock is on the disconnect: the supply cannot be switched on until ${name} has removed it.`,
    })
  }
  if (state.power.locked) {
    return refuse(state, {
      code: 'powerOnLocked',
      text: 'The disconnect is locked off. Remove your lock only when work is finished and everyone is clear.',
    })
  }
  const volts = busVoltsAt(state.bus, state.t, state.lineVolts)
  state.power = { ...state.power, on: true }
  state.bus = { mode: 'charging', since: state.t, volts, controlOn: state.bus.controlOn }
  return withDrive(state, sendDrive(state.drive, { type: 'POWER_ON' }))
}

function powerOff(state: SimState): SimState {
  if (!state.power.on) return state
  const volts = busVoltsAt(state.bus, state.t, state.lineVolts)
  const controlOn = state.bus.controlOn
  state.power = { ...state.power, on: false }
  state.bus = { mode: controlOn ? 'decayLoaded' : 'decayIdle', since: state.t, volts, controlOn }
  return withDrive(state, sendDrive(state.drive, { type: 'POWER_OFF', controlOn }))
}

function withTag(power: SimState['power'], tag: LockTag | undefined): SimState['power'] {
  return tag ? { ...power, tag: { ...tag } } : power
}

function withoutKey<T extends object, K extends keyof T>(value: T, key: K): Omit<T, K> {
  const { [key]: _dropped, ...rest } = value
  return rest
}

/**
 * Only the person who applied a lock removes it (OSHA 1910.147(e)(3), cited from memory): the apprentice
 * may remove their own lock, never the supervisor's.
 */
function removeLock(state: SimState, whose: 'mine' | 'supervisor'): SimState {
  const supervisor = state.power.supervisorLock
  if (whose === 'supervisor' || (!state.power.locked && supervisor)) {
    if (!supervisor) {
      return refuse(state, { code: 'noLockToRemove', text: 'There is no one else’s lock on the disconnect.' })
    }
    return refuse(state, {
      code: 'lockNotYours',
      text:
        `That lock is ${supervisor.name}'s. Only the person who applied a lock may remove it: ` +
        `ask ${supervisor.name} when the work is finished and everyone is clear.`,
    })
  }
  if (state.power.locked) state.power = withoutKey({ ...state.power, locked: false }, 'tag')
  return state
}

function applyToState(state: SimState, event: AttemptEvent): SimState {
  switch (event.type) {
    case 'wire.added': {
      if (state.wires.some((w) => w.id === event.id)) {
        return refuse(state, { code: 'wireRefused', text: `A wire called "${event.id}" is already fitted.` })
      }
      const refusal = wireEndRefusal(state, event.from) ?? wireEndRefusal(state, event.to)
      if (refusal) return refuse(state, refusal)
      if (event.from === event.to) {
        return refuse(state, { code: 'wireRefused', text: 'A wire needs two different terminals.' })
      }
      const { id, from, to, colour } = event
      state.wires = [...state.wires, { id, from, to, colour }]
      return state
    }
    case 'wire.removed': {
      if (!state.wires.some((w) => w.id === event.id)) {
        return refuse(state, { code: 'unknownWire', text: `There is no wire "${event.id}".` })
      }
      state.wires = state.wires.filter((w) => w.id !== event.id)
      if (state.brokenWires.includes(event.id))
        state.brokenWires = state.brokenWires.filter((id) => id !== event.id)
      return state
    }
    case 'device.pressed':
    case 'device.released': {
      const device = deviceFor(state, event.device, ['pushbutton'], 'pressed')
      if (!('spec' in device)) return refuse(state, device)
      const pressed = event.type === 'device.pressed'
      return device.pressed === pressed ? state : withDevice(state, event.device, device, { pressed })
    }
    case 'device.switched': {
      const device = deviceFor(state, event.device, ['selector'], 'switched')
      if (!('spec' in device)) return refuse(state, device)
      return withDevice(state, event.device, device, { position: event.position })
    }
    case 'device.turned': {
      const device = deviceFor(state, event.device, ['potentiometer'], 'turned')
      if (!('spec' in device)) return refuse(state, device)
      return withDevice(state, event.device, device, { position: event.position })
    }
    case 'device.contactFitted': {
      const device = deviceFor(state, event.device, ['pushbutton', 'selector'], 'fitted with a contact block')
      if (!('spec' in device)) return refuse(state, device)
      return withDevice(state, event.device, device, { contact: event.contact, fault: 'none' })
    }
    case 'fuse.replaced':
      state.fuseBlown = false
      return state
    case 'setting.changed':
      state.settings = { ...state.settings, pending: { ...state.settings.pending, [event.key]: event.value } }
      return state
    case 'settings.saved':
      return forgetRestoredSettings(saveSettings(state))
    case 'power.on':
      return powerOn(state)
    case 'power.off':
      return powerOff(state)
    case 'lock.applied':
      if (state.power.on) {
        return refuse(state, {
          code: 'lockNeedsPowerOff',
          text: 'Switch the disconnect off before applying your lock.',
        })
      }
      if (!state.power.locked) state.power = withTag({ ...state.power, locked: true }, event.tag)
      return state
    case 'lock.removed':
      return removeLock(state, event.whose ?? 'mine')
    case 'supervisorLock.removed':
      if (state.power.supervisorLock) state.power = withoutKey(state.power, 'supervisorLock')
      return state
    case 'meter.probes': {
      const unknown =
        event.red !== null && !isKnownPoint(state, event.red)
          ? event.red
          : event.black !== null && !isKnownPoint(state, event.black)
            ? event.black
            : null
      if (unknown !== null) {
        return refuse(state, { code: 'unknownPoint', text: `There is no terminal "${unknown}" to probe.` })
      }
      state.meter = { red: event.red, black: event.black, mode: state.meter.mode }
      return state
    }
    case 'meter.mode':
      if (event.mode !== state.meter.mode) state.meter = { ...state.meter, mode: event.mode }
      return state
    case 'motor.conductorLanded': {
      const { conductor, terminal } = event
      const occupant = (['u', 'v', 'w'] as const).find(
        (c) => c !== conductor && state.motor.cable[c] === terminal,
      )
      if (terminal !== null && occupant) {
        return refuse(state, {
          code: 'terminalOccupied',
          text: `Motor terminal ${POINT_LABELS[`motor.${terminal}`]} already has the ${occupant.toUpperCase()} conductor on it: lift that one first.`,
        })
      }
      if (state.motor.cable[conductor] === terminal) return state
      state.motor = { ...state.motor, cable: { ...state.motor.cable, [conductor]: terminal } }
      return state
    }
    case 'motor.cableReplaced':
      state.motor = { ...state.motor, cable: STRAIGHT_CABLE, openConductors: [] }
      return state
    case 'keypad.key':
      if (event.key === 'run' || event.key === 'stop' || event.key === 'reset')
        return pressKey(state, event.key)
      return state
    case 'fault.injected':
      // Recorded whether or not it took, so the grader knows every part an instructor touched.
      state.injected = [...(state.injected ?? []), event.fault]
      return injectFault(state, event.fault)
    case 'hint.revealed':
    case 'diagnosis.recorded':
    case 'message.received':
    case 'attempt.ended':
      return state
  }
}

function needsSettling(before: SimState, after: SimState): boolean {
  return (
    before.devices !== after.devices ||
    before.wires !== after.wires ||
    before.brokenWires !== after.brokenWires ||
    before.deadInputs !== after.deadInputs ||
    before.fuseBlown !== after.fuseBlown ||
    before.settings.active !== after.settings.active ||
    before.drive !== after.drive ||
    before.power !== after.power ||
    before.bus !== after.bus ||
    before.motor !== after.motor
  )
}

const NO_MESSAGES: EventMessage[] = []

function applyEventWith(state: SimState, event: AttemptEvent, sink: BreakpointSink): SimState {
  if (!Number.isInteger(event.t)) {
    throw new ModelInputError(`Event "${event.type}" has time ${event.t} ms: times are whole milliseconds.`)
  }
  if (event.t < state.t) {
    throw new ModelInputError(
      `Event "${event.type}" at ${event.t} ms is before the simulation time ${state.t} ms (events must be in order).`,
    )
  }
  const current = advancePieces(state, event.t, sink)
  const draft = copyState(current)
  draft.t = event.t
  draft.messages = NO_MESSAGES
  const next = applyToState(draft, event)
  // Events that touch nothing physical (the meter, pending edits, navigation keys, hints) need no settling.
  if (!needsSettling(current, next)) return next
  return settle(next, event.t, current.drive.value, true)
}

export function applyEvent(state: SimState, event: AttemptEvent): SimState {
  return applyEventWith(state, event, undefined)
}

/** applyEvent that also reports the breakpoints passed on the way (for replay). */
export function applyEventCollecting(
  state: SimState,
  event: AttemptEvent,
  sink: { t: number; what: BreakpointKind }[],
): SimState {
  return applyEventWith(state, event, sink)
}
