// Every transition of the pure drive machine, driven with xstate's pure initialTransition/transition
// (no actor, no timers). State names map onto CiA 402 (IEC 61800-7-201) as tabled in driveMachine.ts.
import { describe, expect, it } from 'vitest'
import { initialTransition, transition } from 'xstate'
import {
  DEFAULT_DRIVE_CONFIG,
  driveMachine,
  NO_SIGNALS,
  type DriveEvent,
} from '../../../shared/model/driveMachine'
import type { DriveConfig, DriveSignals } from '../../../shared/model/index'

const keypad: DriveConfig = { ...DEFAULT_DRIVE_CONFIG, source: 'keypad' }
const terminals = (over: Partial<DriveConfig> = {}): DriveConfig => ({
  ...DEFAULT_DRIVE_CONFIG,
  source: 'terminals',
  runMode: 'run',
  ...over,
})
const signals = (over: Partial<DriveSignals>): DriveEvent => ({
  type: 'SIGNALS',
  signals: { ...NO_SIGNALS, ...over },
})

function after(events: DriveEvent[]) {
  let [snapshot] = initialTransition(driveMachine)
  for (const event of events) [snapshot] = transition(driveMachine, snapshot, event)
  return snapshot
}

const ready: DriveEvent[] = [{ type: 'POWER_ON' }, { type: 'BUS_CHARGED' }]
const runningKeypad: DriveEvent[] = [
  { type: 'CONFIGURE', config: keypad },
  ...ready,
  { type: 'KEY', key: 'run' },
]

describe('power region', () => {
  it.each<[string, DriveEvent[], string]>([
    ['off → charging on POWER_ON', [{ type: 'POWER_ON' }], 'charging'],
    ['charging → ready on BUS_CHARGED', ready, 'ready'],
    [
      'charging → discharging when switched off with the electronics awake',
      [{ type: 'POWER_ON' }, { type: 'POWER_OFF', controlOn: true }],
      'discharging',
    ],
    [
      'charging → off when switched off before the electronics woke',
      [{ type: 'POWER_ON' }, { type: 'POWER_OFF', controlOn: false }],
      'off',
    ],
    ['ready → discharging on POWER_OFF', [...ready, { type: 'POWER_OFF', controlOn: true }], 'discharging'],
    [
      'ready → off on POWER_OFF with the electronics already dark',
      [...ready, { type: 'POWER_OFF', controlOn: false }],
      'off',
    ],
    [
      'discharging → charging on POWER_ON',
      [...ready, { type: 'POWER_OFF', controlOn: true }, { type: 'POWER_ON' }],
      'charging',
    ],
    [
      'discharging → off on CONTROL_OFF',
      [...ready, { type: 'POWER_OFF', controlOn: true }, { type: 'CONTROL_OFF' }],
      'off',
    ],
  ])('%s', (_, events, power) => {
    expect(after(events).value).toMatchObject({ power })
  })
})

describe('control region', () => {
  it('stopped → accelerating when run is commanded and the drive is ready', () => {
    expect(after(runningKeypad).value).toMatchObject({ control: 'accelerating' })
  })

  it('stays stopped on a run command while the bus is still charging', () => {
    expect(
      after([{ type: 'CONFIGURE', config: keypad }, { type: 'POWER_ON' }, { type: 'KEY', key: 'run' }]).value,
    ).toMatchObject({
      control: 'stopped',
    })
  })

  it.each<[string, DriveEvent[], string]>([
    ['accelerating → atSpeed', [{ type: 'TREND', trend: 'steady' }], 'atSpeed'],
    ['accelerating → decelerating', [{ type: 'TREND', trend: 'down' }], 'decelerating'],
    [
      'atSpeed → accelerating',
      [
        { type: 'TREND', trend: 'steady' },
        { type: 'TREND', trend: 'up' },
      ],
      'accelerating',
    ],
    [
      'atSpeed → decelerating',
      [
        { type: 'TREND', trend: 'steady' },
        { type: 'TREND', trend: 'down' },
      ],
      'decelerating',
    ],
    [
      'decelerating → atSpeed',
      [
        { type: 'TREND', trend: 'down' },
        { type: 'TREND', trend: 'steady' },
      ],
      'atSpeed',
    ],
    [
      'decelerating → accelerating',
      [
        { type: 'TREND', trend: 'down' },
        { type: 'TREND', trend: 'up' },
      ],
      'accelerating',
    ],
  ])('%s on TREND', (_, events, control) => {
    expect(after([...runningKeypad, ...events]).value).toMatchObject({ control })
  })

  it('running → rampStopping on a stop with stop mode ramp', () => {
    expect(after([...runningKeypad, { type: 'KEY', key: 'stop' }]).value).toMatchObject({
      control: 'rampStopping',
    })
  })

  it('running → coasting on a stop with stop mode coast', () => {
    const coast = { type: 'CONFIGURE', config: { ...keypad, stopMode: 'coast' } } as const
    expect(after([...runningKeypad, coast, { type: 'KEY', key: 'stop' }]).value).toMatchObject({
      control: 'coasting',
    })
  })

  it('running → coasting with a powerLost fault when power goes', () => {
    const s = after([...runningKeypad, { type: 'POWER_OFF', controlOn: true }])
    expect(s.value).toMatchObject({ control: 'coasting', fault: 'tripped' })
    expect(s.context.faults).toEqual(['powerLost'])
  })

  it('running → coasting on a fault', () => {
    const s = after([...runningKeypad, { type: 'OVERVOLTAGE' }])
    expect(s.value).toMatchObject({ control: 'coasting', fault: 'tripped' })
    expect(s.context.faults).toEqual(['busOvervoltage'])
  })

  const rampStopping = [...runningKeypad, { type: 'KEY', key: 'stop' } as const]

  it('rampStopping → stopped on STANDSTILL', () => {
    expect(after([...rampStopping, { type: 'STANDSTILL' }]).value).toMatchObject({ control: 'stopped' })
  })

  it('rampStopping → accelerating when run is commanded again', () => {
    expect(after([...rampStopping, { type: 'KEY', key: 'run' }]).value).toMatchObject({
      control: 'accelerating',
    })
  })

  it('rampStopping → coasting when the stop mode changes to coast', () => {
    const coast = { type: 'CONFIGURE', config: { ...keypad, stopMode: 'coast' } } as const
    expect(after([...rampStopping, coast]).value).toMatchObject({ control: 'coasting' })
  })

  it('rampStopping → coasting on a fault, and on power loss', () => {
    expect(after([...rampStopping, { type: 'OVERVOLTAGE' }]).value).toMatchObject({ control: 'coasting' })
    expect(after([...rampStopping, { type: 'POWER_OFF', controlOn: true }]).value).toMatchObject({
      control: 'coasting',
    })
  })

  it('coasting → stopped on STANDSTILL', () => {
    expect(after([...runningKeypad, { type: 'OVERVOLTAGE' }, { type: 'STANDSTILL' }]).value).toMatchObject({
      control: 'stopped',
    })
  })
})

