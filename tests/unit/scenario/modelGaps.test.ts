// Things the grader would judge if the model offered them. Each is noted for the model's owner;
// the grader does not work around them.
import { describe, it } from 'vitest'

describe('model features the grader is waiting for', () => {
  // NFPA 70E 120.5(7) asks for the tester to be re-proved on a known live source AFTER the dead test.
  // Once the drive is isolated and its bus discharged, nothing the meter can reach in the model is
  // live (no proving unit, no separately fed terminal), so `proveMeterAfter` can never be met and no
  // shipped scenario uses it. Wanted: a proving unit (or another known source) among the meter's points.
  it.todo(
    're-proves the meter on a known live source after the dead test (needs a proving unit in the model)',
  )

  // Meter across an OPEN contact (or a broken wire) in series with a digital input reads ~0.24 V instead
  // of about the supply. Seen on the bench conveyor (reference-memory): run selector at 0, probes on
  // runSwitch.a / runSwitch.b: nodes a = 24 V, b = 0 V, meter 0.2376 V. Same across the broken run wire
  // in dead-control-circuit (runSwitch.b 24 V, DI1 0 V, meter 0.24 V). A real meter (10 MΩ) in series
  // with the opto input reads the supply minus the LED drop (~23 V): "voltage across an open = supply"
  // is the fault-finding rule scenarios 6 and 11 teach. Likely cause: the meter's own current returns
  // only through the ~1 GΩ leakage because the input is treated as non-conducting (24 V × 10 M / 1 G).
  it.todo('reads about the supply across an open contact feeding a digital input (reads 0.24 V today)')

  // The model reports a fractional event time as "before the simulation time 0 ms"; grade() refuses
  // such logs itself with a clear GradeInputError, so this only affects direct users of applyEvent.
  it.todo(
    'names a non-integer event time as such in the model error (the message says "before the simulation time")',
  )
})
