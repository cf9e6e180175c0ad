// Where everything sits on the panel, in scene units (the canvas scales this to fit).
// All wireable terminals share one horizontal line so wires can leave downward into the wireway
// and never cover a terminal's label, which is printed above its screw.
import { deviceTerminalLabels as terminalLabels } from '@shared/schematic/markings'
import { METER_MODES } from '@shared/model/meterModes'
import { PROVER_AC_VOLTS, PROVER_POINTS, PROVER_VOLTS } from '@shared/model/points'
import type { DeviceSpot, KeySpot, PanelDevice, PanelLayout, PointId, TerminalSpot } from './types'

export const SCENE_WIDTH = 1280
export const SCENE_HEIGHT = 640
export const STRIP_Y = 410
export const TERMINAL_RADIUS = 8
/** Scene units; the workspace fits the panel so that these read at 11 CSS px or more on a 1366×768 screen. */
export const TERMINAL_LABEL_SIZE = 12

/** Drive control terminals in strip order, labels from the model contract. */
export const CONTROL_TERMINALS: readonly { id: PointId; label: string; what: string }[] = [
  { id: 'drive.p24', label: '+24', what: '+24 V control supply' },
  { id: 'drive.0v', label: '0V', what: '0 V control supply' },
  { id: 'drive.dcom', label: 'DIC', what: 'digital-input common' },
  { id: 'drive.di1', label: 'DI1', what: 'digital input 1' },
  { id: 'drive.di2', label: 'DI2', what: 'digital input 2' },
  { id: 'drive.di3', label: 'DI3', what: 'digital input 3' },
  { id: 'drive.di4', label: 'DI4', what: 'digital input 4' },
  { id: 'drive.di5', label: 'DI5', what: 'digital input 5' },
  { id: 'drive.di6', label: 'DI6', what: 'digital input 6' },
  { id: 'drive.p10', label: '+10', what: '+10 V reference supply' },
  { id: 'drive.ai', label: 'AI', what: 'analog input' },
  { id: 'drive.acom', label: 'AIC', what: 'analog-input common' },
  { id: 'drive.k1a', label: 'K1A', what: 'relay contact side A' },
  { id: 'drive.k1b', label: 'K1B', what: 'relay contact side B' },
]

export const POWER_TERMINALS: readonly { id: PointId; label: string; what: string }[] = [
  { id: 'drive.l1', label: 'L1', what: 'incoming line 1' },
  { id: 'drive.l2', label: 'L2', what: 'incoming line 2' },
  { id: 'drive.l3', label: 'L3', what: 'incoming line 3' },
  { id: 'drive.dcp', label: 'DC+', what: 'DC bus positive' },
  { id: 'drive.dcn', label: 'DC−', what: 'DC bus negative' },
  { id: 'drive.pe', label: 'PE', what: 'protective earth' },
  { id: 'drive.u', label: 'U', what: 'output to motor, phase U' },
  { id: 'drive.v', label: 'V', what: 'output to motor, phase V' },
  { id: 'drive.w', label: 'W', what: 'output to motor, phase W' },
]

const KEYPAD: readonly { key: KeySpot['key']; label: string; col: number; row: number }[] = [
  { key: 'back', label: 'BACK', col: 0, row: 0 },
  { key: 'up', label: '▲', col: 1, row: 0 },
  { key: 'enter', label: 'OK', col: 2, row: 0 },
  { key: 'left', label: '◀', col: 0, row: 1 },
  { key: 'down', label: '▼', col: 1, row: 1 },
  { key: 'right', label: '▶', col: 2, row: 1 },
  { key: 'run', label: 'RUN', col: 0, row: 2 },
  { key: 'stop', label: 'STOP', col: 1, row: 2 },
  { key: 'reset', label: 'RESET', col: 2, row: 2 },
]

/**
 * Terminal marking of a field device. Contact blocks follow the IEC 60947-5-1 numbering
 * (NO 13–14, NC 11–12) as printed on the block, i.e. as declared by the scenario. The schematic and
 * the grader mark terminals by the same rule (shared/schematic/markings.ts).
 */
export function deviceTerminalLabels(device: PanelDevice): Record<string, string> {
  return terminalLabels(device.kind, device.contact)
}

function deviceTerminalNames(device: PanelDevice): string[] {
  return device.kind === 'potentiometer' ? ['hi', 'wiper', 'lo'] : ['a', 'b']
}

