// What the drawn drive face shows: only what its display and lamps show (readFrontPanel). A dark display
// shows nothing — no bus, no reference, no speed — while the CHARGE lamp follows the bus itself and stays
// lit above 60 V (IEC 60204-1 6.2.4). The I/O status screen is our own design, reached with ▲▼.
import { describe, expect, it } from 'vitest'
import { advance, applyEvent, createSimulation, readCircuit, readDrive } from '@shared/model'
import type { AttemptEvent, FrontPanelReading, SimState, SimulationSetup } from '@shared/model'
import { frontPanelLines, wrapTwo } from '@/simulator/scene/driveDisplay'
import { deriveView, type PanelUiState } from '@/simulator/scene/deriveView'
import { pressKey, STATUS_SCREEN, type KeypadMenu } from '@/simulator/scene/keypadMenu'
import { actionsFor } from '@/simulator/scene/intentActions'

const setup = (power: SimulationSetup['power']): SimulationSetup => ({
  devices: [{ id: 'runSwitch', kind: 'selector', label: 'RUN', contact: 'NO' }],
  wires: [
    { id: 'w1', from: 'drive.dcom', to: 'drive.0v', colour: 'blue' },
    { id: 'w2', from: 'drive.p24', to: 'runSwitch.a', colour: 'blue' },
    { id: 'w3', from: 'runSwitch.b', to: 'drive.di1', colour: 'blue' },
  ],
  settings: { 'control.source': 'terminals', 'di1.function': 'run', 'di2.function': 'raise' },
  power,
  faults: [],
})

const ui = (menu: KeypadMenu = STATUS_SCREEN): PanelUiState => ({
  selectedWire: null,
  draftWire: null,
  probeDrag: null,
  highlight: null,
  armed: null,
  menu,
})

function view(state: SimState, menu?: KeypadMenu) {
  const drive = readDrive(state)
  return deriveView(state, drive, readCircuit(state), ui(menu))
}

function run(state: SimState, events: AttemptEvent[]): SimState {
  return events.reduce((s, e) => applyEvent(s, e), state)
}

/** The status screen after pressing ▼ n times. */
function page(n: number): KeypadMenu {
  let menu = STATUS_SCREEN
  for (let i = 0; i < n; i++) menu = pressKey(menu, 'down', { active: {} as never, pending: {} }).menu
  return menu
}

const powered = () => createSimulation(setup({ on: true, locked: false }))

describe('the drawn drive face', () => {
  it('shows the bus voltage only on the lit display’s own DC bus page, never printed on the enclosure', () => {
    const lit = view(powered(), page(2))
    expect(lit.display[1]).toMatch(/^DC bus\s+\d{3} V$/)
    expect(Object.keys(lit)).not.toContain('busVolts')
  })

  it('shows output voltage and current on the output page', () => {
    const lines = view(powered(), page(1)).display
    expect(lines[1]).toMatch(/^Output\s+\d+ V$/)
    expect(lines[2]).toMatch(/^Current\s+\d+\.\d A$/)
  })

  it('shows nothing at all on a dark display, on every page, though the bus is still charged', () => {
    const dark = advance(run(powered(), [{ t: 0, type: 'power.off' }]), 10_000)
    expect(readDrive(dark).displayOn).toBe(false)
    expect(readDrive(dark).busVolts).toBeGreaterThan(200)
    for (let n = 0; n < 6; n++) expect(view(dark, page(n)).display).toEqual(['', '', '', ''])
    expect(view(dark).lamp).toBe('off')
    expect(view(dark).chargeLamp).toBe(true)
  })

  it('lights the CHARGE lamp above 60 V and puts it out at 60 V or less (IEC 60204-1 6.2.4)', () => {
    let state = run(powered(), [{ t: 0, type: 'power.off' }])
    // Step through the discharge; the lamp must change exactly where the bus crosses 60 V.
    let above = 0
    let below = 0
    while (readDrive(state).busVolts > 20) {
      const volts = readDrive(state).busVolts
      const lamp = view(state).chargeLamp
      if (volts > 60) {
        expect(lamp).toBe(true)
        if (volts < 100) above++
      } else {
        expect(lamp).toBe(false)
        below++
      }
      state = advance(state, 1000)
    }
    // Both sides of the threshold were seen near it (50 V would be lit wrongly between 50 and 60 V).
    expect(above).toBeGreaterThan(0)
    expect(below).toBeGreaterThan(0)
  })

  it('draws the I/O status screen: each input’s number, function and ON/OFF, the relay, the analog input', () => {
    const on = run(powered(), [{ t: 0, type: 'device.switched', device: 'runSwitch', position: 1 }])
    expect(view(on, page(3)).display).toEqual([
      'I/O STATUS 1/3',
      'DI1 Run           ON',
      'DI2 Raise         OFF',
      'DI3 not used      OFF',
    ])
    expect(view(on, page(4)).display[0]).toBe('I/O STATUS 2/3')
    expect(view(on, page(4)).display.slice(1)).toHaveLength(3)
    const last = view(on, page(5)).display
    expect(last[0]).toBe('I/O STATUS 3/3')
    expect(last[1]).toMatch(/^Relay\s+(OPEN|CLOSED)$/)
    expect(last[2]).toMatch(/^Analog in\s+\d+\.\d\d V$/)
    // No input volts or milliamps anywhere on the screen: those are for the meter.
    expect(view(on, page(3)).display.join(' ')).not.toMatch(/mA|\d V/)
  })

  it('steps round the pages with ▲▼ and back to the speed page', () => {
    expect(page(6)).toEqual(STATUS_SCREEN)
    expect(pressKey(STATUS_SCREEN, 'up', { active: {} as never, pending: {} }).menu).toEqual({
      screen: 'status',
      page: 5,
    })
    expect(view(powered(), page(6)).display[2]).toMatch(/^Ref /)
  })
})

