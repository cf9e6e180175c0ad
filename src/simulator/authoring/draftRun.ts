// What a draft needs before it can go on the panel, and what the author's set-up leaves behind, in words.
// Pure: the view and the tests call these; nothing here touches the network or the page.
import { createSimulation, readDrive, type SimState } from '@shared/model'
import { checkScenario } from '@shared/scenario/check'
import { plainIssueMessage, problemPlace } from '@shared/scenario/problemWords'
import { startingStateSchema, type Scenario, type StartingState } from '@shared/scenario/schema'
import { toSimulationSetup } from '@shared/scenario/setup'
import type { DraftPurpose } from '../machines/liveAttemptMachine'
import type { KeypadMenu } from '../scene/keypadMenu'

/** A problem as the author reads it: where, and what is wrong. */
export interface DraftRunProblem {
  place: string
  message: string
}

export type DraftRunCheck = { ok: true; scenario: Scenario } | { ok: false; problems: DraftRunProblem[] }

/** What the set-up panel shows of a draft that may not be complete: everything but its start, emptied. */
function setupScenario(document: Record<string, unknown>, start: StartingState, title: string): Scenario {
  return {
    id: typeof document.id === 'string' && document.id ? document.id : 'draft',
    version: 1,
    title: title || 'Untitled scenario',
    site: { name: '', machine: '', people: [] },
    story: typeof document.story === 'string' ? document.story : '',
    learningOutcomes: [],
    difficulty: 'introductory',
    estimatedMinutes: 1,
    start,
    // The author sets up the bench as it should be; the draft's faults go in on top for apprentices.
    faults: [],
    hints: [],
    safetyNotes: [],
    objectives: [],
    passMark: 0,
  }
}

/**
 * Whether the draft can go on the panel for this purpose. Trying it and recording its reference need
 * the whole draft to pass its checks; setting up its start needs only a start the simulator can build.
 */
export function checkDraftForPanel(
  document: Record<string, unknown>,
  title: string,
  purpose: DraftPurpose,
): DraftRunCheck {
  if (purpose !== 'setup') {
    const checked = checkScenario(document)
    return checked.ok
      ? { ok: true, scenario: checked.scenario }
      : { ok: false, problems: checked.problems.map(({ place, message }) => ({ place, message })) }
  }
  const parsed = startingStateSchema.safeParse(document.start)
  if (!parsed.success) {
    return {
      ok: false,
      problems: parsed.error.issues.map((issue) => ({
        place: problemPlace(['start', ...issue.path], document),
        message: plainIssueMessage(issue),
      })),
    }
  }
  const scenario = setupScenario(document, parsed.data, title)
  try {
    createSimulation(toSimulationSetup(scenario))
  } catch (error) {
    return { ok: false, problems: [{ place: 'Starting state', message: (error as Error).message }] }
  }
  return { ok: true, scenario }
}

/** Why the panel cannot be saved as the start just now (a half-done action), or null when it can. */
export function setupRefusal(sim: SimState, menu: KeypadMenu, drawingWire: boolean): string | null {
  if (drawingWire) return 'A wire is being drawn: finish it on a terminal, or let it go, before saving.'
  if (menu.screen === 'edit')
    return 'The keypad is in the middle of changing a setting: confirm it with OK or leave with Back.'
  if (Object.keys(sim.settings.pending).length > 0)
    return 'Some settings were changed but not saved on the keypad: save them or put them back first.'
  const held = sim.deviceOrder.find((id) => sim.devices[id]!.pressed)
  if (held) return `${sim.devices[held]!.spec.label} is held down: let it go first.`
  const drive = readDrive(sim)
  if (drive.speedRpm > 0.5 || drive.outputHz > 0)
    return 'The motor is turning: stop the drive first. An exercise always starts with the motor at rest.'
  return null
}

/** What an apprentice will find at the start, in one sentence (shown in the set-up bar). */
export function startInWords(power: { on: boolean; locked: boolean; supervisorLock?: unknown }): string {
  if (power.on)
    return 'Apprentices will find the disconnect ON and the panel live: let the story say so, so that isolating comes first.'
  const locks = [
    power.locked ? 'their own lock on it' : '',
    power.supervisorLock ? "a supervisor's lock" : '',
  ]
    .filter(Boolean)
    .join(' and ')
  return `Apprentices will find the disconnect OFF${locks ? `, with ${locks}` : ''}.`
}
