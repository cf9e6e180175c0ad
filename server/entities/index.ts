// Every entity, listed explicitly for the DataSource.
import { AssignmentEntity } from './assignment'
import { AssignmentExceptionEntity } from './assignment-exception'
import { AssignmentRecipientEntity } from './assignment-recipient'
import { AttemptEntity } from './attempt'
import { AuditEntryEntity } from './audit-entry'
import { CentreSettingsEntity } from './centre-settings'
import { CohortEntity } from './cohort'
import { CohortInstructorEntity } from './cohort-instructor'
import { EnrollmentEntity } from './enrollment'
import { FeedbackEntity } from './feedback'
import { InvitationEntity } from './invitation'
import { JobEntity } from './job'
import { liveEntities } from './live'
import { ltiEntities } from './lti'
import { MailMessageEntity } from './mail-message'
import { OutcomeSignOffEntity } from './outcome-sign-off'
import { OutcomeSignOffWithdrawalEntity } from './outcome-sign-off-withdrawal'
import { PasswordResetEntity } from './password-reset'
import { RateLimitCounterEntity } from './rate-limit-counter'
import { RefreshTokenEntity } from './refresh-token'
import { ScenarioEntity } from './scenario'
import { ScenarioDraftEntity, ScenarioReferenceSolutionEntity } from './scenario-draft'
import { UploadEntity } from './upload'
import { UserEntity } from './user'

export * from './assignment'
export * from './assignment-exception'
export * from './assignment-recipient'
export * from './attempt'
export * from './audit-entry'
export * from './centre-settings'
export * from './cohort'
export * from './cohort-instructor'
export * from './enrollment'
export * from './feedback'
export * from './invitation'
export * from './job'
export * from './live'
export * from './lti'
export * from './mail-message'
export * from './outcome-sign-off'
export * from './outcome-sign-off-withdrawal'
export * from './password-reset'
export * from './rate-limit-counter'
export * from './refresh-token'
export * from './scenario'
export * from './scenario-draft'
export * from './upload'
export * from './user'

export const entities = [
  UserEntity,
  RefreshTokenEntity,
  PasswordResetEntity,
  CohortEntity,
  EnrollmentEntity,
  InvitationEntity,
  ScenarioEntity,
  AssignmentEntity,
  AttemptEntity,
  FeedbackEntity,
  AuditEntryEntity,
  MailMessageEntity,
  UploadEntity,
  RateLimitCounterEntity,
  JobEntity,
  ...ltiEntities,
  OutcomeSignOffEntity,
  OutcomeSignOffWithdrawalEntity,
  CentreSettingsEntity,
  AssignmentExceptionEntity,
  AssignmentRecipientEntity,
  CohortInstructorEntity,
  ...liveEntities,
  ScenarioDraftEntity,
  ScenarioReferenceSolutionEntity,
]
