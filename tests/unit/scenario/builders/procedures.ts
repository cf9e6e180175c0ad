// Steps shared by many attempt scripts: isolation and proving dead, restoring power, standard wiring.
import type { LogBuilder } from './logBuilder'

export const LINE_AND_BUS_PAIRS: [string, string][] = [
  ['drive.l1', 'drive.l2'],
  ['drive.l2', 'drive.l3'],
  ['drive.l1', 'drive.l3'],
  ['drive.dcp', 'drive.dcn'],
]

export interface IsolationOptions {
  /** Prove the meter on the live supply first (NFPA 70E 120.5(7) live-dead-live, first half). */
  proveMeter?: boolean
  /**
   * Live–dead–live on the bench's proving unit (NFPA 70E 120.5(7)): prove the meter on it before
   * switching off and again after the dead test.
   */
  liveDeadLive?: boolean
  /** Apply a lock after switching off (the typical mistake is to skip it). */
  lock?: boolean
  /** Measure every pair after the bus has discharged (the typical mistake is to skip it). */
  proveDead?: boolean
}

/** Switch off, lock, wait for the DC bus to fall below 40 V with the probes on it, test each pair. */
export function isolateAndProve(b: LogBuilder, options: IsolationOptions = {}): LogBuilder {
  const { proveMeter = false, liveDeadLive = false, lock = true, proveDead = true } = options
  if (liveDeadLive) b.probe('prover.pos', 'prover.neg').wait(2000)
  if (b.drive.lineOn) {
    if (proveMeter) b.probe('drive.l1', 'drive.l2').wait(2000)
    b.powerOff().wait(1000)
  }
  if (lock && !b.drive.locked) b.lock().wait(1000)
  if (proveDead) b.probe('drive.dcp', 'drive.dcn').wait(1000)
  b.waitUntil((d) => d.busVolts < 40, 'the DC bus discharging below 40 V', 1000)
  if (proveDead) {
    for (const [red, black] of LINE_AND_BUS_PAIRS.slice(0, 3)) b.probe(red, black).wait(2000)
  }
  if (liveDeadLive) b.probe('prover.pos', 'prover.neg').wait(2000)
  return b.probe(null, null).wait(1000)
}

/** Lift the probes, remove the lock, switch on and wait for the DC bus to charge. */
export function restorePower(b: LogBuilder): LogBuilder {
  if (b.drive.locked) b.unlock().wait(1000)
  return b
    .powerOn()
    .waitUntil((d) => d.power === 'ready', 'the drive becoming ready', 100, 10_000)
    .wait(1000)
}

/** Sink logic: DCM to 0 V; +24 V looped through the run selector to the raise and lower buttons. */
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
