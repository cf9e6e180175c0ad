// The as-wired schematic of an attempt at its last recorded moment, drawn in the browser with the same
// shared code the server's PDF uses (shared/model replays, shared/schematic draws).
import { applyEvent, createSimulation, type AttemptEvent } from '@shared/model'
import type { Scenario } from '@shared/scenario'
import { toSimulationSetup } from '@shared/scenario/setup'
import { drawSchematic, wiringOfState } from '@shared/schematic'

export function asWiredSchematic(scenario: Scenario, events: readonly AttemptEvent[]) {
  const end = events.reduce(applyEvent, createSimulation(toSimulationSetup(scenario)))
  const { svg, layout } = drawSchematic(wiringOfState(end), {
    title: `Control circuit as wired: ${scenario.title}`,
  })
  return { svg, width: layout.width, height: layout.height, wires: layout.wires.length }
}
