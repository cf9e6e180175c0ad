// Plain-words text for the drive's status display, its status lamp and the meter, from model readings.
import type { DriveReading, MeterReading } from '@shared/model/types'
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

export function stateWord(d: DriveReading): string {
  if (!d.displayOn) return 'DARK'
  if (d.tripped) return 'TRIPPED'
  if (d.power === 'charging') return 'STARTING UP'
  if (d.power === 'discharging') return 'POWERING DOWN'
  return STATE_WORDS[d.control]
}

export function statusLines(d: DriveReading): string[] {
  // A dark display says nothing about the DC bus: the CHARGE lamp and the meter do.
  if (!d.displayOn) return ['', '', '', '']
  if (d.tripped && d.faults.length) {
    const f = d.faults[0]
    return [fit(`TRIPPED: ${f.text}`), fit(f.check ? `Check: ${f.check}` : ''), '', fit('RESET to clear')]
  }
  const dir = d.direction === 'reverse' ? 'REV' : 'FWD'
  const place = d.controlSource === 'keypad' ? 'LOCAL' : 'REMOTE'
  const lines = [
    fit(`${stateWord(d)}  ${place}`),
    fit(`Out ${d.outputHz.toFixed(1)} Hz ${d.outputOn ? dir : ''}`.trimEnd()),
    fit(`Ref ${d.referenceHz.toFixed(1)} Hz`),
    fit(`${Math.round(Math.abs(d.speedRpm))} rpm`),
  ]
  if (d.alarms.length) lines[3] = fit(`! ${d.alarms[0].text}`)
  return lines
}

export function statusLamp(d: DriveReading): StatusLamp {
  if (!d.displayOn) return 'off'
  if (d.tripped) return 'fault'
  if (d.alarms.length) return 'alarm'
  if (d.power === 'charging') return 'charging'
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
