// The adapter between the model's wiring (shared/model points, devices and wires) and the renderer's
// plain input. Terminal lists and labels come from the model, so a terminal the model adds or renames
// appears here without a change; only where each terminal is drawn is decided in this file.
import {
  DEVICE_TERMINALS,
  DRIVE_CONTROL_POINTS,
  POINT_LABELS,
  PROVER_LABELS,
  type DeviceKind,
} from '../model/points'
import type { DeviceSpec, WireSpec } from '../model/setup'
import type { SimState } from '../model/types'
import {
  POTENTIOMETER_MARKINGS,
  contactMarkings,
  contactWords,
  wireColourMarking,
  wireNumber,
} from './markings'
import type {
  SchematicDevice,
  SchematicDeviceTerminal,
  SchematicInput,
  SchematicTerminal,
  StripId,
} from './types'

/** What the renderer needs of a wiring state: the devices (as labelled now) and the wires. */
export interface Wiring {
  devices: readonly Pick<DeviceSpec, 'id' | 'kind' | 'label' | 'contact' | 'ohms'>[]
  wires: readonly WireSpec[]
}

/**
 * Where a drive terminal is drawn: supplies in the top row, the 0 V side in the bottom row, inputs,
 * their common and the relay contact between. A terminal not listed here (one the model adds later)
 * is drawn with the inputs.
 */
const STRIP_OF: Partial<Record<string, StripId>> = {
  'drive.p24': 'supply',
  'drive.p10': 'supply',
  'drive.0v': 'returns',
  'drive.acom': 'returns',
}

/** Joined inside the drive (shared/model README: analog common is tied to 0V; the input common is not). */
const INTERNAL_LINKS = [{ from: 'drive.0v', to: 'drive.acom' }]

function labelOf(point: string): string | undefined {
  return (POINT_LABELS as Record<string, string>)[point] ?? (PROVER_LABELS as Record<string, string>)[point]
}

function driveTerminals(): SchematicTerminal[] {
  return DRIVE_CONTROL_POINTS.map((point) => ({
    point,
    label: labelOf(point) ?? point.replace(/^drive\./, '').toUpperCase(),
    strip: STRIP_OF[point] ?? 'inputs',
  }))
}

function formatOhms(ohms: number): string {
  if (ohms >= 1e6) return `${+(ohms / 1e6).toFixed(2)} MΩ`
  if (ohms >= 1e3) return `${+(ohms / 1e3).toFixed(2)} kΩ`
  return `${+ohms.toFixed(1)} Ω`
}

function deviceOf(spec: Wiring['devices'][number]): SchematicDevice {
  const kind: DeviceKind = spec.kind
  const point = (terminal: string) => `${spec.id}.${terminal}`
  if (kind === 'potentiometer') {
    const terminals: SchematicDeviceTerminal[] = [
      { point: point('hi'), marking: POTENTIOMETER_MARKINGS.hi, role: 'high' },
      { point: point('wiper'), marking: POTENTIOMETER_MARKINGS.wiper, role: 'wiper' },
      { point: point('lo'), marking: POTENTIOMETER_MARKINGS.lo, role: 'low' },
    ]
    const description = spec.ohms ? `Potentiometer, ${formatOhms(spec.ohms)}` : 'Potentiometer'
    return { key: spec.id, name: spec.label, symbol: 'potentiometer', description, terminals }
  }
  const contact = spec.contact ?? 'NO'
  const marks = contactMarkings(contact)
  const [a, b] = DEVICE_TERMINALS[kind]
  return {
    key: spec.id,
    name: spec.label,
    symbol: kind,
    contact,
    description: `${kind === 'pushbutton' ? 'Pushbutton' : 'Selector switch'}, ${contactWords(contact)}`,
    terminals: [
      { point: point(a), marking: marks.a, role: 'contactA' },
      { point: point(b), marking: marks.b, role: 'contactB' },
    ],
  }
}

/**
 * A wire end on no terminal the drawing knows (a power terminal, a point the model does not have):
 * drawn as a loose end, named in plain words. `count` numbers unnamed ones.
 */
function looseEnd(point: string, count: number): SchematicDevice {
  const label = labelOf(point)
  return {
    key: `loose:${point}`,
    name: label ? `Drive ${label}` : count === 1 ? 'Loose end' : `Loose end ${count}`,
    symbol: 'looseEnd',
    description: label ? 'Not a control terminal' : 'Not on any terminal',
    terminals: [{ point, marking: '', role: 'other' }],
  }
}

function notes(wires: readonly WireSpec[]): string[] {
  const used = [...new Set(wires.map((w) => w.colour))].map(wireColourMarking)
  const lines = [
    'Contacts are drawn at rest: pushbuttons not pressed, selector switches off.',
    'Each wire is marked with its number and colour code (IEC 60757), as on the panel.',
  ]
  if (used.length > 0)
    lines.push(`Colours: ${used.map((c) => `${c.code} ${c.name.toLowerCase()}`).join(', ')}.`)
  return lines
}

export function schematicInputFromWiring(wiring: Wiring): SchematicInput {
  const terminals = driveTerminals()
  const devices = wiring.devices.map(deviceOf)
  const known = new Set<string>([
    ...terminals.map((t) => t.point),
    ...devices.flatMap((d) => d.terminals.map((t) => t.point)),
  ])
  const loose: SchematicDevice[] = []
  let unnamed = 0
  for (const wire of wiring.wires) {
    for (const point of [wire.from, wire.to]) {
      if (known.has(point)) continue
      known.add(point)
      if (!labelOf(point)) unnamed++
      loose.push(looseEnd(point, unnamed))
    }
  }
  const label = (point: string) => terminals.find((t) => t.point === point)?.label ?? point
  return {
    terminals,
    devices: [...devices, ...loose],
    wires: wiring.wires.map((wire, index) => ({
      key: wire.id,
      number: wireNumber(wire.id, index),
      colour: wireColourMarking(wire.colour),
      from: wire.from,
      to: wire.to,
    })),
    internalLinks: INTERNAL_LINKS.filter((l) => known.has(l.from) && known.has(l.to)),
    captions: {
      supply: 'Drive supply',
      devices: 'Field devices',
      inputs: 'Drive inputs',
      returns: `Drive ${label('drive.0v')}`,
    },
    notes: [
      ...notes(wiring.wires),
      `${label('drive.acom')} and ${label('drive.0v')} are joined inside the drive (dashed).`,
    ],
  }
}

/** The wiring of a model state: devices in their declared order, the contact now fitted, the wires. */
export function wiringOfState(state: Pick<SimState, 'deviceOrder' | 'devices' | 'wires'>): Wiring {
  return {
    devices: state.deviceOrder.map((id) => {
      const device = state.devices[id]
      return { ...device.spec, contact: device.spec.kind === 'potentiometer' ? undefined : device.contact }
    }),
    wires: state.wires,
  }
}
