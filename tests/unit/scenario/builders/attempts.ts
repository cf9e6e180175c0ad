// Attempt scripts: for every scenario a reference solution and typical mistakes, each with the
// objectives it is expected to miss. `npm run fixtures:build` writes them to tests/fixtures/attempts/.
import { frequencyForRpm } from '@shared/model'
import type { LogBuilder } from './logBuilder'
import {
  checkMeterOnProver,
  isolateAndProve,
  restorePower,
  running,
  standstill,
  wireRaiseLower,
  wireRunSelector,
} from './procedures'

export interface AttemptScript {
  scenario: string
  name: string
  description: string
  /** Objective ids this attempt should miss (empty for a reference solution). */
  misses: string[]
  /** Healthy parts it replaces: each costs the noNeedlessReplacements objective its costEach. */
  needless?: number
  build(b: LogBuilder): void
}

// ---------- 1. safe-isolation ----------
const safeIsolation: AttemptScript[] = [
  {
    scenario: 'safe-isolation',
    name: 'reference',
    description:
      'Live–dead–live: switched off, locked, watched the bus discharge, checked the meter on the proving unit (V AC and V DC), proved every phase to phase, phase to earth and the bus dead, checked the meter on the proving unit again.',
    misses: [],
    build: (b) => {
      b.wait(3000)
      isolateAndProve(b, { liveDeadLive: true })
      b.wait(5000)
    },
  },
  {
    scenario: 'safe-isolation',
    name: 'mistake-meter-not-reproved',
    description:
      'Proved the meter on the live line first and every pair dead, but never re-proved the meter afterwards (dead–live only).',
    misses: ['proved-dead'],
    build: (b) => {
      b.wait(3000)
      isolateAndProve(b, { proveMeter: true })
      b.wait(5000)
    },
  },
  {
    scenario: 'safe-isolation',
    name: 'mistake-bus-measured-too-soon',
    description:
      'Measured the DC bus seconds after switching off (still ~500 V), moved on to the lines and never re-measured it.',
    misses: ['proved-dead'],
    build: (b) => {
      b.wait(3000)
      checkMeterOnProver(b).powerOff().wait(1000).lock().wait(1000)
      b.measure('drive.dcp', 'drive.dcn', 'dcVolts').wait(3000)
      b.measure('drive.l1', 'drive.l2', 'acVolts').wait(2000).probe('drive.l2', 'drive.l3').wait(2000)
      b.probe('drive.l1', 'drive.l3').wait(2000)
      checkMeterOnProver(b).probe(null, null)
      b.waitUntil((d) => d.busVolts < 40, 'the bus discharging', 1000).wait(5000)
    },
  },
  {
    scenario: 'safe-isolation',
    name: 'mistake-no-lock',
    description: 'Switched off and proved dead properly (live–dead–live) but never applied a lock.',
    misses: ['isolated'],
    build: (b) => {
      b.wait(3000)
      isolateAndProve(b, { liveDeadLive: true, lock: false })
      b.wait(5000)
    },
  },
]

