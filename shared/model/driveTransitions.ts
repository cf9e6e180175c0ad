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
/** Each distinct drive state gets a small id (by its JSON), so memo keys stay short. */
const idOf = new WeakMap<DrivePlain, number>()
const idByJson = new Map<string, number>()
let nextId = 0
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

function stateId(plain: DrivePlain): number {
  let id = idOf.get(plain)
  if (id === undefined) {
    const json = JSON.stringify(plain)
    id = idByJson.get(json)
    if (id === undefined) {
      // Ids are never reused (even after a clear), so a cached id can never name another state.
      id = nextId++
      if (idByJson.size >= 100_000) idByJson.clear()
      idByJson.set(json, id)
    }
    idOf.set(plain, id)
  }
  return id
}

export function initialDrive(): DrivePlain {
  const [snapshot] = initialTransition(driveMachine)
  return toPlain(snapshot)
}

function eventKey(event: DriveEvent): string {
  switch (event.type) {
    case 'SIGNALS': {
      const s = event.signals
      return `G${+s.run}${+s.start}${+s.stop}${+s.reverse}${+s.faultReset}${+s.externalFault}`
    }
    case 'POWER_OFF':
      return `O${+event.controlOn}`
    case 'SUPPLY':
      return `U${+event.overloaded}`
    case 'ALARMS':
      return `A${+event.present}`
    case 'KEY':
      return `K${event.key}`
    case 'TREND':
      return `T${event.trend}`
    default:
      return JSON.stringify(event)
  }
}

export function sendDrive(plain: DrivePlain, event: DriveEvent): DrivePlain {
  const key = `${stateId(plain)}|${eventKey(event)}`
  const hit = memo.get(key)
  if (hit) return hit
  machineSteps++
  const [next] = transition(driveMachine, snapshotFor(plain), event)
  let result = toPlain(next)
  // Keep identity when nothing changed, so callers can compare states with ===.
  if (stateId(result) === stateId(plain)) result = plain
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
  idByJson.clear()
}
