// Each attempt event in plain words, naming things as the panel shows them ("Wire W4 BU added from +24
// to Faster 13", "Meter probes on DI1 and DIC"): the replay's timeline and the live announcements.
import { DIAGNOSIS_FINDING_SHORT, type DiagnosisFinding, type DiagnosisTarget } from '@shared/model/diagnosis'
import type { AttemptEvent } from '@shared/model/events'
import type { InjectedFault } from '@shared/model/setup'
import { METER_MODE_LABELS } from '@shared/model/meterModes'
import { POINT_LABELS } from '@shared/model/points'
import { conductorName } from '@shared/scenario/names'
import { settingDef, type SettingValue } from '@shared/model/settings'
import { formatSettingValue, KEY_NAMES } from './keypadMenu'
import type { PanelLayout, PointId } from './types'
import { wireColour } from './wireColours'

/** "Wire W4" for the wire the model calls w4 (its marker sleeve without the colour code), else "A wire". */
export function wireName(id: string): string {
  const digits = /(\d+)$/.exec(id)?.[1]
  return digits ? `Wire W${digits}` : 'A wire'
}

/** The wire an event is about (added, removed, or named by a diagnosis), for its marker. */
export function eventWireId(event: AttemptEvent): string | undefined {
  if (event.type === 'wire.added' || event.type === 'wire.removed') return event.id
  if (event.type === 'diagnosis.recorded' && event.target.kind === 'wire') return event.target.wire
  if (event.type === 'fault.injected' && event.fault.kind === 'brokenWire') return event.fault.wireId
  return undefined
}

/** A diagnosis in words, e.g. "wire W3 BU: open circuit", "Raise: wrong contact type". */
export function diagnosisWords(
  event: { target: DiagnosisTarget; finding: DiagnosisFinding },
  layout: PanelLayout,
  wireMarker?: string,
): string {
  const { target } = event
  const what = (() => {
    switch (target.kind) {
      case 'wire':
        return wireMarker ? `wire ${wireMarker}` : wireName(target.wire).toLowerCase()
      case 'device':
        return layout.devices.find((d) => d.id === target.device)?.label ?? 'a device'
      case 'controlFuse':
        return 'control fuse'
      case 'motorCable':
        return 'motor cable'
      case 'setting':
        return `setting ${settingDef(target.key).label}`
      case 'terminal':
        return `terminal ${layout.terminals[target.point]?.title ?? 'an unknown point'}`
    }
  })()
  return `${what}: ${DIAGNOSIS_FINDING_SHORT[event.finding]}`
}

/**
 * `wireMarker`: the marker the panel prints on the event's wire ("W3 BU", see wireLabel), when the caller
 * knows where the wire stands among the others; otherwise it is read from the wire's id.
 */
