// The live warning for a wiring change made while the supply is on or the DC bus still charged.
// (Grading and replay use the fuller rules in shared/scenario/safety.ts.)
import type { AttemptEvent } from '@shared/model/events'
import type { DriveReading } from '@shared/model/types'

export function isWiringEvent(e: Pick<AttemptEvent, 'type'>): boolean {
  return e.type === 'wire.added' || e.type === 'wire.removed'
}

/** Why touching the wiring now is dangerous, or null when it is isolated and discharged. */
export function energisedReason(d: Pick<DriveReading, 'lineOn' | 'busVolts' | 'busHazard'>): string | null {
  if (d.lineOn) return 'the supply disconnect is ON'
  // busHazard is the model's > 50 V test (NEC 460.6 threshold, see REFERENCES.md).
  if (d.busHazard) return `the DC bus is still at ${Math.round(d.busVolts)} V`
  return null
}

export function violationMessage(reason: string): string {
  return `Safety violation: wiring changed while ${reason}. Isolate, lock out, wait for the DC bus to discharge and prove absence of voltage first.`
}
