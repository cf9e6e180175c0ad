// The circuit reading for the frame path: the nodal solution changes only when the wiring, the power or
// the relay does, so it is recomputed then (and a few times a second while the meter sits on a point,
// where the DC bus may be decaying), not on every frame.
import { readCircuit } from '@shared/model'
import type { CircuitReading, DriveReading, SimState } from '@shared/model/types'

const METER_REFRESH_MS = 200

export function createCircuitCache() {
  let cached: { key: string; reading: CircuitReading; at: number } | null = null
  return {
    read(sim: SimState, drive: DriveReading, logLength: number, wallNow: number): CircuitReading {
      const key = `${logLength}|${drive.power}|${drive.displayOn}|${drive.relayClosed}`
      const meterLive =
        sim.meter.red !== null && sim.meter.black !== null && wallNow - (cached?.at ?? 0) > METER_REFRESH_MS
      if (!cached || cached.key !== key || meterLive) cached = { key, reading: readCircuit(sim), at: wallNow }
      return cached.reading
    },
    forget() {
      cached = null
    },
  }
}
