// Maps a scenario's starting state onto the model's SimulationSetup.
import type { SettingKey, SettingValue, SimulationSetup } from '../model'
import type { Scenario } from './schema'

export function toSimulationSetup(scenario: Scenario): SimulationSetup {
  const { start } = scenario
  const machine: SimulationSetup['machine'] = {}
  if (start.machine?.coastSeconds !== undefined) machine.coastSeconds = start.machine.coastSeconds
  if (start.machine?.minDecelSeconds !== undefined) machine.minDecelSeconds = start.machine.minDecelSeconds
  if (start.machine?.loadKind !== undefined) machine.loadKind = start.machine.loadKind
  if (start.machine?.loadFraction !== undefined) machine.loadFraction = start.machine.loadFraction
  const setup: SimulationSetup = {
    devices: start.devices.map((device) => ({ ...device })),
    wires: start.wires.map((wire) => ({ ...wire })),
    // Keys and values are checked by checkScenario against the catalogue before a scenario is used.
    settings: { ...start.settings } as Partial<Record<SettingKey, SettingValue>>,
    power: start.power.supervisorLock
      ? { ...start.power, supervisorLock: { ...start.power.supervisorLock } }
      : { ...start.power },
    faults: scenario.faults.map((fault) => ({ ...fault })),
    machine,
  }
  if (start.lineVolts !== undefined) setup.lineVolts = start.lineVolts
  if (start.motor !== undefined) setup.motor = { ...start.motor }
  if (start.motorCable !== undefined) setup.motorCable = { ...start.motorCable }
  return setup
}
