// checkScenario: the schema plus the checks a schema cannot express (references that must exist,
// settings against the catalogue, objectives that could never be met). Every problem has a JSON path.
import {
  crossCheckSettings,
  DEFAULT_SETTINGS,
  DEVICE_TERMINALS,
  frequencyForRpm,
  INPUT_FUNCTIONS,
  isDriveControlPoint,
  isDrivePowerPoint,
  isMotorPoint,
  isSettingKey,
  nameplateProblems,
  RESERVED_DEVICE_IDS,
  settingDef,
  inputFunctionKey,
  validateSetting,
  type SettingValues,
} from '../model'
import { authoringProblems } from './authoringChecks'
import type { Objective } from './objectiveSchema'
import { objectiveKindLabel } from './kindLabels'
import { plainIssueMessage, problemPlace } from './problemWords'
import { scenarioSchema, type Scenario, type ScenarioDevice } from './schema'

export interface ScenarioProblem {
  /** JSON path, e.g. `$.objectives[3].target` (for tools and the API's field errors). */
  path: string
  /** The same place in words, for screens: `Objective 4 (Fan ran at 40 Hz), target`. */
  place: string
  message: string
}

export type ScenarioCheck = { ok: true; scenario: Scenario } | { ok: false; problems: ScenarioProblem[] }

export function jsonPath(path: readonly PropertyKey[]): string {
  return path.reduce<string>((acc, part) => {
    if (typeof part === 'number') return `${acc}[${part}]`
    const key = String(part)
    return /^[A-Za-z_$][\w$]*$/.test(key) ? `${acc}.${key}` : `${acc}[${JSON.stringify(key)}]`
  }, '$')
}

export function checkScenario(input: unknown): ScenarioCheck {
  const parsed = scenarioSchema.safeParse(input)
  if (!parsed.success) {
    return {
      ok: false,
      problems: parsed.error.issues.map((issue) => ({
        path: jsonPath(issue.path),
        place: problemPlace(issue.path, input),
        message: plainIssueMessage(issue),
      })),
    }
  }
  const problems = semanticProblems(parsed.data)
  // The grader's checks need a scenario whose references all hold.
  if (problems.length === 0)
    for (const p of authoringProblems(parsed.data))
      problems.push({ path: jsonPath(p.path), place: problemPlace(p.path, parsed.data), message: p.message })
  return problems.length === 0 ? { ok: true, scenario: parsed.data } : { ok: false, problems }
}