export function eventWords(event: AttemptEvent, layout: PanelLayout, wireMarker?: string): string {
  const point = (id: PointId | null) =>
    id ? (layout.terminals[id]?.title ?? 'an unknown point') : 'the meter'
  const device = (id: string) => layout.devices.find((d) => d.id === id)?.label ?? 'a device'
  switch (event.type) {
    case 'wire.added':
      return `${wireMarker ? `Wire ${wireMarker}` : `${wireName(event.id)} ${wireColour(event.colour).code}`} added from ${point(event.from)} to ${point(event.to)}`
    case 'wire.removed':
      return `${wireMarker ? `Wire ${wireMarker}` : wireName(event.id)} removed`
    case 'device.pressed':
      return `${device(event.device)} pressed`
    case 'device.released':
      return `${device(event.device)} released`
    case 'device.switched':
      return `${device(event.device)} turned to ${event.position}`
    case 'device.turned':
      return `${device(event.device)} set to ${Math.round(event.position * 100)} %`
    case 'device.contactFitted':
      return `New ${event.contact} contact block fitted to ${device(event.device)}`
    case 'fuse.replaced':
      return 'Control fuse replaced'
    case 'setting.changed': {
      const def = settingDef(event.key)
      return `${def.label} set to ${formatSettingValue(def, event.value as SettingValue)} (not saved yet)`
    }
    case 'settings.saved':
      return 'Settings saved to the drive'
    case 'power.on':
      return 'Supply disconnect switched on'
    case 'power.off':
      return 'Supply disconnect switched off'
    case 'lock.applied':
      return event.tag
        ? `Lock applied to the disconnect, tagged ${event.tag.name}, ${event.tag.date}`
        : 'Lock applied to the disconnect'
    case 'lock.removed':
      return event.whose === 'supervisor'
        ? 'Tried to remove the supervisor’s lock from the disconnect'
        : 'Lock removed from the disconnect'
    case 'supervisorLock.removed':
      return 'Asked the supervisor to remove their lock; they removed it'
    case 'meter.probes':
      if (!event.red && !event.black) return 'Meter probes lifted'
      if (event.red && event.black) return `Meter probes on ${point(event.red)} and ${point(event.black)}`
      return `Red probe on ${point(event.red)}, black probe on ${point(event.black)}`
    case 'meter.mode':
      return `Meter turned to ${METER_MODE_LABELS[event.mode]}`
    case 'motor.conductorLanded':
      return event.terminal
        ? `Motor-cable conductor ${conductorName(event.conductor)} landed on motor terminal ${POINT_LABELS[`motor.${event.terminal}`]}`
        : `Motor-cable conductor ${conductorName(event.conductor)} lifted`
    case 'motor.cableReplaced':
      return 'Motor cable replaced'
    case 'keypad.key':
      return `Keypad ${KEY_NAMES[event.key]} pressed`
    case 'hint.revealed':
      return 'Hint shown'
    case 'diagnosis.recorded':
      return `Diagnosis recorded: ${diagnosisWords(event, layout, wireMarker)}`
    case 'fault.injected':
      // Which fault is for the instructor's views (the live-classroom work words it); the apprentice's
      // own replay says only that something changed, as a real bench would.
      return `${event.by.name} changed something on the bench`
    case 'message.received':
      return `${event.kind === 'hint' ? 'Hint' : 'Message'} from ${event.from.name}: ${event.text}`
    case 'attempt.ended':
      return 'Attempt ended'
  }
}

/** What an instructor's fault did, in words, e.g. "broke wire W3 BU", "changed Maximum speed to 25 Hz". */
export function injectedFaultWords(fault: InjectedFault, layout: PanelLayout, wireMarker?: string): string {
  const device = (id: string) => layout.devices.find((d) => d.id === id)?.label ?? 'a device'
  switch (fault.kind) {
    case 'brokenWire':
      return `broke ${wireMarker ? `wire ${wireMarker}` : wireName(fault.wireId).toLowerCase()}`
    case 'blownFuse':
      return 'blew the control fuse'
    case 'motorConductorOpen':
      return `broke conductor ${conductorName(fault.conductor)} inside the motor cable`
    case 'contactFailedOpen':
      return `made the contact of ${device(fault.device)} fail open`
    case 'contactWelded':
      return `welded the contact of ${device(fault.device)} closed`
    case 'wrongContactType':
      return `fitted a wrong contact block to ${device(fault.device)}`
    case 'inputUnresponsive':
      return `made input ${POINT_LABELS[`drive.di${fault.input}`]} stop responding`
    case 'settingChanged': {
      const def = settingDef(fault.key)
      return `changed ${def.label} to ${formatSettingValue(def, fault.value as SettingValue)}`
    }
  }
}

/**
 * An injection as the instructor's views show it, naming the fault ("Ottilie Marsh put in a fault: broke
 * wire W3 BU"); the apprentice's replay uses eventWords, which does not.
 */
export function injectionWords(
  event: Extract<AttemptEvent, { type: 'fault.injected' }>,
  layout: PanelLayout,
  wireMarker?: string,
): string {
  return `${event.by.name} put in a fault: ${injectedFaultWords(event.fault, layout, wireMarker)}`
}
