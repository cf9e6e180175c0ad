// Plain-words text for the drive's display and status lamp (from what its front panel shows: readFrontPanel)
// and for the meter's window (readMeter).
import type { InputFunction } from '@shared/model/settings'
import type {
  DriveReading,
  FrontPanelIo,
  FrontPanelReading,
  FrontPanelStatus,
  MeterReading,
} from '@shared/model/types'
import type { StatusLamp } from './view'

const STATE_WORDS: Record<DriveReading['control'], string> = {
  stopped: 'READY',
  accelerating: 'SPEEDING UP',
  atSpeed: 'RUNNING',
  decelerating: 'SLOWING',
  rampStopping: 'STOPPING',
  coasting: 'COASTING',
}

const WIDTH = 24
const fit = (s: string) => (s.length > WIDTH ? `${s.slice(0, WIDTH - 1)}…` : s)

/** Words over two display lines, broken at spaces; what does not fit ends in an ellipsis. */
export function wrapTwo(text: string): [string, string] {
  const words = text.split(/\s+/).filter(Boolean)
  let first = ''
  while (words.length && `${first} ${words[0]}`.trim().length <= WIDTH)
    first = `${first} ${words.shift()}`.trim()
  if (!first && words.length) return [fit(words.shift()!), fit(words.join(' '))]
  return [first, fit(words.join(' '))]
}

export function stateWord(d: DriveReading): string {
  if (!d.displayOn) return 'DARK'
  if (d.tripped) return 'TRIPPED'
  if (d.power === 'charging') return 'STARTING UP'
  if (d.power === 'discharging') return 'POWERING DOWN'
  return STATE_WORDS[d.control]
}

const PANEL_STATE_WORDS: Record<FrontPanelStatus['state'], string> = {
  ...STATE_WORDS,
  startingUp: 'STARTING UP',
  poweringDown: 'POWERING DOWN',
  tripped: 'TRIPPED',
}

/**
 * The status display's pages, stepped with ▲▼ (our own design): speed, output, DC bus, then the I/O
 * status screen over three pages (inputs 1–3, inputs 4–6, relay and analog input).
 */
export const STATUS_PAGES = ['speed', 'output', 'bus', 'inputsLow', 'inputsHigh', 'relayAnalog'] as const
export type StatusPage = (typeof STATUS_PAGES)[number]
const IO_PAGES: StatusPage[] = ['inputsLow', 'inputsHigh', 'relayAnalog']

/** Short function names for the display's narrow lines (the settings list uses the long labels). */
const SHORT_FUNCTION: Record<InputFunction, string> = {
  none: 'not used',
  run: 'Run',
  start: 'Start',
  stop: 'Stop',
  raise: 'Raise',
  lower: 'Lower',
  reverse: 'Reverse',
  faultReset: 'Fault reset',
  externalFault: 'Ext. fault',
  preset: 'Preset speed',
}

function ioLines(io: FrontPanelIo, page: StatusPage): string[] {
  const n = IO_PAGES.indexOf(page)
  const title = fit(`I/O STATUS ${n + 1}/${IO_PAGES.length}`)
  if (page === 'relayAnalog') {
    return [
      title,
      fit(`Relay        ${io.relayClosed ? 'CLOSED' : 'OPEN'}`),
      fit(`Analog in    ${io.analogVolts.toFixed(2)} V`),
      '',
    ]
  }
  const inputs = io.inputs.slice(n * 3, n * 3 + 3)
  return [
    title,
    ...inputs.map((i) => fit(`DI${i.input} ${SHORT_FUNCTION[i.function].padEnd(13)} ${i.on ? 'ON' : 'OFF'}`)),
  ]
}

/**
 * The four lines of the drive's display on its status screen, from what the front panel shows. A dark
 * display shows nothing at all: the DC bus can still be charged (the CHARGE lamp and the meter say so).
 */
export function frontPanelLines(panel: FrontPanelReading, page: StatusPage = 'speed'): string[] {
  const d = panel.status
  if (!panel.lit || !d || !panel.io) return ['', '', '', '']
  if (IO_PAGES.includes(page)) return ioLines(panel.io, page)
  if (d.state === 'tripped' && d.faults.length) {
    const f = d.faults[0]
    // Our own short code first (never cut off), then what is wrong over two lines. The fix is not on
    // the display: the guided assistance level shows it beside the panel, standard only through a hint.
    return [fit(`TRIPPED  ${f.short}`), ...wrapTwo(f.text), fit('RESET to clear')]
  }
  const dir = d.direction === 'reverse' ? 'REV' : 'FWD'
  const place = d.commandSource === 'keypad' ? 'LOCAL' : 'REMOTE'
  const head = fit(`${PANEL_STATE_WORDS[d.state]}  ${place}`)
  const lines =
    page === 'output'
      ? [
          head,
          fit(`Output   ${Math.round(d.outputVolts)} V`),
          fit(`Current  ${d.outputAmps.toFixed(1)} A`),
          fit(`Torque   ${Math.round(d.torquePercent)} %`),
        ]
      : page === 'bus'
        ? [head, fit(`DC bus   ${Math.round(d.busVolts)} V`), '', '']
        : [
            head,
            fit(`Out ${d.outputHz.toFixed(1)} Hz ${d.outputOn ? dir : ''}`.trimEnd()),
            fit(`Ref ${d.referenceHz.toFixed(1)} Hz`),
            fit(`${Math.round(Math.abs(d.speedRpm))} rpm`),
          ]
  if (d.alarms.length) lines[3] = fit(`! ${d.alarms[0].short} ${d.alarms[0].text}`)
  return lines
}

/** The status lamp beside the display: dark with the electronics, else what the drive is doing. */
export function statusLamp(panel: FrontPanelReading): StatusLamp {
  const d = panel.status
  if (!panel.lit || !d) return 'off'
  if (d.state === 'tripped') return 'fault'
  if (d.alarms.length) return 'alarm'
  if (d.state === 'startingUp') return 'charging'
  if (d.outputOn) return 'running'
  return 'ready'
}

/** The meter's window: a value with its unit, OL (over-range), a voltage warning, or blank when off. */
export function meterText(m: MeterReading): string {
  switch (m.shows) {
    case 'blank':
      return ''
    case 'overRange':
      return 'OL'
    case 'voltagePresent':
      return 'VOLTAGE!'
    case 'ohms': {
      const ohms = m.ohms ?? 0
      const value =
        ohms >= 1e6
          ? `${(ohms / 1e6).toFixed(2)} MΩ`
          : ohms >= 1000
            ? `${(ohms / 1000).toFixed(2)} kΩ`
            : `${ohms.toFixed(1)} Ω`
      return m.tone ? `${value} ♪` : value
    }
    case 'volts': {
      const volts = m.volts ?? 0
      const v = Math.abs(volts) >= 100 ? volts.toFixed(0) : volts.toFixed(2)
      return `${v} V${m.mode === 'acVolts' ? '~' : ''}`
    }
  }
}
