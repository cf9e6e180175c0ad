// An attempt row → the API's AttemptSummary (and AttemptOverview with feedback and grade history, AttemptDetail
// with its log as well);
// feedback and grade audit rows → Feedback and GradeAuditEntry. Names come in; ids stay ids.
import type {
  AttemptDetail,
  AttemptOverview,
  AttemptSummary,
  Feedback,
  GradeAuditEntry,
} from '@shared/api/attempts'
import type { AttemptRow, AuditEntryRow, FeedbackRow } from '../entities'

/** An attempt without its event log: everything a summary shows. */
export type AttemptSummaryRow = Omit<AttemptRow, 'events'>

export const presentAttemptSummary = (
  row: AttemptSummaryRow,
  related: { userName: string; scenario: { key: string; version: number; title: string } },
): AttemptSummary => ({
  id: row.id,
  userId: row.userId,
  userName: related.userName,
  assignmentId: row.assignmentId,
  scenarioId: row.scenarioId,
  scenarioKey: related.scenario.key,
  scenarioVersion: related.scenario.version,
  scenarioTitle: related.scenario.title,
  status: row.status,
  assistanceLevel: row.assistanceLevel,
  eventCount: row.eventCount,
  late: Boolean(row.late),
  startedAt: row.startedAt,
  updatedAt: row.updatedAt,
  submittedAt: row.submittedAt,
  grade:
    row.score === null || row.autoScore === null
      ? null
      : {
          score: row.score,
          passed: Boolean(row.passed),
          autoScore: row.autoScore,
          autoPassed: Boolean(row.autoPassed),
          overridden: row.score !== row.autoScore || Boolean(row.passed) !== Boolean(row.autoPassed),
          evidence: row.evidence ? JSON.parse(row.evidence) : null,
          gradedAt: row.gradedAt ?? row.submittedAt ?? row.updatedAt,
          overrideReason: row.overriddenAt ? row.overrideReason : null,
        },
  reviewedAt: row.reviewedAt,
})

export const presentAttemptOverview = (
  summary: AttemptSummary,
  feedback: Feedback[],
  audit: GradeAuditEntry[],
): AttemptOverview => ({ ...summary, feedback, audit })

export const presentAttemptDetail = (overview: AttemptOverview, row: AttemptRow): AttemptDetail => ({
  ...overview,
  events: JSON.parse(row.events),
})

export const presentFeedback = (row: FeedbackRow, authorName: string): Feedback => ({
  id: row.id,
  attemptId: row.attemptId,
  authorId: row.authorId,
  body: row.body,
  createdAt: row.createdAt,
  authorName,
})

/** A grade's history entry; no actor means the server's grader. */
export const presentAuditEntry = (row: AuditEntryRow, actorName: string | null): GradeAuditEntry => ({
  id: row.id,
  actorId: row.actorId,
  actorName: actorName ?? 'Slipway grader',
  action: row.action === 'grade.overridden' ? 'overridden' : 'graded',
  from: row.fromValue ? JSON.parse(row.fromValue) : null,
  to: JSON.parse(row.toValue),
  reason: row.reason,
  createdAt: row.createdAt,
})
