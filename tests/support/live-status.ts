// A panel's status summary as the live tests and the benchmark post it (shared/api/live.ts LiveStatus).
import type { LiveStatus } from '../../shared/api/live'

export const STATUS: LiveStatus = {
  powerOn: true,
  ownLock: false,
  supervisorLock: false,
  driveState: 'Ready',
  outputHz: 0,
  alarms: [],
  safetyViolations: 0,
  objectivesMet: 1,
  objectivesTotal: 5,
}
