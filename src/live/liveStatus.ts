// The status line an apprentice's panel sends with its live posts: only what the bench shows (the drive's
// display through readFrontPanel, the disconnect and its locks) and what the live grader has judged so far.
import type { LiveStatus } from '@shared/api/live'
import { readDrive } from '@shared/model'
import { readFrontPanel } from '@shared/model/frontPanel'
import type { SimState } from '@shared/model/types'
import type { GradeResult } from '@shared/scenario/grade'
import { stateWord } from '@/simulator/scene/driveDisplay'

const MAX_ALARMS = 10

/** "SPEEDING UP" → "Speeding up": the display's word as a sentence begins. */
function sentenceCase(word: string): string {
  const lower = word.toLowerCase()
  return lower.charAt(0).toUpperCase() + lower.slice(1)
}

export function liveStatusOf(sim: SimState, grade: GradeResult | null, violations: number): LiveStatus {
  const drive = readDrive(sim)
  const panel = readFrontPanel(sim, drive)
  const notices = panel.status ? [...panel.status.faults, ...panel.status.alarms] : []
  return {
    powerOn: sim.power.on,
    ownLock: sim.power.locked,
    supervisorLock: !!sim.power.supervisorLock,
    driveState: sentenceCase(stateWord(drive)),
    // A dark display shows no frequency: report none rather than what the model knows.
    outputHz: panel.status ? Math.round(panel.status.outputHz * 10) / 10 : 0,
    alarms: notices.slice(0, MAX_ALARMS).map((n) => `${n.short} ${n.text}`.slice(0, 120)),
    safetyViolations: Math.max(violations, grade?.safetyViolations.length ?? 0),
    objectivesMet: grade?.objectives.filter((o) => o.met).length ?? 0,
    objectivesTotal: grade?.objectives.length ?? 0,
  }
}
