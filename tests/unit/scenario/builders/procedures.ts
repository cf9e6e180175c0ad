// Steps shared by many attempt scripts: isolation and proving dead, restoring power, standard wiring.
import type { LogBuilder } from './logBuilder'

/** Every phase to phase, then every phase to earth (V AC), then the DC bus (V DC). */
export const LINE_PAIRS: [string, string][] = [
  ['drive.l1', 'drive.l2'],
  ['drive.l2', 'drive.l3'],
  ['drive.l1', 'drive.l3'],
]
export const LINE_EARTH_PAIRS: [string, string][] = [
  ['drive.l1', 'drive.pe'],
  ['drive.l2', 'drive.pe'],
  ['drive.l3', 'drive.pe'],
]
export const BUS_PAIR: [string, string] = ['drive.dcp', 'drive.dcn']

export interface IsolationOptions {
  /** Prove the meter on the live supply first (NFPA 70E 120.5(7) live-dead-live, first half). */
  proveMeter?: boolean
  /**
   * Live–dead–live on the bench's proving unit (NFPA 70E 120.5(7); OSHA 1910.147(d)(6)): check the meter
   * on both ranges the test uses just before the dead test and again just after it.
   */
  liveDeadLive?: boolean
  /** Apply a lock after switching off (the typical mistake is to skip it). */
  lock?: boolean
  /** Measure every pair after the bus has discharged (the typical mistake is to skip it). */
  proveDead?: boolean
}

/** Check the meter on the proving unit: its AC output on V AC, its DC output on V DC. */
export function checkMeterOnProver(b: LogBuilder): LogBuilder {
  b.measure('prover.ac', 'prover.neg', 'acVolts').wait(2000)
  return b.measure('prover.pos', 'prover.neg', 'dcVolts').wait(2000)
}

/**
 * Switch off, lock, watch the DC bus fall below 15 V (about five minutes, the wait drive warning labels
 * commonly state), then the dead test in order: (proving unit) → every phase to phase and phase to earth →
 * DC+ to DC− → (proving unit again).
 */
export function isolateAndProve(b: LogBuilder, options: IsolationOptions = {}): LogBuilder {
  const { proveMeter = false, liveDeadLive = false, lock = true, proveDead = true } = options
  if (b.drive.lineOn) {
    if (proveMeter) b.measure('drive.l1', 'drive.l2', 'acVolts').wait(2000)
    b.powerOff().wait(1000)
  }
  if (lock && !b.drive.locked) b.lock().wait(1000)
  if (proveDead) b.measure(...BUS_PAIR, 'dcVolts').wait(1000)
  b.waitUntil((d) => d.busVolts < 15, 'the DC bus discharging below 15 V', 1000)
  if (proveDead) {
    if (liveDeadLive) checkMeterOnProver(b)
    for (const [red, black] of [...LINE_PAIRS, ...LINE_EARTH_PAIRS])
      b.measure(red, black, 'acVolts').wait(2000)
    b.measure(...BUS_PAIR, 'dcVolts').wait(2000)
    if (liveDeadLive) checkMeterOnProver(b)
  }
  return b.probe(null, null).wait(1000)
}

/**
 * Lift the probes, remove the lock (and ask the story's supervisor to remove theirs), switch on and wait
 * for the DC bus to charge.
 */
export function restorePower(b: LogBuilder): LogBuilder {
  if (b.drive.locked) b.unlock().wait(1000)
  if (b.supervisorLock) b.askSupervisorToUnlock().wait(1000)
  return b
    .powerOn()
    .waitUntil((d) => d.power === 'ready', 'the drive becoming ready', 100, 10_000)
    .wait(1000)
}

/** Sink logic: DIC to 0 V; +24 V looped through the run selector to the raise and lower buttons. */
export function wireRaiseLower(b: LogBuilder, options: { common?: boolean } = {}): LogBuilder {
  if (options.common !== false) b.wire('wCom', 'drive.dcom', 'drive.0v').wait(3000)
  return b
    .wire('wRunFeed', 'drive.p24', 'runSwitch.a')
    .wait(3000)
    .wire('wRunOut', 'runSwitch.b', 'drive.di1')
    .wait(3000)
    .wire('wRaiseFeed', 'runSwitch.a', 'raiseButton.a')
    .wait(3000)
    .wire('wRaiseOut', 'raiseButton.b', 'drive.di2')
    .wait(3000)
    .wire('wLowerFeed', 'raiseButton.a', 'lowerButton.a')
    .wait(3000)
    .wire('wLowerOut', 'lowerButton.b', 'drive.di3')
    .wait(3000)
}

export function wireRunSelector(b: LogBuilder): LogBuilder {
  return b
    .wire('wCom', 'drive.dcom', 'drive.0v')
    .wait(3000)
    .wire('wRunFeed', 'drive.p24', 'runSwitch.a')
    .wait(3000)
    .wire('wRunOut', 'runSwitch.b', 'drive.di1')
    .wait(3000)
}

export const running = (d: { control: string }) => d.control === 'atSpeed'
export const standstill = (d: { control: string }) => d.control === 'stopped'
