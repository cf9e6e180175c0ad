// Pure, memoised steps of the drive machine on plain { value, context } states.
// XState's transition() costs tens of µs; the drive's discrete state space is small, so equal
// (state, event) pairs share one computed result (the machine is pure, so this changes nothing).
import { initialTransition, transition, type SnapshotFrom } from 'xstate'
import { driveMachine, type DriveEvent } from './driveMachine'
import type { DriveContext, DriveMachineValue } from './types'

export interface DrivePlain {
  value: DriveMachineValue
  context: DriveContext
}

type DriveSnapshot = SnapshotFrom<typeof driveMachine>

const snapshotOf = new WeakMap<DrivePlain, DriveSnapshot>()
const keyOf = new WeakMap<DrivePlain, string>()
const memo = new Map<string, DrivePlain>()
const MEMO_LIMIT = 20_000
let machineSteps = 0

function toPlain(snapshot: DriveSnapshot): DrivePlain {
  const plain: DrivePlain = {
    value: snapshot.value as unknown as DriveMachineValue,
    context: snapshot.context,
  }
  snapshotOf.set(plain, snapshot)
  return plain
}

function snapshotFor(plain: DrivePlain): DriveSnapshot {
  let snapshot = snapshotOf.get(plain)
  if (!snapshot) {
    // A state that went through JSON (or was built by hand): rebuild the machine snapshot.
    snapshot = driveMachine.resolveState({ value: plain.value as never, context: plain.context })
    snapshotOf.set(plain, snapshot)
  }
  return snapshot
}

function stateKey(plain: DrivePlain): string {
  let key = keyOf.get(plain)
  if (key === undefined) {
    key = JSON.stringify(plain)
    keyOf.set(plain, key)
  }
  return key
}

export function initialDrive(): DrivePlain {
  const [snapshot] = initialTransition(driveMachine)
  return toPlain(snapshot)
}

export function sendDrive(plain: DrivePlain, event: DriveEvent): DrivePlain {
  const key = `${stateKey(plain)}|${JSON.stringify(event)}`
  const hit = memo.get(key)
  if (hit) return hit
  machineSteps++
  const [next] = transition(driveMachine, snapshotFor(plain), event)
  let result = toPlain(next)
  // Keep identity when nothing changed, so callers can compare states with ===.
  if (stateKey(result) === stateKey(plain)) result = plain
  if (memo.size >= MEMO_LIMIT) memo.clear()
  memo.set(key, result)
  return result
}

/** Number of real machine transitions computed (benchmark statistics). */
export function driveStepCount(): number {
  return machineSteps
}

export function clearDriveMemo(): void {
  memo.clear()
}