// ---------- 2. two-wire-run-stop ----------
function twoWire(b: LogBuilder, proveDead: boolean): void {
  b.wait(2000)
  isolateAndProve(b, { proveDead })
  wireRunSelector(b)
  restorePower(b)
  b.configure({ 'control.source': 'terminals', 'di1.function': 'run' }).wait(1000)
  b.switchTo('runSwitch', 1).waitUntil(running, 'reaching 35 Hz').wait(8000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the ramp stop').wait(2000)
}
const twoWireRunStop: AttemptScript[] = [
  {
    scenario: 'two-wire-run-stop',
    name: 'reference',
    description:
      'Switched off, locked, proved dead, wired DIC to 0V and the selector from +24 to DI1, assigned run, terminal control, ran and stopped.',
    misses: [],
    build: (b) => twoWire(b, true),
  },
  {
    scenario: 'two-wire-run-stop',
    name: 'mistake-not-proved-dead',
    description: 'Switched off and locked, but wired without testing for absence of voltage.',
    misses: ['proved-dead'],
    build: (b) => twoWire(b, false),
  },
]

// ---------- 3. raise-lower-commissioning ----------
/** 1200 rpm on the sawmill motor (4 poles, 60 Hz, 1750 rpm rated), as the drive computes it. */
const sawmillHz = frequencyForRpm(1200, 4, 60, 1750)

function commission(b: LogBuilder, options: { raiseToHz: number; hint?: string }): void {
  b.wait(2000)
  if (options.hint) b.hint(options.hint).wait(5000)
  isolateAndProve(b)
  wireRaiseLower(b)
  restorePower(b)
  b.configure({
    'control.source': 'terminals',
    'di1.function': 'run',
    'di2.function': 'raise',
    'di3.function': 'lower',
    'reference.remoteSource': 'raiseLower',
  }).wait(1000)
  b.switchTo('runSwitch', 1).waitUntil(running, 'reaching minimum speed').wait(3000)
  b.holdUntil('raiseButton', (d) => d.referenceHz >= options.raiseToHz, 'raising the reference')
  b.waitUntil(running, 'reaching the raised speed').wait(15_000)
  b.hold('lowerButton', 3000).wait(3000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the ramp stop').wait(2000)
}
const raiseLowerCommissioning: AttemptScript[] = [
  {
    scenario: 'raise-lower-commissioning',
    name: 'reference',
    description:
      'Added own lock beside the supervisor’s, proved dead, wired run/raise/lower in sink logic, asked the supervisor to unlock, programmed, raised to 1200 rpm, held, lowered, stopped.',
    misses: [],
    build: (b) => commission(b, { raiseToHz: sawmillHz }),
  },
  {
    scenario: 'raise-lower-commissioning',
    name: 'mistake-released-raise-early',
    description:
      'Everything right, but FASTER was released at about 1100 rpm and the speed was never brought to 1200 rpm.',
    misses: ['target-speed'],
    build: (b) => commission(b, { raiseToHz: frequencyForRpm(1100, 4, 60, 1750) }),
  },
  {
    scenario: 'raise-lower-commissioning',
    name: 'reference-with-hint',
    description: 'The reference solution after revealing the reference-source hint (costs 10 points).',
    misses: [],
    build: (b) => commission(b, { raiseToHz: sawmillHz, hint: 'hint-reference' }),
  },
]

// ---------- 4. configuration-conflict-alarm ----------
function clearAlarm(
  b: LogBuilder,
  options: { rewireLive?: boolean; save?: boolean; diagnose?: boolean; swapParts?: boolean },
): void {
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(3000)
  if (options.rewireLive) {
    b.unwire('wRaiseOut').wait(4000).wire('wRaiseOut2', 'raiseButton.b', 'drive.di2').wait(3000)
  }
  if (options.swapParts) {
    // Parts swapped on a guess, safely: every contact block and the control fuse.
    isolateAndProve(b)
    for (const device of ['runSwitch', 'raiseButton', 'lowerButton']) b.fitContact(device, 'NO').wait(3000)
    b.record({ type: 'fuse.replaced' }).wait(3000)
    restorePower(b)
  }
  if (options.diagnose !== false)
    b.diagnose({ kind: 'setting', key: 'reference.remoteSource' }, 'wrongSetting').wait(2000)
  b.set('reference.remoteSource', 'raiseLower').wait(1000)
  if (options.save !== false) b.save().wait(1000)
  b.switchTo('runSwitch', 1).waitUntil(running, 'reaching minimum speed').wait(2000)
  b.hold('raiseButton', 3000).wait(4000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the ramp stop').wait(2000)
}
const configurationConflictAlarm: AttemptScript[] = [
  {
    scenario: 'configuration-conflict-alarm',
    name: 'reference',
    description:
      'Read the alarm, diagnosed the remote reference as set wrong, set it to raise/lower and saved, then proved RAISE works and holds.',
    misses: [],
    build: (b) => clearAlarm(b, {}),
  },
  {
    scenario: 'configuration-conflict-alarm',
    name: 'mistake-rewired-live',
    description:
      'Suspected the wiring and made the RAISE wire again with the drive powered (a healthy wire: a needless replacement), then fixed the setting.',
    misses: ['no-needless', 'not-energised'],
    needless: 1,
    build: (b) => clearAlarm(b, { rewireLive: true }),
  },
  {
    scenario: 'configuration-conflict-alarm',
    name: 'mistake-never-saved',
    description:
      'Changed the reference source but never saved it, so the alarm stayed and RAISE still did nothing (and the diagnosis is never judged).',
    misses: ['cause-diagnosed', 'reference-source', 'alarm-cleared', 'raise-works'],
    build: (b) => clearAlarm(b, { save: false }),
  },
  {
    scenario: 'configuration-conflict-alarm',
    name: 'mistake-no-diagnosis',
    description: 'Fixed the setting straight away without recording a diagnosis first.',
    misses: ['cause-diagnosed'],
    build: (b) => clearAlarm(b, { diagnose: false }),
  },
  {
    scenario: 'configuration-conflict-alarm',
    name: 'mistake-swapped-parts',
    description:
      'Swapped every contact block and the control fuse under lockout on a guess, then changed the setting without a diagnosis: below the pass mark.',
    misses: ['cause-diagnosed', 'no-needless'],
    needless: 4,
    build: (b) => clearAlarm(b, { swapParts: true, diagnose: false }),
  },
]

// ---------- 5. reference-memory ----------
function rememberSpeed(b: LogBuilder, options: { powerCycle: boolean }): void {
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(2000)
  b.configure({ 'raiseLower.memoryAtStop': 'keep', 'raiseLower.memoryAtPowerLoss': 'keep' }).wait(1000)
  b.switchTo('runSwitch', 1).waitUntil(running, 'reaching minimum speed').wait(2000)
  b.hold('raiseButton', 8000).waitUntil(running, 'reaching the raised speed').wait(3000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the first stop').wait(3000)
  b.switchTo('runSwitch', 1).waitUntil(running, 'the restart').wait(3000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the second stop').wait(3000)
  if (options.powerCycle) {
    b.powerOff()
      .waitUntil((d) => !d.displayOn, 'the drive shutting down', 1000)
      .wait(5000)
    b.powerOn()
      .waitUntil((d) => d.power === 'ready', 'the drive becoming ready')
      .wait(2000)
    b.switchTo('runSwitch', 1).waitUntil(running, 'the restart after power-up').wait(3000)
    b.switchTo('runSwitch', 0).waitUntil(standstill, 'the last stop').wait(2000)
  }
}
const referenceMemory: AttemptScript[] = [
  {
    scenario: 'reference-memory',
    name: 'reference',
    description:
      'Set both memory options to keep, showed a restart at the remembered speed after a stop and after a power cycle.',
    misses: [],
    build: (b) => rememberSpeed(b, { powerCycle: true }),
  },
  {
    scenario: 'reference-memory',
    name: 'mistake-power-option-not-proved',
    description:
      'Set both options but only demonstrated the stop and restart, never the supply being switched off and on.',
    misses: ['restart-after-power'],
    build: (b) => rememberSpeed(b, { powerCycle: false }),
  },
]

// ---------- 6. creeping-speed-wrong-contact ----------
function replaceContact(
  b: LogBuilder,
  options: { lock: boolean; measure?: boolean; diagnose?: boolean; swapParts?: boolean },
): void {
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(2000)
  b.switchTo('runSwitch', 1).wait(8000) // the reference creeps up on its own
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the ramp stop').wait(2000)
  // ~0 V on V DC: closed at rest (a healthy normally-open contact would read the supply)
  if (options.measure !== false)
    b.measure('raiseButton.a', 'raiseButton.b', 'dcVolts').wait(3000).probe(null, null).wait(1000)
  if (options.diagnose !== false)
    b.diagnose({ kind: 'device', device: 'raiseButton' }, 'wrongContactType').wait(2000)
  isolateAndProve(b, { lock: options.lock })
  if (options.swapParts) {
    b.record({ type: 'fuse.replaced' }).wait(3000)
    b.fitContact('runSwitch', 'NO').wait(3000).fitContact('lowerButton', 'NO').wait(3000)
  }
  b.fitContact('raiseButton', 'NO').wait(5000)
  restorePower(b)
  b.switchTo('runSwitch', 1).waitUntil(running, 'reaching minimum speed').wait(3000)
  b.hold('raiseButton', 4000).waitUntil(running, 'reaching the raised speed').wait(5000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the ramp stop').wait(2000)
}
const creepingSpeed: AttemptScript[] = [
  {
    scenario: 'creeping-speed-wrong-contact',
    name: 'reference',
    description:
      'Saw the creep, measured ~0 V across the released button, diagnosed the wrong contact type, isolated, fitted an NO block, verified.',
    misses: [],
    build: (b) => replaceContact(b, { lock: true }),
  },
  {
    scenario: 'creeping-speed-wrong-contact',
    name: 'mistake-no-lock',
    description:
      'Switched off, waited and proved dead, but changed the contact block without locking the disconnect.',
    misses: ['locked-first'],
    build: (b) => replaceContact(b, { lock: false }),
  },
  {
    scenario: 'creeping-speed-wrong-contact',
    name: 'mistake-diagnosed-without-measuring',
    description:
      'Recorded the right diagnosis from the symptom alone, without a meter reading that tells the fault apart.',
    misses: ['cause-measured'],
    build: (b) => replaceContact(b, { lock: true, measure: false }),
  },
  {
    scenario: 'creeping-speed-wrong-contact',
    name: 'mistake-swapped-parts',
    description:
      'No measurement and no diagnosis: under lockout, replaced the control fuse and every contact block on a guess. Below the pass mark.',
    misses: ['cause-diagnosed', 'cause-measured', 'no-needless'],
    needless: 3,
    build: (b) => replaceContact(b, { lock: true, measure: false, diagnose: false, swapParts: true }),
  },
]

// ---------- 7. inputs-never-on ----------
function fixInputs(
  b: LogBuilder,
  options: { proveDead?: boolean; logic?: boolean; diagnose?: boolean; swapParts?: boolean },
): void {
  const diagnose = options.diagnose !== false
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(2000)
  b.switchTo('runSwitch', 1).wait(3000)
  // 0 V from DI1 to DIC with RUN made: no current flows, so no return path through the input common.
  if (diagnose) b.measure('drive.di1', 'drive.dcom', 'dcVolts').wait(3000).probe(null, null).wait(1000)
  b.switchTo('runSwitch', 0).wait(2000) // nothing happens
  if (options.logic !== false) {
    if (diagnose) b.diagnose({ kind: 'setting', key: 'inputs.logic' }, 'wrongSetting').wait(2000)
    b.configure({ 'inputs.logic': 'sink' }).wait(1000)
  }
  if (diagnose) b.diagnose({ kind: 'terminal', point: 'drive.dcom' }, 'notLanded').wait(2000)
  isolateAndProve(b, { proveDead: options.proveDead ?? true })
  if (options.swapParts) {
    b.record({ type: 'fuse.replaced' }).wait(3000)
    b.fitContact('runSwitch', 'NO').wait(3000).fitContact('raiseButton', 'NO').wait(3000)
    b.unwire('wRunOut').wait(3000).wire('wRunOut2', 'runSwitch.b', 'drive.di1').wait(3000)
  }
  b.wire('wCom', 'drive.dcom', 'drive.0v').wait(4000)
  restorePower(b)
  b.switchTo('runSwitch', 1).wait(3000)
  // Raise to 30 Hz (10 s at 2 Hz/s from the 10 Hz minimum); give up after 15 s if nothing moves.
  const pressedAt = b.t
  b.holdUntil('raiseButton', (d) => d.referenceHz >= 30 || b.t >= pressedAt + 15_000, 'raising to 30 Hz')
  b.wait(12_000)
  b.switchTo('runSwitch', 0).wait(12_000)
}
const inputsNeverOn: AttemptScript[] = [
  {
    scenario: 'inputs-never-on',
    name: 'reference',
    description:
      'Measured no current path at DI1, diagnosed the input logic set wrong and the input common not connected; set sink logic, isolated and proved dead, added the DIC-0V common, ran at 30 Hz.',
    misses: [],
    build: (b) => fixInputs(b, {}),
  },
  {
    scenario: 'inputs-never-on',
    name: 'mistake-not-proved-dead',
    description: 'Switched off and locked, but added the common without testing for absence of voltage.',
    misses: ['proved-dead'],
    build: (b) => fixInputs(b, { proveDead: false }),
  },
  {
    scenario: 'inputs-never-on',
    name: 'mistake-logic-left-at-source',
    description:
      'Diagnosed and added the missing common but never looked at the input logic, left at source: the inputs still never turn on.',
    misses: ['setting-diagnosed', 'logic-setting', 'run-on', 'raise-on', 'feeder-speed'],
    build: (b) => fixInputs(b, { logic: false }),
  },
  {
    scenario: 'inputs-never-on',
    name: 'mistake-swapped-parts',
    description:
      'No diagnosis: under lockout, replaced the fuse, two contact blocks and the run wire on a guess before adding the common and fixing the logic. Below the pass mark.',
    misses: ['wiring-diagnosed', 'setting-diagnosed', 'no-needless'],
    needless: 4,
    build: (b) => fixInputs(b, { diagnose: false, swapParts: true }),
  },
]

// ---------- 8. three-wire-start-stop ----------
function threeWire(b: LogBuilder, options: { proveDead: boolean }): void {
  b.wait(2000)
  isolateAndProve(b, { proveDead: options.proveDead })
  b.wire('wCom', 'drive.dcom', 'drive.0v').wait(3000)
  b.wire('wStopFeed', 'drive.p24', 'stopButton.a').wait(3000)
  b.wire('wStopOut', 'stopButton.b', 'drive.di2').wait(3000)
  b.wire('wStartFeed', 'stopButton.a', 'startButton.a').wait(3000)
  b.wire('wStartOut', 'startButton.b', 'drive.di1').wait(3000)
  restorePower(b)
  b.configure({ 'control.source': 'terminals', 'di1.function': 'start', 'di2.function': 'stop' }).wait(1000)
  b.hold('startButton', 500).waitUntil(running, 'reaching 40 Hz').wait(8000)
  b.hold('stopButton', 500).waitUntil(standstill, 'the ramp stop').wait(2000)
}
const threeWireStartStop: AttemptScript[] = [
  {
    scenario: 'three-wire-start-stop',
    name: 'reference',
    description:
      'Switched off, locked, proved dead, wired the NC stop and NO start from +24, assigned start and stop, started, ran at 40 Hz, stopped.',
    misses: [],
    build: (b) => threeWire(b, { proveDead: true }),
  },
  {
    scenario: 'three-wire-start-stop',
    name: 'mistake-not-proved-dead',
    description: 'Switched off and locked, but wired without testing for absence of voltage.',
    misses: ['proved-dead'],
    build: (b) => threeWire(b, { proveDead: false }),
  },
]

// ---------- 9. potentiometer-reference ----------
/** The knob position that gives a reference (the input loads the wiper, so it is found by search). */
function knobFor(b: LogBuilder, hz: number): number {
  let lo = 0
  let hi = 1
  for (let i = 0; i < 30; i++) {
    const mid = (lo + hi) / 2
    if (b.peek({ type: 'device.turned', device: 'speedPot', position: mid }).referenceHz < hz) lo = mid
    else hi = mid
  }
  return Math.round(((lo + hi) / 2) * 1e6) / 1e6
}

function potentiometer(b: LogBuilder, options: { wireLow: boolean }): void {
  b.wait(2000)
  isolateAndProve(b)
  wireRunSelector(b)
  b.wire('wPotHi', 'drive.p10', 'speedPot.hi').wait(3000)
  if (options.wireLow) b.wire('wPotLo', 'speedPot.lo', 'drive.acom').wait(3000)
  b.wire('wPotWiper', 'speedPot.wiper', 'drive.ai').wait(3000)
  restorePower(b)
  b.configure({ 'control.source': 'terminals', 'di1.function': 'run' }).wait(1000)
  b.turn('speedPot', 1).wait(2000).turn('speedPot', 0).wait(2000)
  b.switchTo('runSwitch', 1).wait(2000)
  b.turn('speedPot', knobFor(b, 45)).waitUntil(running, 'reaching 45 Hz').wait(8000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the ramp stop').wait(2000)
}
const potentiometerReference: AttemptScript[] = [
  {
    scenario: 'potentiometer-reference',
    name: 'reference',
    description:
      'Switched off, locked, proved dead, wired the pot across +10/AIC with the wiper to AI, checked both ends of the knob, ran at 45 Hz.',
    misses: [],
    build: (b) => potentiometer(b, { wireLow: true }),
  },
  {
    scenario: 'potentiometer-reference',
    name: 'mistake-low-end-not-wired',
    description:
      'Left the potentiometer low end off AIC: the knob still sets a speed but never gets below about two thirds.',
    misses: ['pot-zero'],
    build: (b) => potentiometer(b, { wireLow: false }),
  },
]

// ---------- 10. fan-ramp-or-coast ----------
function fanStop(b: LogBuilder, options: { stopBeforeFix?: boolean; coast?: boolean }): void {
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(2000)
  if (options.stopBeforeFix) {
    b.switchTo('runSwitch', 1).waitUntil(running, 'reaching 50 Hz').wait(5000)
    b.switchTo('runSwitch', 0).waitUntil((d) => d.tripped, 'the bus overvoltage trip', 100, 60_000)
    b.waitUntil(standstill, 'the fan coasting to rest', 1000).wait(2000)
    b.key('reset').wait(2000)
  }
  if (options.coast) b.configure({ 'stop.mode': 'coast' }).wait(1000)
  else b.configure({ 'ramp.decelSeconds': 60 }).wait(1000)
  b.switchTo('runSwitch', 1).waitUntil(running, 'reaching 50 Hz').wait(12_000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the stop', 1000).wait(2000)
}
const fanRampOrCoast: AttemptScript[] = [
  {
    scenario: 'fan-ramp-or-coast',
    name: 'reference',
    description: 'Kept the ramp stop, set a 60 s deceleration, ran at 50 Hz and stopped without a trip.',
    misses: [],
    build: (b) => fanStop(b, {}),
  },
  {
    scenario: 'fan-ramp-or-coast',
    name: 'mistake-tripped-first',
    description:
      'Tried a stop with the 10 s ramp first: bus overvoltage trip, reset, then fixed the ramp and stopped cleanly.',
    misses: ['no-trips'],
    build: (b) => fanStop(b, { stopBeforeFix: true }),
  },
  {
    scenario: 'fan-ramp-or-coast',
    name: 'mistake-chose-coast',
    description:
      'Chose a coast stop instead of a controlled ramp: no trip, but not the stop that was asked for.',
    misses: ['decel-time', 'ramp-stop'],
    build: (b) => fanStop(b, { coast: true }),
  },
]

// ---------- 11. dead-control-circuit ----------
function repairControlCircuit(
  b: LogBuilder,
  options: { lockSecondTime: boolean; measure?: boolean; diagnose?: boolean; swapParts?: boolean },
): void {
  const measure = options.measure !== false
  const diagnose = options.diagnose !== false
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(2000)
  b.switchTo('runSwitch', 1).wait(2000) // nothing happens
  // 0 V on V DC with the display lit: no control supply
  if (measure) b.measure('drive.p24', 'drive.0v', 'dcVolts').wait(3000).probe(null, null).wait(1000)
  if (diagnose) b.diagnose({ kind: 'controlFuse' }, 'blown').wait(2000)
  b.switchTo('runSwitch', 0).wait(1000)
  isolateAndProve(b)
  b.record({ type: 'fuse.replaced' }).wait(5000)
  if (options.swapParts) {
    // On a guess, with no measurement: every part of the run circuit replaced in the same lockout.
    b.fitContact('runSwitch', 'NO').wait(3000)
    for (const [id, from, to] of [
      ['wCom', 'drive.dcom', 'drive.0v'],
      ['wRunFeed', 'drive.p24', 'runSwitch.a'],
      ['wRunOut', 'runSwitch.b', 'drive.di1'],
    ] as const)
      b.unwire(id).wait(3000).wire(`${id}2`, from, to).wait(3000)
  } else {
    restorePower(b)
    b.switchTo('runSwitch', 1).wait(2000) // still nothing: DI1 stays OFF
    // Across the run wire: an open conductor reads the supply, a healthy one about 0 V (modelGaps.test.ts).
    if (measure) b.measure('runSwitch.b', 'drive.di1', 'dcVolts').wait(3000).probe(null, null).wait(1000)
    if (diagnose) b.diagnose({ kind: 'wire', wire: 'wRunOut' }, 'open').wait(2000)
    b.switchTo('runSwitch', 0).wait(1000)
    isolateAndProve(b, { lock: options.lockSecondTime })
    b.unwire('wRunOut').wait(4000).wire('wRunOutNew', 'runSwitch.b', 'drive.di1').wait(4000)
  }
  restorePower(b)
  b.switchTo('runSwitch', 1).waitUntil(running, 'reaching 40 Hz').wait(8000)
  b.switchTo('runSwitch', 0).waitUntil(standstill, 'the ramp stop').wait(2000)
}
const deadControlCircuit: AttemptScript[] = [
  {
    scenario: 'dead-control-circuit',
    name: 'reference',
    description:
      'Measured 0 V on +24, diagnosed the control fuse blown, replaced it under lockout; then measured 24 V across the run wire, diagnosed it open, replaced it under lockout; ran at 40 Hz.',
    misses: [],
    build: (b) => repairControlCircuit(b, { lockSecondTime: true }),
  },
  {
    scenario: 'dead-control-circuit',
    name: 'mistake-no-lock-second-repair',
    description:
      'Locked out for the fuse, but replaced the broken wire with the disconnect off and unlocked.',
    misses: ['locked-first'],
    build: (b) => repairControlCircuit(b, { lockSecondTime: false }),
  },
  {
    scenario: 'dead-control-circuit',
    name: 'mistake-diagnosed-without-measuring',
    description:
      'Recorded both right diagnoses from the symptoms alone, without a meter reading that tells either fault apart.',
    misses: ['supply-measured', 'run-measured'],
    build: (b) => repairControlCircuit(b, { lockSecondTime: true, measure: false }),
  },
  {
    scenario: 'dead-control-circuit',
    name: 'mistake-swapped-parts',
    description:
      'No measurement and no diagnosis: in one lockout, replaced the fuse, the selector contact block and every wire on a guess. Runs, but below the pass mark.',
    misses: ['supply-diagnosed', 'supply-measured', 'run-diagnosed', 'run-measured', 'no-needless'],
    needless: 3,
    build: (b) =>
      repairControlCircuit(b, { lockSecondTime: true, measure: false, diagnose: false, swapParts: true }),
  },
]

export const ATTEMPT_SCRIPTS: AttemptScript[] = [
  ...safeIsolation,
  ...twoWireRunStop,
  ...raiseLowerCommissioning,
  ...configurationConflictAlarm,
  ...referenceMemory,
  ...creepingSpeed,
  ...inputsNeverOn,
  ...threeWireStartStop,
  ...potentiometerReference,
  ...fanRampOrCoast,
  ...deadControlCircuit,
]
