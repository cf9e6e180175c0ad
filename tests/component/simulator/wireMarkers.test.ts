// The schematic (shared/schematic), the panel and the grader's words mark wires and terminals alike: a
// drawing, the bench and the evidence must never disagree about a wire's number or colour code, or about
// a device terminal's marking. All three take them from shared/schematic/markings.ts.
import { describe, expect, it } from 'vitest'
import { createSimulation } from '@shared/model'
import { WIRE_COLOURS } from '@shared/model/setup'
import { schematicInputFromWiring, wireMarkerText, wiringOfState } from '@shared/schematic'
import { checkScenario, pointName, toSimulationSetup, wireName, type Scenario } from '@shared/scenario'
import { layoutPanel } from '@/simulator/scene/layout'
import { wireColour, wireLabel } from '@/simulator/scene/wireColours'

const scenarioFiles = import.meta.glob<unknown>('../../../scenarios/*.json', {
  eager: true,
  import: 'default',
})

function shippedScenarios(): Scenario[] {
  return Object.entries(scenarioFiles).map(([file, json]) => {
    const checked = checkScenario(json)
    if (!checked.ok) throw new Error(`${file}: ${JSON.stringify(checked.problems)}`)
    return checked.scenario
  })
}

const startState = (scenario: Scenario) => createSimulation(toSimulationSetup(scenario))

describe('wire markers', () => {
  it.each(WIRE_COLOURS)('match the panel for %s wires', (colour) => {
    for (const [id, index] of [
      ['w1', 0],
      ['w12', 3],
      ['wRunFeed', 2],
      ['feed7', 9],
    ] as const) {
      expect(wireMarkerText(id, colour, index)).toBe(wireLabel(id, colour, index))
    }
  })

  it('match the panel for a colour the panel does not offer (a scenario file may name one)', () => {
    for (const colour of ['salmon', 'sky-blue 2']) {
      expect(wireMarkerText('w3', colour, 0)).toBe(wireLabel('w3', colour, 0))
      expect(wireColour(colour).name).toBe(colour)
    }
    expect(wireLabel('w3', 'sky-blue 2', 0)).toBe('W3 SKYB')
  })

  it.each(shippedScenarios().map((s) => [s.id, s] as const))(
    '%s: the schematic, the panel and the grader number the starting wires alike',
    (_id, scenario) => {
      const state = startState(scenario)
      const drawn = schematicInputFromWiring(wiringOfState(state)).wires
      state.wires.forEach((wire, index) => {
        const marker = wireLabel(wire.id, wire.colour, index)
        expect(`${drawn[index]!.number} ${drawn[index]!.colour.code}`).toBe(marker)
        expect(marker.startsWith(`${wireName(wire.id, state)} `)).toBe(true)
      })
    },
  )
})

function escape(text: string): string {
  return text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')
}

describe('device terminal markings', () => {
  it.each(shippedScenarios().map((s) => [s.id, s] as const))(
    '%s: the schematic, the panel and the grader mark each device terminal alike',
    (_id, scenario) => {
      const state = startState(scenario)
      const panel = layoutPanel(scenario.start.devices).terminals
      const drawn = schematicInputFromWiring(wiringOfState(state)).devices
      let checked = 0
      for (const device of drawn) {
        for (const terminal of device.terminals) {
          expect(panel[terminal.point]?.label, terminal.point).toBe(terminal.marking)
          // The grader's name ends with the marking: "Fan run / stop terminal 13", "Stirrer speed wiper (W)".
          expect(pointName(terminal.point, state)).toMatch(
            new RegExp(`^${escape(device.name)} .*\\b${terminal.marking}\\)?$`),
          )
          checked++
        }
      }
      expect(checked).toBeGreaterThan(0)
    },
  )
})

it('reads every shipped scenario', () => {
  expect(shippedScenarios().length).toBeGreaterThan(0)
})