export function layoutPanel(devices: readonly PanelDevice[]): PanelLayout {
  const terminals: Record<PointId, TerminalSpot> = {}
  const drive = { x: 230, y: 20, w: 490, h: 420 }

  CONTROL_TERMINALS.forEach((t, i) => {
    terminals[t.id] = {
      id: t.id,
      label: t.label,
      name: `Drive terminal ${t.label} (${t.what})`,
      title: t.label,
      x: 256 + i * 31,
      y: STRIP_Y,
      group: 'control',
      wireable: true,
    }
  })
  POWER_TERMINALS.forEach((t, i) => {
    terminals[t.id] = {
      id: t.id,
      label: t.label,
      name: `Drive power terminal ${t.label} (${t.what})`,
      title: t.label,
      x: 262 + i * 36,
      y: 52,
      group: 'power',
      wireable: false,
    }
  })

  // The proving unit below the motor's nameplate: three screws the probes can reach, none a wire can.
  const prover = { x: 1045, y: 400, w: 215, h: 150 }
  PROVER_POINTS.forEach((id, i) => {
    const spec = PROVER_TERMINALS[id]
    terminals[id] = {
      id,
      label: spec.label,
      name: `Meter proving unit terminal ${spec.label} (${spec.what})`,
      title: `Proving unit ${spec.label}`,
      x: prover.x + 45 + i * 62,
      y: prover.y + 112,
      group: 'prover',
      wireable: false,
    }
  })

  const keys: KeySpot[] = KEYPAD.map((k) => ({
    key: k.key,
    label: k.label,
    rect: { x: 548 + k.col * 54, y: 100 + k.row * 46 + (k.row === 2 ? 14 : 0), w: 48, h: 38 },
  }))

  const station = { x: 745, y: 20, w: 275, h: 420 }
  const deviceSpots = layoutStation(devices, station, terminals)

  return {
    width: SCENE_WIDTH,
    height: SCENE_HEIGHT,
    terminals,
    devices: deviceSpots,
    drive: {
      rect: drive,
      display: { x: 255, y: 100, w: 270, h: 128 },
      keys,
      statusLamp: { x: 505, y: 248 },
      controlStrip: { x: 240, y: 372, w: 448, h: 56 },
      powerStrip: { x: 244, y: 34, w: 324, h: 40 },
    },
    disconnect: {
      rect: { x: 20, y: 20, w: 190, h: 260 },
      handle: { x: 69, y: 78, w: 92, h: 92 },
      lock: { x: 85, y: 188, w: 60, h: 50 },
    },
    motor: {
      rect: { x: 1045, y: 20, w: 215, h: 230 },
      shaft: { x: 1152, y: 125 },
      shaftRadius: 62,
      nameplate: { x: 1045, y: 262, w: 215, h: 118 },
    },
    prover: { rect: prover },
    meter: {
      rect: { x: 20, y: 300, w: 190, h: 300 },
      display: { x: 38, y: 330, w: 154, h: 70 },
      holsters: { red: { x: 75, y: 560 }, black: { x: 155, y: 560 } },
      selector: METER_MODES.map((mode, i) => ({
        mode,
        rect: { x: 38 + (i % 3) * 52, y: 408 + Math.floor(i / 3) * 30, w: 50, h: 26 },
      })),
    },
    station,
    wireway: { x: 230, y: 440, w: 790, h: 180 },
  }
}

/** The proving unit's outputs against its common (shared/model/points.ts: PROVER_POINTS). */
const PROVER_TERMINALS: Record<(typeof PROVER_POINTS)[number], { label: string; what: string }> = {
  'prover.pos': { label: '+', what: `${PROVER_VOLTS} V DC output, to check the V DC range` },
  'prover.ac': { label: '~', what: `${PROVER_AC_VOLTS} V AC output, to check the V AC range` },
  'prover.neg': { label: 'COM', what: 'common of both outputs' },
}

function layoutStation(
  devices: readonly PanelDevice[],
  station: { x: number; y: number; w: number; h: number },
  terminals: Record<PointId, TerminalSpot>,
): DeviceSpot[] {
  const termCount = devices.reduce((n, d) => n + deviceTerminalNames(d).length, 0)
  const gap = 14
  const usable = station.w - 30 - gap * Math.max(0, devices.length - 1)
  const pitch = Math.min(30, usable / Math.max(1, termCount))
  const cols = devices.length <= 2 ? devices.length || 1 : 2
  const rows = Math.ceil(devices.length / cols)
  const cellW = station.w / cols
  const cellH = Math.min(160, 300 / Math.max(1, rows))

  let x = station.x + 15 + pitch / 2
  return devices.map((device, i) => {
    const labels = deviceTerminalLabels(device)
    const ids = deviceTerminalNames(device).map((name) => {
      const id = `${device.id}.${name}`
      terminals[id] = {
        id,
        label: labels[name],
        name: `${device.label} terminal ${labels[name]} (${name})`,
        title: `${device.label} ${labels[name]}`,
        x,
        y: STRIP_Y,
        group: 'device',
        wireable: true,
      }
      x += pitch
      return id
    })
    x += gap
    const col = i % cols
    const row = Math.floor(i / cols)
    const cx = station.x + cellW * col + cellW / 2
    const cy = station.y + 30 + cellH * row + cellH / 2 - 12
    return {
      id: device.id,
      kind: device.kind,
      label: device.label,
      contact: device.contact,
      rect: { x: cx - cellW / 2 + 6, y: cy - cellH / 2 + 4, w: cellW - 12, h: cellH - 8 },
      actuator: { x: cx, y: cy - 10, r: 26 },
      terminals: ids,
    }
  })
}
