// Pure, memoised steps of the drive machine on plain { value, context } states.
// XState's transition() costs tens of µs; the drive's discrete state space is small, so every distinct
// drive state gets one node holding its transitions by event (the machine is pure: this changes nothing).
import { initialTransition, transition, type SnapshotFrom } from 'xstate'
import { driveMachine, type DriveEvent } from './driveMachine'
import type { DriveContext, DriveMachineValue } from './types'

export interface DrivePlain {
  value: DriveMachineValue
  context: DriveContext
}

type DriveSnapshot = SnapshotFrom<typeof driveMachine>

/** One distinct drive state (by content): the first object seen with it and its known transitions. */
interface DriveNode {
  canonical: DrivePlain
  json: string
  /** By event code: the next state's node, or UNCHANGED when the event leaves the state as it is. */
  next: (DriveNode | typeof UNCHANGED | undefined)[]
}
const UNCHANGED = 0

const snapshotOf = new WeakMap<DrivePlain, DriveSnapshot>()
const nodeOf = new WeakMap<DrivePlain, DriveNode>()
const nodeByJson = new Map<string, DriveNode>()
/** Past this many distinct drive states the table starts afresh (states seen so far keep their nodes). */
const NODE_LIMIT = 100_000
let machineSteps = 0

function snapshotFor(plain: DrivePlain): DriveSnapshot {
  let snapshot = snapshotOf.get(plain)
  if (!snapshot) {
    // A state that went through JSON (or was built by hand): rebuild the machine snapshot.
    snapshot = driveMachine.resolveState({ value: plain.value as never, context: plain.context })
    snapshotOf.set(plain, snapshot)
  }
  return snapshot
}

function nodeFor(plain: DrivePlain): DriveNode {
  let node = nodeOf.get(plain)
  if (node === undefined) {
    const json = JSON.stringify(plain)
    node = nodeByJson.get(json)
    if (node === undefined) {
      if (nodeByJson.size >= NODE_LIMIT) nodeByJson.clear()
      node = { canonical: plain, json, next: [] }
      nodeByJson.set(json, node)
    }
    nodeOf.set(plain, node)
  }
  return node
}

function toPlain(snapshot: DriveSnapshot): DrivePlain {
  const plain: DrivePlain = {
    value: snapshot.value as unknown as DriveMachineValue,
    context: snapshot.context,
  }
  snapshotOf.set(plain, snapshot)
  return plain
}

export function initialDrive(): DrivePlain {
  const [snapshot] = initialTransition(driveMachine)
  return nodeFor(toPlain(snapshot)).canonical
}

const CONFIGURE_BASE = 81
/** After the 24 CONFIGURE codes (81–104). */
const PHASE_LOSS_CODE = 105
/** A small integer per distinct event (the events carry only booleans and short enumerations). */
function eventCode(event: DriveEvent): number {
  switch (event.type) {
    case 'SIGNALS': {
      const s = event.signals
      return (
        +s.run |
        (+s.start << 1) |
        (+s.stop << 2) |
        (+s.reverse << 3) |
        (+s.faultReset << 4) |
        (+s.externalFault << 5)
      )
    }
    case 'POWER_OFF':
      return 64 + +event.controlOn
    case 'SUPPLY':
      return 66 + +event.overloaded
    case 'ALARMS':
      return 68 + +event.present
    case 'KEY':
      return event.key === 'run' ? 70 : event.key === 'stop' ? 71 : 72
    case 'TREND':
      return event.trend === 'up' ? 73 : event.trend === 'down' ? 74 : 75
    case 'POWER_ON':
      return 76
    case 'BUS_CHARGED':
      return 77
    case 'CONTROL_OFF':
      return 78
    case 'STANDSTILL':
      return 79
    case 'OVERVOLTAGE':
      return 80
    case 'PHASE_LOSS':
      return PHASE_LOSS_CODE
    case 'CONFIGURE': {
      const c = event.config
      const runMode = c.runMode === 'run' ? 0 : c.runMode === 'start' ? 1 : 2
      return (
        CONFIGURE_BASE +
        (+(c.source === 'terminals') | (+(c.stopMode === 'coast') << 1) | (+c.reverseAllowed << 2)) * 3 +
        runMode
      )
    }
  }
}

/**
 * The drive state after an event. Returns `plain` itself when the event changes nothing, otherwise
 * one shared object per distinct state — so `a !== sendDrive(a, e)` exactly when the state changed,
 * whatever the memo holds.
 */
export function sendDrive(plain: DrivePlain, event: DriveEvent): DrivePlain {
  const node = nodeFor(plain)
  const code = eventCode(event)
  let next = node.next[code]
  if (next === undefined) {
    machineSteps++
    const [snapshot] = transition(driveMachine, snapshotFor(plain), event)
    const target = nodeFor(toPlain(snapshot))
    // By content: after the table starts afresh, an equal state may have a second node.
    next = target === node || target.json === node.json ? UNCHANGED : target
    node.next[code] = next
  }
  return next === UNCHANGED ? plain : next.canonical
}

/** Number of real machine transitions computed (benchmark statistics). */
export function driveStepCount(): number {
  return machineSteps
}

export function clearDriveMemo(): void {
  nodeByJson.clear()
}
