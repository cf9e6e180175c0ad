// What the drive's front panel shows: the display only while the electronics are powered, the charge
// lamp while the bus is above 60 V, and an I/O status screen with input states but no volts or mA.
import { describe, expect, it } from 'vitest'
import { advance, CHARGE_LAMP_VOLTS, readDrive, readFrontPanel } from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

const off = () => start(raiseLowerSetup({ power: { on: false, locked: false } }))

describe('the display', () => {
  it('shows the bus, the reference and the output while the drive is powered', () => {
    const panel = readFrontPanel(start())
    expect(panel.lit).toBe(true)
    expect(panel.status!.busVolts).toBeCloseTo(readDrive(start()).busVolts, 6)
    expect(panel.status!.referenceHz).toBe(5)
    expect(panel.status!.state).toBe('stopped')
    expect(panel.status!.commandSource).toBe('terminals')
  })

  it('shows nothing at all once the electronics have gone dark, though the bus is still charged', () => {
    const s = advance(run(start(), [{ t: 0, type: 'power.off' }]), 10_000)
    expect(readDrive(s).busVolts).toBeGreaterThan(200)
    const panel = readFrontPanel(s)
    expect(panel).toEqual({ lit: false, chargeLamp: true, status: null, io: null })
  })

  it('says it is starting up while the bus charges, once the electronics wake', () => {
    const s = advance(run(off(), [{ t: 0, type: 'power.on' }]), 1000)
    expect(readFrontPanel(s).status!.state).toBe('startingUp')
  })
})

describe('the charge lamp (IEC 60204-1 6.2.4: above 60 V is hazardous until discharged)', () => {
  it('uses the 60 V threshold', () => {
    expect(CHARGE_LAMP_VOLTS).toBe(60)
  })

  it('stays lit after the display goes dark, and goes out only once the bus is at 60 V or less', () => {
    const s = run(start(), [{ t: 0, type: 'power.off' }])
    let t = 0
    let state = s
    while (readDrive(state).busVolts > 60) {
      expect(readFrontPanel(state).chargeLamp).toBe(true)
      state = advance(state, 5000)
      t += 5000
    }
    expect(t).toBeGreaterThan(60_000) // minutes, not seconds: hence the warning on the drive
    expect(readFrontPanel(state).chargeLamp).toBe(false)
  })

  it('is dark on a drive that was never powered', () => {
    expect(readFrontPanel(off()).chargeLamp).toBe(false)
  })
})

describe('the I/O status screen', () => {
  it('lists each input with its function and its ON/OFF state, and the relay', () => {
    const s = run(start(), [{ t: 0, type: 'device.pressed', device: 'raisePb' }])
    const io = readFrontPanel(s).io!
    expect(io.inputs.map((i) => [i.input, i.function, i.on])).toEqual([
      [1, 'run', false],
      [2, 'raise', true],
      [3, 'lower', false],
      [4, 'none', false],
      [5, 'none', false],
      [6, 'none', false],
    ])
    expect(io.relayClosed).toBe(false)
  })

  it('gives no input volts or milliamps (those are for the meter)', () => {
    const io = readFrontPanel(start()).io!
    for (const input of io.inputs) expect(Object.keys(input).sort()).toEqual(['function', 'input', 'on'])
  })

  it('is not there while the drive is dark', () => {
    expect(readFrontPanel(off()).io).toBeNull()
  })
})