describe('fault region and reset', () => {
  const external = [
    { type: 'CONFIGURE', config: terminals() } as const,
    ...ready,
    signals({ externalFault: true }),
  ]

  it('clear → tripped when a fault is raised', () => {
    expect(after(external).value).toMatchObject({ fault: 'tripped' })
  })

  it('refuses a keypad reset while the cause is still there', () => {
    expect(after([...external, { type: 'KEY', key: 'reset' }]).value).toMatchObject({ fault: 'tripped' })
  })

  it('tripped → clear on a keypad reset once the cause is gone', () => {
    const s = after([...external, signals({}), { type: 'KEY', key: 'reset' }])
    expect(s.value).toMatchObject({ fault: 'clear' })
    expect(s.context.faults).toEqual([])
  })

  it('tripped → clear on the rising edge of a fault-reset input once the cause is gone', () => {
    const s = after([...external, signals({}), signals({ faultReset: true })])
    expect(s.value).toMatchObject({ fault: 'clear' })
  })

  it('latches a supply overload until reset after the overload is gone', () => {
    const overload = [...ready, { type: 'SUPPLY', overloaded: true } as const]
    expect(after([...overload, { type: 'KEY', key: 'reset' }]).value).toMatchObject({ fault: 'tripped' })
    expect(
      after([...overload, { type: 'SUPPLY', overloaded: false }, { type: 'KEY', key: 'reset' }]).value,
    ).toMatchObject({
      fault: 'clear',
    })
  })

  it('forgets faults when the electronics go dark', () => {
    const s = after([...external, { type: 'POWER_OFF', controlOn: true }, { type: 'CONTROL_OFF' }])
    expect(s.value).toMatchObject({ power: 'off', fault: 'clear' })
  })
})

describe('alarm region', () => {
  it('clear → present → clear with the configuration check', () => {
    expect(after([{ type: 'ALARMS', present: true }]).value).toMatchObject({ alarm: 'present' })
    expect(
      after([
        { type: 'ALARMS', present: true },
        { type: 'ALARMS', present: false },
      ]).value,
    ).toMatchObject({
      alarm: 'clear',
    })
  })
})

describe('run commands from the terminals', () => {
  it('starts on a maintained run input', () => {
    const s = after([{ type: 'CONFIGURE', config: terminals() }, ...ready, signals({ run: true })])
    expect(s.value).toMatchObject({ control: 'accelerating' })
  })

  it('needs a run input that was already ON at power-up to be cycled first (restart interlock)', () => {
    const held = [
      { type: 'CONFIGURE', config: terminals() } as const,
      { type: 'POWER_ON' } as const,
      signals({ run: true }),
      { type: 'BUS_CHARGED' } as const,
    ]
    expect(after(held).value).toMatchObject({ control: 'stopped' })
    expect(after(held).context.interlock).toBe(true)
    expect(after([...held, signals({}), signals({ run: true })]).value).toMatchObject({
      control: 'accelerating',
    })
  })

  it('latches a momentary start while the NC stop is closed, and drops it when stop opens', () => {
    const config = { type: 'CONFIGURE', config: terminals({ runMode: 'start' }) } as const
    const started = [
      config,
      ...ready,
      signals({ stop: true }),
      signals({ stop: true, start: true }),
      signals({ stop: true }),
    ]
    expect(after(started).value).toMatchObject({ control: 'accelerating' })
    expect(after([...started, signals({ stop: false })]).value).toMatchObject({ control: 'rampStopping' })
  })

  it('ignores start while the stop circuit is open', () => {
    const config = { type: 'CONFIGURE', config: terminals({ runMode: 'start' }) } as const
    expect(after([config, ...ready, signals({ start: true })]).value).toMatchObject({ control: 'stopped' })
  })

  it('stops a terminal-controlled drive from the keypad stop key (common practice)', () => {
    const s = after([
      { type: 'CONFIGURE', config: terminals() },
      ...ready,
      signals({ run: true }),
      { type: 'KEY', key: 'stop' },
    ])
    expect(s.value).toMatchObject({ control: 'rampStopping' })
    expect(s.context.interlock).toBe(true)
  })

  it('ignores the keypad run key in terminal control', () => {
    expect(
      after([{ type: 'CONFIGURE', config: terminals() }, ...ready, { type: 'KEY', key: 'run' }]).value,
    ).toMatchObject({
      control: 'stopped',
    })
  })
})
