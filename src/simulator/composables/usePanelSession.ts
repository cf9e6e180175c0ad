// A live session on the panel: the model actor (via @xstate/vue), the simulated clock and the
// event log. Events are validated with the shared schema before they are recorded.
import { shallowRef } from 'vue'
import { useActorRef } from '@xstate/vue'
import { attemptEventSchema, type AttemptEvent } from '@shared/model/events'
import { readCircuit, readDrive } from '@shared/model'
import { simulationMachine } from '../machines/simulationMachine'
import type { SimulationSetup } from '@shared/model/setup'
import type { CircuitReading, DriveReading, SimState } from '@shared/model/types'
import { createSimClock } from '@/simulator/scene/simClock'

type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never
export type PanelAction = DistributiveOmit<AttemptEvent, 't'>

export interface RecordResult {
  event: AttemptEvent | null
  /** Drive reading just before the event, for the safety check of wiring changes. */
  before: DriveReading
  error: string | null
}

export function usePanelSession(setup: SimulationSetup, initialLog: readonly AttemptEvent[]) {
  const actor = useActorRef(simulationMachine, { input: { setup, log: [...initialLog] } })
  const startT = initialLog.length ? initialLog[initialLog.length - 1].t : 0
  const clock = createSimClock(startT)

  const sim = (): SimState => actor.getSnapshot().context.sim
  const log = shallowRef<readonly AttemptEvent[]>(actor.getSnapshot().context.log)
  const drive = shallowRef<DriveReading>(readDrive(sim()))
  const circuit = shallowRef<CircuitReading>(readCircuit(sim()))

  /** Lets simulated time catch up with the clock. Called once per frame; no other model work. */
  function tick(): SimState {
    const t = clock.time()
    if (t > sim().t) actor.send({ type: 'tick', t })
    return sim()
  }

  /** Recomputes the readings the side panels show (after events, and a few times a second). */
  function refresh() {
    drive.value = readDrive(sim())
    circuit.value = readCircuit(sim())
  }

  function record(action: PanelAction): RecordResult {
    tick()
    const before = readDrive(sim())
    const parsed = attemptEventSchema.safeParse({ ...action, t: Math.max(clock.time(), sim().t) })
    if (!parsed.success) {
      return {
        event: null,
        before,
        error: `That action was not recorded: ${parsed.error.issues[0]?.message}`,
      }
    }
    actor.send({ type: 'record', event: parsed.data })
    log.value = actor.getSnapshot().context.log
    refresh()
    return { event: parsed.data, before, error: null }
  }

  return { actor, clock, sim, log, drive, circuit, tick, refresh, record }
}