describe('locks and tags on the drawn disconnect', () => {
  const tag = { name: 'Sam Apprentice', date: '2026-12-03' }

  it('draws the apprentice’s tag and the supervisor’s lock with its name', () => {
    const s = run(createSimulation(setup({ on: false, locked: false, supervisorLock: { name: 'Rena' } })), [
      { t: 0, type: 'lock.applied', tag },
    ])
    expect(view(s).power).toEqual({ on: false, locked: true, tag, supervisorLock: { name: 'Rena' } })
  })

  it('records the tag with the lock, and removing it only once confirmed', () => {
    const off = createSimulation(setup({ on: false, locked: false }))
    expect(actionsFor({ type: 'lock.toggle' }, off, 'blue', tag)).toEqual([{ type: 'lock.applied', tag }])
    const locked = run(off, [{ t: 0, type: 'lock.applied', tag }])
    expect(actionsFor({ type: 'lock.toggle' }, locked, 'blue', tag)).toEqual([])
    expect(actionsFor({ type: 'lock.remove' }, locked, 'blue')).toEqual([{ type: 'lock.removed' }])
  })
})

describe('a trip on the drive display', () => {
  const trip = (text: string, check: string): FrontPanelReading => ({
    lit: true,
    chargeLamp: true,
    io: { inputs: [], relayClosed: false, analogVolts: 0 },
    status: {
      state: 'tripped',
      commandSource: 'terminals',
      direction: 'forward',
      outputOn: false,
      outputHz: 0,
      referenceHz: 0,
      outputVolts: 0,
      outputAmps: 0,
      torquePercent: 0,
      busVolts: 540,
      speedRpm: 0,
      faults: [{ code: 'externalFault', short: 'T-EXT', text, check }],
      alarms: [],
      restartInterlock: false,
    },
  })

  it('shows our short code and what is wrong, never the fix, in lines that fit the display', () => {
    const text = 'External fault: the external fault input is OFF (its normally closed circuit opened).'
    const fix = 'Find why the external circuit opened; when the input is ON again, reset.'
    const lines = frontPanelLines(trip(text, fix))
    expect(lines[0]).toBe('TRIPPED  T-EXT')
    expect(lines[1]).toBe('External fault: the')
    expect(lines[2].startsWith('external fault input')).toBe(true)
    expect(lines.join(' ')).not.toContain('Find why')
    for (const line of lines) expect(line.length).toBeLessThanOrEqual(24)
  })

  it('breaks at spaces and ends what does not fit with an ellipsis', () => {
    expect(wrapTwo('short words')).toEqual(['short words', ''])
    const [a, b] = wrapTwo('one two three four five six seven eight nine ten eleven twelve')
    expect(a).toBe('one two three four five')
    expect(b.endsWith('…')).toBe(true)
  })
})
