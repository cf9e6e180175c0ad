// Migrations in order, listed explicitly (no glob: bundlers and tsx need static imports).
import { InitialSchema1764600000000 } from './1764600000000-initial-schema'
import { SharedRateLimits1764700000000 } from './1764700000000-shared-rate-limits'
import { GradebookCoveringIndex1764800000000 } from './1764800000000-gradebook-covering-index'
import { GradebookRevision1764900000000 } from './1764900000000-gradebook-revision'
import { JobQueue1765000000000 } from './1765000000000-job-queue'
import { Lti1765100000000 } from './1765100000000-lti'
import { OutcomeSignOffs1765200000000 } from './1765200000000-outcome-sign-offs'
import { InstructorWeek1765300000000 } from './1765300000000-instructor-week'
import { MailPreferences1765400000000 } from './1765400000000-mail-preferences'
import { SignOffWithdrawals1765600000000 } from './1765600000000-sign-off-withdrawals'
import { AssistanceLevels1765700000000 } from './1765700000000-assistance-levels'
import { LiveClassroom1765800000000 } from './1765800000000-live-classroom'
import { ScenarioAuthoring1765900000000 } from './1765900000000-scenario-authoring'
import { DraftReferenceGrade1766000000000 } from './1766000000000-draft-reference-grade'

export const migrations = [
  InitialSchema1764600000000,
  SharedRateLimits1764700000000,
  GradebookCoveringIndex1764800000000,
  GradebookRevision1764900000000,
  JobQueue1765000000000,
  Lti1765100000000,
  OutcomeSignOffs1765200000000,
  InstructorWeek1765300000000,
  MailPreferences1765400000000,
  SignOffWithdrawals1765600000000,
  AssistanceLevels1765700000000,
  LiveClassroom1765800000000,
  ScenarioAuthoring1765900000000,
  DraftReferenceGrade1766000000000,
]