function semanticProblems(scenario: Scenario): ScenarioProblem[] {
  const problems: ScenarioProblem[] = []
  const add = (path: readonly PropertyKey[], message: string) =>
    problems.push({ path: jsonPath(path), place: problemPlace(path, scenario), message })
  const devices = new Map<string, ScenarioDevice>()

  scenario.start.devices.forEach((device, i) => {
    if (RESERVED_DEVICE_IDS.includes(device.id))
      add(['start', 'devices', i, 'id'], `"${device.id}" is reserved`)
    if (devices.has(device.id)) add(['start', 'devices', i, 'id'], `device id "${device.id}" is used twice`)
    devices.set(device.id, device)
  })
  const isPoint = (point: string) => {
    if (isDriveControlPoint(point)) return true
    const [deviceId, terminal] = point.split('.')
    const device = devices.get(deviceId)
    return device !== undefined && DEVICE_TERMINALS[device.kind].includes(terminal)
  }
  const wireIds = new Set<string>()
  scenario.start.wires.forEach((wire, i) => {
    if (wireIds.has(wire.id)) add(['start', 'wires', i, 'id'], `wire id "${wire.id}" is used twice`)
    wireIds.add(wire.id)
    for (const end of ['from', 'to'] as const) {
      const point = wire[end]
      if (isDrivePowerPoint(point) || isMotorPoint(point))
        add(['start', 'wires', i, end], `${point} is a power terminal and cannot be wired`)
      else if (!isPoint(point))
        add(['start', 'wires', i, end], `${point} is not a terminal of the drive or of a declared device`)
    }
    if (wire.from === wire.to) add(['start', 'wires', i, 'to'], 'a wire must join two different points')
  })

  // Settings: known keys, values in range, then the rules between settings.
  const merged: Record<string, unknown> = { ...DEFAULT_SETTINGS }
  for (const [key, value] of Object.entries(scenario.start.settings)) {
    const check = validateSetting(key, value)
    if (!check.ok) add(['start', 'settings', key], check.message)
    else merged[key] = value
  }
  for (const problem of crossCheckSettings(merged as SettingValues)) {
    // Point at a setting the scenario itself gives, when one of those is involved.
    const key = problem.keys.find((k) => k in scenario.start.settings) ?? problem.keys[0]
    add(['start', 'settings', key], problem.message)
  }

  // A lock goes on a disconnect that is off (the model refuses anything else at the start).
  const { power } = scenario.start
  if (power.on && power.locked)
    add(['start', 'power', 'locked'], 'the disconnect cannot be locked while it is on')
  if (power.on && power.supervisorLock) {
    add(
      ['start', 'power', 'supervisorLock'],
      `the disconnect cannot carry ${power.supervisorLock.name}'s lock while it is on`,
    )
  }

  if (scenario.start.motor) {
    for (const problem of nameplateProblems(scenario.start.motor))
      add(['start', 'motor', problem.field], problem.message)
  }

  scenario.faults.forEach((fault, i) => {
    if (fault.kind === 'brokenWire') {
      if (!wireIds.has(fault.wireId))
        add(['faults', i, 'wireId'], `no starting wire has the id "${fault.wireId}"`)
    } else if (fault.kind === 'inputUnresponsive') {
      const fn = merged[inputFunctionKey(fault.input)]
      if (fn === 'none')
        add(
          ['faults', i, 'input'],
          `DI${fault.input} has no function at the start, so its fault would show nothing`,
        )
    } else if (fault.kind === 'settingChanged') {
      const check = validateSetting(fault.key, fault.value)
      if (!check.ok) add(['faults', i, 'value'], check.message)
      else if (check.value === merged[fault.key])
        add(['faults', i, 'value'], 'the starting settings already have this value, so nothing would change')
      else {
        const clash = crossCheckSettings({ ...merged, [fault.key]: check.value } as SettingValues)[0]
        if (clash) add(['faults', i, 'value'], clash.message)
      }
      if (scenario.faults.some((f, j) => j < i && f.kind === 'settingChanged' && f.key === fault.key))
        add(['faults', i, 'key'], 'another fault already changes this setting')
    } else if (fault.kind !== 'blownFuse' && fault.kind !== 'motorConductorOpen') {
      const device = devices.get(fault.device)
      if (!device) add(['faults', i, 'device'], `no device has the id "${fault.device}"`)
      else if (device.kind === 'potentiometer')
        add(['faults', i, 'device'], `${fault.device} is a potentiometer and has no contact`)
    }
  })

  const hintIds = new Set<string>()
  scenario.hints.forEach((hint, i) => {
    if (hintIds.has(hint.id)) add(['hints', i, 'id'], `hint id "${hint.id}" is used twice`)
    hintIds.add(hint.id)
  })

  const limits = speedLimits(scenario, merged as SettingValues)
  const objectiveIds = new Set<string>()
  scenario.objectives.forEach((objective, i) => {
    if (objectiveIds.has(objective.id))
      add(['objectives', i, 'id'], `objective id "${objective.id}" is used twice`)
    objectiveIds.add(objective.id)
    objective.hints?.forEach((hintId, j) => {
      if (!hintIds.has(hintId)) add(['objectives', i, 'hints', j], `no hint has the id "${hintId}"`)
    })
    checkObjective(objective, (path, message) => add(['objectives', i, ...path], message), {
      scenario,
      devices,
      isPoint,
      limits,
      merged: merged as SettingValues,
    })
  })

  checkTitles(scenario, add)

  const total = scenario.objectives.reduce((a, o) => a + o.weight, 0)
  if (scenario.passMark > total) {
    add(
      ['passMark'],
      `the pass mark (${scenario.passMark}) is above the total weight of the objectives (${total})`,
    )
  }
  return problems
}

interface ObjectiveCheckContext {
  scenario: Scenario
  devices: Map<string, ScenarioDevice>
  isPoint: (point: string) => boolean
  limits: { minHz: number; maxHz: number }
  merged: SettingValues
}

/**
 * The speed range an attempt can reach: the starting limits, or the limits the scenario itself
 * asks for with a settingEquals objective (the apprentice is not expected to go past either).
 */
