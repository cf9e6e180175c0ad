// The scenario checker: shipped files validate; bad files are rejected with clear messages and JSON paths.
import { readdirSync, readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { checkScenario, jsonPath, type Scenario } from '@shared/scenario'

const dir = resolve(import.meta.dirname, '../../../scenarios')
const files = readdirSync(dir)
  .filter((f) => f.endsWith('.json'))
  .sort()

function load(name: string): Scenario {
  return JSON.parse(readFileSync(join(dir, name), 'utf8')) as Scenario
}

/** A deep copy of a shipped scenario, changed by `edit`. */
function variant(edit: (s: Scenario) => void, name = 'raise-lower-commissioning.json'): unknown {
  const scenario = structuredClone(load(name))
  edit(scenario)
  return scenario
}

function problemsOf(input: unknown) {
  const result = checkScenario(input)
  return result.ok ? [] : result.problems
}

describe('shipped scenarios', () => {
  it('ships at least ten scenario files', () => {
    expect(files.length).toBeGreaterThanOrEqual(10)
  })

  it.each(files)('%s validates', (name) => {
    expect(problemsOf(load(name))).toEqual([])
  })

  it('gives every scenario a unique kebab-case id matching its file name', () => {
    const ids = files.map((f) => load(f).id)
    expect(new Set(ids).size).toBe(ids.length)
    for (const f of files) expect(`${load(f).id}.json`).toBe(f)
  })

  it('has safety notes that defer to local codes and qualified supervision in every scenario', () => {
    for (const f of files) {
      const notes = load(f).safetyNotes.join(' ')
      expect(notes, f).toMatch(/local electrical codes/i)
      expect(notes, f).toMatch(/qualified supervision/i)
      expect(notes, f).toMatch(/DC bus/i)
    }
  })
})

describe('checkScenario rejects bad files', () => {
  it('writes JSON paths with indexes and quoted odd keys', () => {
    expect(jsonPath(['objectives', 3, 'target'])).toBe('$.objectives[3].target')
    expect(jsonPath(['start', 'settings', 'speed.max'])).toBe('$.start.settings["speed.max"]')
  })

  it('reports wrong types at their path', () => {
    const problems = problemsOf(variant((s) => ((s as unknown as { version: string }).version = 'one')))
    expect(problems).toHaveLength(1)
    expect(problems[0].path).toBe('$.version')
  })

  it('reports every schema problem, not just the first', () => {
    const problems = problemsOf(
      variant((s) => {
        ;(s as unknown as { id: string }).id = 'Not A Slug'
        ;(s.objectives[0] as unknown as { weight: number }).weight = -5
      }),
    )
    expect(problems.map((p) => p.path)).toEqual(expect.arrayContaining(['$.id', '$.objectives[0].weight']))
  })

  it('rejects an unknown objective kind', () => {
    const problems = problemsOf(
      variant((s) => ((s.objectives[0] as { kind: string }).kind = 'wishfulThinking')),
    )
    expect(problems[0].path).toBe('$.objectives[0].kind')
  })

  it('rejects an unknown setting key', () => {
    const problems = problemsOf(variant((s) => (s.start.settings['speed.maximum'] = 60)))
    expect(problems).toMatchObject([
      { path: '$.start.settings["speed.maximum"]', message: '"speed.maximum" is not a drive setting.' },
    ])
  })

  it('rejects a setting value out of its range, with the allowed range in the message', () => {
    const problems = problemsOf(variant((s) => (s.start.settings['ramp.accelSeconds'] = 9000)))
    expect(problems).toHaveLength(1)
    expect(problems[0].path).toBe('$.start.settings["ramp.accelSeconds"]')
    expect(problems[0].message).toMatch(/between 0.1 s and 600 s/)
  })

  it('rejects a wire to a terminal that does not exist', () => {
    const problems = problemsOf(
      variant((s) =>
        s.start.wires.push({ id: 'wX', from: 'drive.p24', to: 'ghostButton.a', colour: 'blue' }),
      ),
    )
    expect(problems).toMatchObject([
      {
        path: '$.start.wires[0].to',
        message: 'ghostButton.a is not a terminal of the drive or of a declared device',
      },
    ])
  })

  it('rejects an injected fault on a device that does not exist', () => {
    const problems = problemsOf(variant((s) => s.faults.push({ kind: 'contactWelded', device: 'nobody' })))
    expect(problems).toMatchObject([{ path: '$.faults[0].device', message: 'no device has the id "nobody"' }])
  })

  it('rejects a broken-wire fault naming a wire that is not in the starting wiring', () => {
    const problems = problemsOf(variant((s) => s.faults.push({ kind: 'brokenWire', wireId: 'wMissing' })))
    expect(problems[0]).toMatchObject({
      path: '$.faults[0].wireId',
      message: 'no starting wire has the id "wMissing"',
    })
  })

  it('rejects an objective that refers to a hint that does not exist', () => {
    const problems = problemsOf(variant((s) => (s.objectives[0].hints = ['hint-nowhere'])))
    expect(problems).toMatchObject([
      { path: '$.objectives[0].hints[0]', message: 'no hint has the id "hint-nowhere"' },
    ])
  })

  it('rejects a target speed above the maximum speed the scenario allows', () => {
    const problems = problemsOf(
      variant((s) => {
        const target = s.objectives.find((o) => o.kind === 'speedHeld')!
        if (target.kind === 'speedHeld') target.target = 2400 // rpm: needs ~82 Hz, maximum is 60 Hz
      }),
    )
    expect(problems).toHaveLength(1)
    expect(problems[0].path).toMatch(/^\$\.objectives\[\d+\]\.target$/)
    expect(problems[0].message).toMatch(
      /^unreachable: 2400 rpm needs at least .* Hz but the maximum speed is 60 Hz$/,
    )
  })

  it('rejects a setting objective whose value is out of range', () => {
    const problems = problemsOf(
      variant((s) =>
        s.objectives.push({
          id: 'too-fast',
          kind: 'settingEquals',
          title: 'Impossible',
          weight: 1,
          key: 'raiseLower.rate',
          value: 500,
        }),
      ),
    )
    expect(problems).toHaveLength(1)
    expect(problems[0].path).toBe(
      `$.objectives[${load('raise-lower-commissioning.json').objectives.length}].value`,
    )
    expect(problems[0].message).toMatch(/^unreachable: Raise \/ lower rate must be between/)
  })

  it('rejects a setting objective with a choice the setting does not offer', () => {
    const problems = problemsOf(
      variant((s) => {
        const o = s.objectives.find((x) => x.kind === 'settingEquals')!
        if (o.kind === 'settingEquals') o.value = 'raiseAndLower'
      }),
    )
    expect(problems).toHaveLength(1)
    expect(problems[0].message).toMatch(/must be one of/)
  })

  it('rejects a pass mark above the total weight', () => {
    const problems = problemsOf(variant((s) => (s.passMark = 101)))
    expect(problems).toMatchObject([
      {
        path: '$.passMark',
        message: 'the pass mark (101) is above the total weight of the objectives (100)',
      },
    ])
  })

  it('rejects a wiring condition on a device of the wrong kind', () => {
    const problems = problemsOf(
      variant((s) => {
        const o = s.objectives.find((x) => x.kind === 'wiringCondition')!
        if (o.kind === 'wiringCondition') o.while = { held: ['runSwitch'] }
      }),
    )
    expect(problems).toHaveLength(1)
    expect(problems[0].message).toBe('runSwitch is a selector; this needs a pushbutton')
  })

  it('rejects a fault objective pointing past the injected faults', () => {
    const problems = problemsOf(
      variant((s) => {
        const o = s.objectives.find((x) => x.kind === 'faultFoundAndCleared')!
        if (o.kind === 'faultFoundAndCleared') o.fault = 3
      }, 'creeping-speed-wrong-contact.json'),
    )
    expect(problems).toMatchObject([
      { path: '$.objectives[2].fault', message: 'there is no injected fault number 3 (the scenario has 1)' },
    ])
  })

  it('accepts re-proving the meter after the dead test (the bench has a proving unit)', () => {
    const problems = problemsOf(
      variant((s) => {
        const o = s.objectives.find((x) => x.kind === 'absenceOfVoltageProved')!
        if (o.kind === 'absenceOfVoltageProved') o.proveMeterAfter = true
      }),
    )
    expect(problems).toEqual([])
  })

  it('rejects duplicate ids', () => {
    const problems = problemsOf(variant((s) => (s.objectives[1].id = s.objectives[0].id)))
    expect(problems).toMatchObject([
      {
        path: '$.objectives[1].id',
        message: `objective id "${load('raise-lower-commissioning.json').objectives[0].id}" is used twice`,
      },
    ])
  })

  it('rejects starting settings that break the rules between settings', () => {
    const problems = problemsOf(variant((s) => (s.start.settings['speed.min'] = 60)))
    expect(
      problems.some((p) => p.path === '$.start.settings["speed.min"]' && /below maximum/.test(p.message)),
    ).toBe(true)
  })
})

describe('checkScenario on the motor, its cable and the bench points', () => {
  it('reports a nameplate whose figures disagree, at the field that disagrees', () => {
    const problems = problemsOf(
      variant((s) => {
        s.start.motor = { ...s.start.motor!, ratedVolts: 400 } // 400 V at 60 Hz: an unusual pairing
      }),
    )
    expect(problems.map((p) => p.path)).toContain('$.start.motor.ratedVolts')
    const amps = problemsOf(variant((s) => (s.start.motor = { ...s.start.motor!, fullLoadAmps: 12 })))
    expect(amps.map((p) => p.path)).toEqual(['$.start.motor.fullLoadAmps'])
    expect(amps[0].message).toMatch(/rated output is 3\.73 kW/)
  })

  it('refuses a cable with two conductors on one motor terminal', () => {
    const problems = problemsOf(variant((s) => (s.start.motorCable = { u: 'u1', v: 'u1', w: 'w1' })))
    expect(problems[0].message).toMatch(/two conductors cannot land on one motor terminal/)
  })

  it('accepts a broken motor conductor as an injected fault', () => {
    expect(problemsOf(variant((s) => (s.faults = [{ kind: 'motorConductorOpen', conductor: 'v' }])))).toEqual(
      [],
    )
  })

  it('accepts a dead input and a changed setting as injected faults, and refuses ones that would show nothing', () => {
    const on = (faults: Scenario['faults']) =>
      problemsOf(variant((s) => (s.faults = faults), 'reference-memory.json'))
    expect(
      on([
        { kind: 'inputUnresponsive', input: 2 },
        { kind: 'settingChanged', key: 'stop.mode', value: 'coast' },
      ]),
    ).toEqual([])
    expect(on([{ kind: 'inputUnresponsive', input: 5 }])).toMatchObject([
      {
        path: '$.faults[0].input',
        message: 'DI5 has no function at the start, so its fault would show nothing',
      },
    ])
    expect(on([{ kind: 'settingChanged', key: 'speed.max', value: 50 }])).toMatchObject([
      {
        path: '$.faults[0].value',
        message: 'the starting settings already have this value, so nothing would change',
      },
    ])
    expect(on([{ kind: 'settingChanged', key: 'speed.max', value: 900 }])[0]?.path).toBe('$.faults[0].value')
    expect(
      on([
        { kind: 'settingChanged', key: 'speed.max', value: 40 },
        { kind: 'settingChanged', key: 'speed.max', value: 30 },
      ]),
    ).toMatchObject([{ path: '$.faults[1].key', message: 'another fault already changes this setting' }])
  })

  it('keeps the bench names motor and prover for the bench itself', () => {
    const problems = problemsOf(variant((s) => (s.start.devices[0].id = 'motor')))
    expect(problems.some((p) => p.path === '$.start.devices[0].id' && /reserved/.test(p.message))).toBe(true)
  })

  it('refuses a starting wire on a motor terminal (meter only)', () => {
    const problems = problemsOf(
      variant((s) => s.start.wires.push({ id: 'wBad', from: 'motor.u1', to: 'drive.p24', colour: 'blue' })),
    )
    expect(problems.map((p) => p.message)).toContain('motor.u1 is a power terminal and cannot be wired')
  })

  it('takes a supervisor’s lock in the story only on a disconnect that starts off', () => {
    expect(load('raise-lower-commissioning.json').start.power.supervisorLock).toEqual({
      name: 'Rena Dubrovny',
    })
    const energised = problemsOf(
      variant(
        (s) => (s.start.power = { on: true, locked: false, supervisorLock: { name: 'Rena Dubrovny' } }),
      ),
    )
    expect(energised.map((p) => p.message).join(' ')).toMatch(/Rena Dubrovny's lock while it is on/)
    const unnamed = problemsOf(variant((s) => (s.start.power.supervisorLock = { name: '' })))
    expect(unnamed.some((p) => p.path.startsWith('$.start.power.supervisorLock'))).toBe(true)
  })
})