function speedLimits(scenario: Scenario, merged: SettingValues): { minHz: number; maxHz: number } {
  const asked = (key: 'speed.min' | 'speed.max') => {
    const objective = scenario.objectives.find((o) => o.kind === 'settingEquals' && o.key === key)
    return objective && objective.kind === 'settingEquals' && typeof objective.value === 'number'
      ? objective.value
      : merged[key]
  }
  return { minHz: asked('speed.min'), maxHz: asked('speed.max') }
}

function checkObjective(
  objective: Objective,
  add: (path: readonly PropertyKey[], message: string) => void,
  { scenario, devices, isPoint, limits, merged }: ObjectiveCheckContext,
): void {
  const needDevice = (path: readonly PropertyKey[], id: string, kinds: ScenarioDevice['kind'][]) => {
    const device = devices.get(id)
    if (!device) add(path, `no device has the id "${id}"`)
    else if (!kinds.includes(device.kind))
      add(path, `${id} is a ${device.kind}; this needs a ${kinds.join(' or ')}`)
    return device
  }
  switch (objective.kind) {
    case 'settingEquals': {
      const check = validateSetting(objective.key, objective.value)
      if (check.ok) return
      if (isSettingKey(objective.key)) add(['value'], `unreachable: ${check.message}`)
      else add(['key'], check.message)
      return
    }
    case 'settingInRange': {
      if (!isSettingKey(objective.key)) return add(['key'], `"${objective.key}" is not a drive setting.`)
      const def = settingDef(objective.key)
      if (def.kind !== 'number') return add(['key'], `${def.label} is not a number setting`)
      if (objective.min > objective.max) return add(['max'], 'max must not be below min')
      if (objective.max < def.min || objective.min > def.max) {
        add(['min'], `unreachable: ${def.label} can only be ${def.min} to ${def.max} ${def.unit}`)
      }
      return
    }
    case 'wiringCondition': {
      const condition = objective.while
      condition.held?.forEach((id, j) => needDevice(['while', 'held', j], id, ['pushbutton']))
      condition.released?.forEach((id, j) => needDevice(['while', 'released', j], id, ['pushbutton']))
      for (const [id, position] of Object.entries(condition.positions ?? {})) {
        const device = needDevice(['while', 'positions', id], id, ['selector', 'potentiometer'])
        if (device?.kind === 'selector' && position !== 0 && position !== 1) {
          add(['while', 'positions', id], 'a selector is in position 0 or 1')
        }
      }
      const { input, expect } = objective
      if ('function' in input) {
        if (!(INPUT_FUNCTIONS as readonly string[]).includes(input.function) || input.function === 'none') {
          add(
            ['input', 'function'],
            `"${input.function}" is not an input function (${INPUT_FUNCTIONS.slice(1).join(', ')})`,
          )
        }
      } else if (!isPoint(input.point)) {
        add(
          ['input', 'point'],
          `${input.point} is not a control terminal of the drive or of a declared device`,
        )
      }
      if (typeof expect === 'object' && expect.minVolts > expect.maxVolts)
        add(['expect', 'maxVolts'], 'maxVolts must not be below minVolts')
      return
    }
    case 'functionalCheck':
      needDevice(['device'], objective.device, ['pushbutton'])
      return
    case 'speedHeld': {
      const toHz = (rpm: number) =>
        frequencyForRpm(
          rpm,
          merged['motor.poles'],
          merged['motor.ratedFrequency'],
          merged['motor.ratedSpeed'],
        )
      const lo =
        objective.unit === 'rpm'
          ? toHz(objective.target - objective.tolerance)
          : objective.target - objective.tolerance
      const hi =
        objective.unit === 'rpm'
          ? toHz(objective.target + objective.tolerance)
          : objective.target + objective.tolerance
      const shown = `${objective.target} ${objective.unit}`
      if (lo > limits.maxHz) {
        add(
          ['target'],
          `unreachable: ${shown} needs at least ${lo.toFixed(1)} Hz but the maximum speed is ${limits.maxHz} Hz`,
        )
      } else if (hi < limits.minHz) {
        add(['target'], `unreachable: ${shown} is below the minimum speed of ${limits.minHz} Hz`)
      }
      if (objective.tolerance >= objective.target)
        add(['tolerance'], 'the tolerance must be smaller than the target')
      return
    }
    case 'stoppedBy':
      if ((objective.fromAtLeastHz ?? 0) > limits.maxHz) {
        add(['fromAtLeastHz'], `unreachable: above the maximum speed of ${limits.maxHz} Hz`)
      }
      return
    case 'restartedWithRememberedReference':
      if ((objective.minReferenceHz ?? 0) > limits.maxHz) {
        add(['minReferenceHz'], `unreachable: above the maximum speed of ${limits.maxHz} Hz`)
      }
      return
    case 'absenceOfVoltageProved':
      // proveMeterBefore / proveMeterAfter are always reachable: the bench's meter proving unit
      // (prover.pos / prover.neg, 110 V DC) stays live whatever the disconnect does.
      objective.pairs?.forEach((pair, j) =>
        pair.forEach((point, k) => {
          if (!isDrivePowerPoint(point) && !isMotorPoint(point) && !isPoint(point))
            add(['pairs', j, k], `${point} is not a terminal the meter can reach`)
        }),
      )
      return
    case 'diagnosisCorrect': {
      if ((objective.fault === undefined) === (objective.expect === undefined))
        return add(
          [],
          'give either fault (an injected fault) or expect (a problem built into the start), not both',
        )
      const target = objective.expect?.target
      if (target?.kind === 'wire' && !scenario.start.wires.some((w) => w.id === target.wire))
        add(['expect', 'target', 'wire'], `no starting wire has the id "${target.wire}"`)
      if (target?.kind === 'device')
        needDevice(['expect', 'target', 'device'], target.device, ['pushbutton', 'selector'])
      if (target?.kind === 'terminal' && !isPoint(target.point))
        add(
          ['expect', 'target', 'point'],
          `${target.point} is not a control terminal of the drive or of a declared device`,
        )
      if (objective.fault !== undefined && objective.fault >= scenario.faults.length)
        add(
          ['fault'],
          `there is no injected fault number ${objective.fault} (the scenario has ${scenario.faults.length})`,
        )
      return
    }
    case 'discriminatingMeasurement':
    case 'faultFoundAndCleared':
      if (objective.fault >= scenario.faults.length) {
        add(
          ['fault'],
          `there is no injected fault number ${objective.fault} (the scenario has ${scenario.faults.length})`,
        )
      }
      return
    default:
      return
  }
}

/**
 * Words that name a fault: an objective title must say what the apprentice achieves ("Control supply
 * restored"), never what was injected ("Blown fuse replaced"), or the title gives the diagnosis away.
 */
const FAULT_WORDS =
  /\b(blown|broken|welded|fuse|failed[- ]open|wrong contact|open conductor|open circuit|not landed|missing)\b/i

/** Objective titles of a troubleshooting scenario (one with injected faults) must not name a fault. */
function checkTitles(scenario: Scenario, add: (path: readonly PropertyKey[], message: string) => void): void {
  if (scenario.faults.length === 0) return
  scenario.objectives.forEach((objective, i) => {
    const word = FAULT_WORDS.exec(objective.title)?.[0]
    if (word)
      add(['objectives', i, 'title'], `the title names the fault ("${word}"): say what is achieved instead`)
  })
}

/**
 * The shipped scenarios' rule for troubleshooting (`npm run scenarios:check`; not part of checkScenario, so a
 * test can grade one objective on a bench with a fault): each injected fault has a diagnosisCorrect and a
 * discriminatingMeasurement objective (a changed setting is read on the keypad, not measured: none for it),
 * and there is a noNeedlessReplacements objective.
 */
export function methodProblems(scenario: Scenario): ScenarioProblem[] {
  if (scenario.faults.length === 0) return []
  const problems: ScenarioProblem[] = []
  const judged = (kind: Objective['kind'], fault: number) =>
    scenario.objectives.some((o) => o.kind === kind && 'fault' in o && o.fault === fault)
  scenario.faults.forEach((fault, i) => {
    const kinds =
      fault.kind === 'settingChanged'
        ? (['diagnosisCorrect'] as const)
        : (['diagnosisCorrect', 'discriminatingMeasurement'] as const)
    for (const kind of kinds)
      if (!judged(kind, i))
        problems.push({
          path: jsonPath(['faults', i]),
          place: problemPlace(['faults', i], scenario),
          message: `No objective of the kind “${objectiveKindLabel(kind)}” judges this fault`,
        })
  })
  if (!scenario.objectives.some((o) => o.kind === 'noNeedlessReplacements'))
    problems.push({
      path: '$.objectives',
      place: 'Objectives',
      message: `A troubleshooting scenario needs an objective of the kind “${objectiveKindLabel('noNeedlessReplacements')}”`,
    })
  return problems
}
