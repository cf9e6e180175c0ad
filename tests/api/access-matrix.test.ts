// Every route × every role (and no token), with the status each must get. "apprentice" is Ada (cohort A,
// owns the attempt), "peer" is Abel (cohort A, not the owner), "outsider" is Bea (cohort B); "instructor"
// owns cohort A, "otherInstructor" owns cohort B.
import { randomUUID } from 'node:crypto'
import { readFileSync } from 'node:fs'
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  CohortEntity,
  CohortInstructorEntity,
  EnrollmentEntity,
  LiveCommandEntity,
  LiveSessionEntity,
  OutcomeSignOffEntity,
  OutcomeSignOffWithdrawalEntity,
  ScenarioDraftEntity,
  ScenarioEntity,
} from '../../server/entities'
import { createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { STATUS } from '../support/live-status'
import { buildWorld, EMPTY_LOG, type World } from '../support/world'

type Who = 'none' | 'apprentice' | 'peer' | 'outsider' | 'instructor' | 'otherInstructor' | 'admin'
const WHO: Who[] = ['none', 'apprentice', 'peer', 'outsider', 'instructor', 'otherInstructor', 'admin']

interface Expect {
  none?: number
  apprentice: number
  peer?: number // defaults to apprentice
  outsider?: number // defaults to peer
  instructor: number
  otherInstructor?: number // defaults to instructor
  admin: number
}

interface Route {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete'
  path: (w: World) => string
  body?: (w: World) => object
  attach?: { field: string; filename: string; contentType: string; content: (w: World) => string }
  expect: Expect
  /** The call ends the caller's sessions; sign them in again afterwards. */
  endsSessions?: boolean
  /** An event stream: the status is read from a real server, then the stream is dropped. */
  stream?: true
  /** Puts back what a successful call changes, so every role meets the same state. Runs before and after. */
  restore?: (w: World, api: TestApi) => Promise<void>
}

const shipped = (name: string) => JSON.parse(readFileSync(`scenarios/${name}.json`, 'utf8'))
const referenceSolution = (key: string) =>
  JSON.parse(readFileSync(`scenarios/reference-solutions/${key}.json`, 'utf8')).events

/** A draft of the key, from its latest version, unless there is one already. */
async function ensureDraft(api: TestApi, key: string): Promise<void> {
  const drafts = api.dataSource.getRepository(ScenarioDraftEntity)
  if (await drafts.existsBy({ key })) return
  const latest = await api.dataSource
    .getRepository(ScenarioEntity)
    .findOneOrFail({ where: { key }, order: { version: 'DESC' } })
  const now = new Date().toISOString()
  await drafts.insert({
    key,
    document: latest.document,
    baseVersion: latest.version,
    createdAt: now,
    updatedAt: now,
    updatedById: null,
  })
}
const everyone = (status: number): Expect => ({
  none: status,
  apprentice: status,
  instructor: status,
  admin: status,
})
const signedIn = (status: number): Expect => ({
  none: 401,
  apprentice: status,
  instructor: status,
  admin: status,
})
const staffOnly = (ok: number): Expect => ({ none: 401, apprentice: 403, instructor: ok, admin: ok })
const ownCohortStaff = (ok: number): Expect => ({ ...staffOnly(ok), otherInstructor: 403 })
const adminOnly = (ok: number): Expect => ({ none: 401, apprentice: 403, instructor: 403, admin: ok })
const future = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString()
const FAKE_TOKEN = 'x'.repeat(43)
const NO_SUCH_ID = '00000000-0000-4000-8000-000000000000'
const MATRIX_SIGN_OFF = '00000000-0000-4000-8000-00000000051f'
/** Ada's open live panel on assignment A (opened in beforeAll). */
const LIVE_ATTEMPT = '00000000-0000-4000-8000-0000000011fe'
const liveSession = (w: World) => ({
  scenarioVersionId: w.scenario.id,
  assignmentId: w.assignmentA.id,
  assistance: 'standard',
})
/** Only the apprentice whose panel it is; no instructor or admin posts for them. */
const ownPanel = (ok: number): Expect => ({
  none: 401,
  apprentice: ok,
  peer: 403,
  instructor: 403,
  admin: 403,
})

const ROUTES: Route[] = [
  { method: 'get', path: () => '/api/health', expect: everyone(200) },
  { method: 'get', path: () => '/api/no-such-route', expect: everyone(404) },
  // auth
  {
    method: 'post',
    path: () => '/api/auth/sign-in',
    body: () => ({ email: 'no@slipway.test', password: 'wrong-password' }),
    expect: everyone(401),
  },
  { method: 'post', path: () => '/api/auth/refresh', expect: everyone(401) },
  { method: 'post', path: () => '/api/auth/sign-out', expect: everyone(204) },
  { method: 'post', path: () => '/api/auth/sign-out-everywhere', expect: signedIn(204), endsSessions: true },
  { method: 'get', path: () => '/api/auth/me', expect: signedIn(200) },
  {
    method: 'patch',
    path: () => '/api/auth/me',
    body: () => ({ name: 'Same Name Kept' }),
    expect: signedIn(200),
  },
  // Each person's own optional mail: anyone signed in, for themselves only (there is no user id to name).
  { method: 'get', path: () => '/api/auth/me/mail-preferences', expect: signedIn(200) },
  {
    method: 'patch',
    path: () => '/api/auth/me/mail-preferences',
    body: () => ({ dueReminders: true, dailyDigest: true }),
    expect: signedIn(200),
  },
  {
    method: 'post',
    path: () => '/api/auth/change-password',
    body: () => ({ currentPassword: 'definitely-wrong', newPassword: 'a long enough new password' }),
    expect: signedIn(400),
  },
  {
    method: 'post',
    path: () => '/api/auth/password-reset',
    body: () => ({ email: 'no@slipway.test' }),
    expect: everyone(202),
  },
  {
    method: 'post',
    path: () => '/api/auth/password-reset/confirm',
    body: () => ({ token: FAKE_TOKEN, password: 'a long enough new password' }),
    expect: everyone(400),
  },
  // public invitation links
  { method: 'get', path: () => `/api/invitations/${FAKE_TOKEN}`, expect: everyone(404) },
  {
    method: 'post',
    path: () => `/api/invitations/${FAKE_TOKEN}/accept`,
    body: () => ({ password: 'a long enough password' }),
    expect: everyone(404),
  },
  // cohorts
  { method: 'get', path: () => '/api/cohorts', expect: signedIn(200) },
  {
    method: 'post',
    path: () => '/api/cohorts',
    body: () => ({ name: 'Matrix cohort' }),
    expect: staffOnly(201),
  },
  {
    method: 'get',
    path: (w) => `/api/cohorts/${w.cohortA.id}`,
    expect: { none: 401, apprentice: 200, outsider: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'patch',
    path: (w) => `/api/cohorts/${w.cohortA.id}`,
    body: () => ({ description: 'Edited by the matrix' }),
    expect: ownCohortStaff(200),
  },
  { method: 'get', path: (w) => `/api/cohorts/${w.cohortA.id}/members`, expect: ownCohortStaff(200) },
  {
    method: 'delete',
    path: (w) => `/api/cohorts/${w.cohortA.id}/members/${w.apprenticeA2.user.id}`,
    expect: ownCohortStaff(204),
    restore: async (w, api) => {
      const repo = api.dataSource.getRepository(EnrollmentEntity)
      if (!(await repo.countBy({ cohortId: w.cohortA.id, userId: w.apprenticeA2.user.id }))) {
        await repo.insert({
          id: randomUUID(),
          cohortId: w.cohortA.id,
          userId: w.apprenticeA2.user.id,
          createdAt: new Date().toISOString(),
        })
      }
    },
  },
  { method: 'get', path: (w) => `/api/cohorts/${w.cohortA.id}/invitations`, expect: ownCohortStaff(200) },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/invitations`,
    body: () => ({ email: `invitee-${randomUUID().slice(0, 8)}@slipway.test`, name: 'Matrix Invitee' }),
    expect: ownCohortStaff(201),
  },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/invitations/roster`,
    attach: {
      field: 'roster',
      filename: 'roster.csv',
      contentType: 'text/csv',
      content: () => `name,email\nRow Person,row-${randomUUID().slice(0, 8)}@slipway.test\n`,
    },
    expect: ownCohortStaff(201),
  },
  {
    method: 'delete',
    path: (w) => `/api/cohorts/${w.cohortA.id}/invitations/00000000-0000-4000-8000-000000000000`,
    expect: ownCohortStaff(404),
  },
  // An id that names no pending invitation: the cohort check comes first, then 404.
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/invitations/${NO_SUCH_ID}/resend`,
    expect: ownCohortStaff(404),
  },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/invitations/${NO_SUCH_ID}/link`,
    expect: ownCohortStaff(404),
  },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/invitations/roster?rows=valid`,
    attach: {
      field: 'roster',
      filename: 'roster.csv',
      contentType: 'text/csv',
      content: () => `name,email\nRow Person,row-${randomUUID().slice(0, 8)}@slipway.test\nBad Row,nope\n`,
    },
    expect: ownCohortStaff(201),
  },
  // several members at once
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/messages`,
    body: (w) => ({ userIds: [w.apprenticeA2.user.id], subject: 'Matrix', body: 'Bring your meter.' }),
    expect: ownCohortStaff(200),
  },
  {
    // Nobody real is named, so nobody leaves: access is checked before the names.
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/members/remove`,
    body: () => ({ userIds: ['00000000-0000-4000-8000-000000000000'] }),
    expect: ownCohortStaff(400),
  },
  // who teaches a cohort, and copying it for the next intake
  { method: 'get', path: (w) => `/api/cohorts/${w.cohortA.id}/instructors`, expect: ownCohortStaff(200) },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/instructors`,
    body: (w) => ({ email: w.instructorB.email }),
    expect: ownCohortStaff(201),
    restore: async (_w, api) => {
      await api.dataSource.getRepository(CohortInstructorEntity).clear()
    },
  },
  {
    method: 'delete',
    path: (w) => `/api/cohorts/${w.cohortA.id}/instructors/${NO_SUCH_ID}`,
    expect: ownCohortStaff(404),
  },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/copy`,
    body: () => ({ name: 'Matrix copy', shiftDays: 7 }),
    expect: ownCohortStaff(201),
    restore: async (_w, api) => {
      await api.dataSource.getRepository(CohortEntity).delete({ name: 'Matrix copy' })
    },
  },
  // gradebook
  { method: 'get', path: (w) => `/api/cohorts/${w.cohortA.id}/gradebook`, expect: ownCohortStaff(200) },
  { method: 'get', path: (w) => `/api/cohorts/${w.cohortA.id}/gradebook.csv`, expect: ownCohortStaff(200) },
  // scenarios
  { method: 'get', path: () => '/api/scenarios', expect: signedIn(200) },
  { method: 'get', path: () => '/api/scenarios/safe-isolation', expect: signedIn(200) },
  { method: 'get', path: () => '/api/scenarios/safe-isolation/versions', expect: staffOnly(200) },
  { method: 'get', path: () => '/api/scenarios/safe-isolation/versions/1', expect: signedIn(200) },
  { method: 'get', path: (w) => `/api/scenario-versions/${w.scenario.id}`, expect: signedIn(200) },
  { method: 'get', path: () => '/api/scenarios/drafts', expect: staffOnly(200) },
  {
    method: 'post',
    path: () => '/api/scenarios/drafts',
    body: () => ({ key: `matrix-${randomUUID().slice(0, 8)}`, document: { title: 'Matrix draft' } }),
    expect: staffOnly(201),
  },
  // A draft of potentiometer-reference: started, read, saved, its reference recorded, published and
  // discarded; each row's restore puts the draft there (or not) as the call needs.
  {
    method: 'post',
    path: () => '/api/scenarios/potentiometer-reference/draft',
    expect: staffOnly(201),
    restore: async (_w, api) => {
      await api.dataSource.getRepository(ScenarioDraftEntity).delete({ key: 'potentiometer-reference' })
    },
  },
  {
    method: 'get',
    path: () => '/api/scenarios/potentiometer-reference/draft',
    expect: staffOnly(200),
    restore: (_w, api) => ensureDraft(api, 'potentiometer-reference'),
  },
  {
    method: 'put',
    path: () => '/api/scenarios/potentiometer-reference/draft',
    body: () => ({ document: shipped('potentiometer-reference') }),
    expect: staffOnly(200),
  },
  {
    method: 'put',
    path: () => '/api/scenarios/potentiometer-reference/draft/reference',
    body: () => ({ events: referenceSolution('potentiometer-reference') }),
    expect: staffOnly(200),
    restore: (_w, api) => ensureDraft(api, 'potentiometer-reference'),
  },
  {
    method: 'post',
    path: () => '/api/scenarios/potentiometer-reference/draft/publish',
    expect: staffOnly(201),
    restore: (_w, api) => ensureDraft(api, 'potentiometer-reference'),
  },
  {
    method: 'delete',
    path: () => '/api/scenarios/potentiometer-reference/draft',
    expect: staffOnly(204),
    restore: (_w, api) => ensureDraft(api, 'potentiometer-reference'),
  },
  {
    method: 'get',
    path: () => '/api/scenarios/export?keys=safe-isolation,two-wire-run-stop',
    expect: staffOnly(200),
  },
  {
    method: 'post',
    path: () => '/api/scenarios/safe-isolation/duplicate',
    body: () => ({ newKey: `copy-${randomUUID().slice(0, 8)}` }),
    expect: staffOnly(201),
  },
  { method: 'post', path: () => '/api/scenarios/fan-ramp-or-coast/retire', expect: staffOnly(200) },
  { method: 'post', path: () => '/api/scenarios/fan-ramp-or-coast/restore', expect: staffOnly(200) },
  {
    method: 'post',
    path: () => '/api/scenarios/upload',
    attach: {
      field: 'pack',
      filename: 'pack.json',
      contentType: 'application/json',
      content: () => JSON.stringify(shipped('reference-memory')),
    },
    expect: staffOnly(201),
  },
  // assignments
  { method: 'get', path: () => '/api/assignments', expect: signedIn(200) },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/assignments`,
    body: (w) => ({
      scenarioId: w.scenario.id,
      opensAt: future(-1),
      dueAt: future(5),
      attemptLimit: null,
      hintsAllowed: true,
    }),
    expect: ownCohortStaff(201),
  },
  {
    method: 'get',
    path: (w) => `/api/assignments/${w.assignmentA.id}`,
    expect: { none: 401, apprentice: 200, outsider: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'patch',
    path: (w) => `/api/assignments/${w.assignmentA.id}`,
    body: () => ({ hintsAllowed: true }),
    expect: ownCohortStaff(200),
  },
  { method: 'delete', path: (w) => `/api/assignments/${w.assignmentA.id}`, expect: ownCohortStaff(409) },
  { method: 'get', path: (w) => `/api/assignments/${w.assignmentA.id}/stats`, expect: ownCohortStaff(200) },
  {
    method: 'get',
    path: (w) => `/api/assignments/${w.assignmentA.id}/apprentices`,
    expect: ownCohortStaff(200),
  },
  {
    // An exception that changes nothing: allowed, and leaves no row behind.
    method: 'post',
    path: (w) => `/api/assignments/${w.assignmentA.id}/exceptions`,
    body: (w) => ({ userIds: [w.apprenticeA2.user.id], extraAttempts: 0, reason: 'Matrix exception' }),
    expect: ownCohortStaff(200),
  },
  {
    method: 'delete',
    path: (w) => `/api/assignments/${w.assignmentA.id}/exceptions/${w.apprenticeA2.user.id}`,
    expect: ownCohortStaff(404),
  },
  // attempts
  {
    method: 'post',
    path: () => '/api/attempts',
    body: (w) => ({
      id: randomUUID(),
      assignmentId: w.assignmentA.id,
      status: 'submitted',
      events: EMPTY_LOG,
    }),
    expect: { none: 401, apprentice: 201, outsider: 403, instructor: 403, admin: 403 },
  },
  { method: 'get', path: () => '/api/attempts', expect: signedIn(200) },
  {
    method: 'get',
    path: (w) => `/api/attempts/${w.attemptA1.id}`,
    expect: { none: 401, apprentice: 200, peer: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'get',
    path: (w) => `/api/attempts/${w.attemptA1.id}/overview`,
    expect: { none: 401, apprentice: 200, peer: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'post',
    path: (w) => `/api/attempts/${w.attemptA1.id}/feedback`,
    body: () => ({ body: 'Matrix feedback' }),
    expect: ownCohortStaff(201),
  },
  {
    method: 'post',
    path: (w) => `/api/attempts/${w.attemptA1.id}/grade-override`,
    body: () => ({ score: 55, passed: false, reason: 'Matrix override' }),
    expect: ownCohortStaff(200),
  },
  // records
  {
    method: 'get',
    path: (w) => `/api/attempts/${w.attemptA1.id}/commissioning-record`,
    expect: { none: 401, apprentice: 200, peer: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'get',
    path: (w) => `/api/attempts/${w.attemptA1.id}/commissioning-record.pdf`,
    expect: { none: 401, apprentice: 200, peer: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'get',
    path: (w) => `/api/apprentices/${w.apprenticeA1.user.id}/training-record`,
    expect: { none: 401, apprentice: 200, peer: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'get',
    path: (w) => `/api/apprentices/${w.apprenticeA1.user.id}/training-record.pdf`,
    expect: { none: 401, apprentice: 200, peer: 403, instructor: 200, otherInstructor: 403, admin: 200 },
  },
  {
    method: 'post',
    path: (w) => `/api/apprentices/${w.apprenticeA1.user.id}/sign-offs`,
    body: (w) => ({
      cohortId: w.cohortA.id,
      scenarioKey: w.scenario.key,
      outcome: shipped(w.scenario.key).learningOutcomes[0],
      note: 'Matrix sign-off',
    }),
    expect: ownCohortStaff(201),
    restore: async (_w, api) => {
      await api.dataSource.getRepository(OutcomeSignOffEntity).clear()
    },
  },
  {
    method: 'post',
    path: () => `/api/sign-offs/${MATRIX_SIGN_OFF}/withdrawal`,
    body: () => ({ reason: 'Matrix withdrawal' }),
    expect: ownCohortStaff(201),
    // A standing sign-off in cohort A before every role's call.
    restore: async (w, api) => {
      await api.dataSource.getRepository(OutcomeSignOffWithdrawalEntity).clear()
      await api.dataSource.getRepository(OutcomeSignOffEntity).clear()
      await api.dataSource.getRepository(OutcomeSignOffEntity).insert({
        id: MATRIX_SIGN_OFF,
        apprenticeId: w.apprenticeA1.user.id,
        cohortId: w.cohortA.id,
        scenarioKey: w.scenario.key,
        outcome: shipped(w.scenario.key).learningOutcomes[0],
        note: 'Matrix sign-off',
        signedById: w.instructorA.user.id,
        signedAt: new Date().toISOString(),
      })
    },
  },
  {
    method: 'get',
    path: (w) => `/api/cohorts/${w.cohortA.id}/training-records.zip`,
    expect: ownCohortStaff(200),
  },
  {
    method: 'post',
    path: (w) => `/api/attempts/${w.attemptA1.id}/review`,
    body: () => ({ reviewed: true }),
    expect: ownCohortStaff(200),
  },
  // the instructor's week
  { method: 'get', path: () => '/api/attention', expect: staffOnly(200) },
  {
    method: 'get',
    path: (w) => `/api/apprentices/${w.apprenticeA1.user.id}`,
    expect: ownCohortStaff(200),
  },
  {
    method: 'get',
    path: (w) => `/api/attempts/${w.attemptA1.id}/neighbours`,
    expect: ownCohortStaff(200),
  },
  // free practice and a cohort's practice policy
  { method: 'get', path: () => '/api/practice', expect: signedIn(200) },
  { method: 'get', path: (w) => `/api/practice/${w.scenario.key}`, expect: signedIn(200) },
  { method: 'get', path: (w) => `/api/cohorts/${w.cohortA.id}/practice`, expect: ownCohortStaff(200) },
  {
    method: 'put',
    path: (w) => `/api/cohorts/${w.cohortA.id}/practice`,
    body: () => ({ mode: 'all' }),
    expect: ownCohortStaff(200),
  },
  // class insight
  { method: 'get', path: (w) => `/api/assignments/${w.assignmentA.id}/insight`, expect: ownCohortStaff(200) },
  { method: 'get', path: (w) => `/api/cohorts/${w.cohortA.id}/insight`, expect: ownCohortStaff(200) },
  // centre settings
  { method: 'get', path: () => '/api/centre', expect: signedIn(200) },
  {
    method: 'patch',
    path: () => '/api/centre',
    body: () => ({ timeZone: 'Europe/London' }),
    expect: adminOnly(200),
  },
  // admin
  { method: 'get', path: () => '/api/admin/users', expect: adminOnly(200) },
  {
    method: 'patch',
    path: (w) => `/api/admin/users/${w.apprenticeA2.user.id}`,
    body: () => ({ active: true }),
    expect: adminOnly(200),
  },
  {
    method: 'post',
    path: () => '/api/admin/users/00000000-0000-4000-8000-000000000000/sign-out',
    expect: adminOnly(404),
  },
  {
    method: 'post',
    path: () => '/api/admin/invitations',
    body: () => ({ email: `staff-${randomUUID().slice(0, 8)}@slipway.test`, name: 'New Staff' }),
    expect: adminOnly(201),
  },
  { method: 'get', path: () => '/api/admin/invitations', expect: adminOnly(200) },
  { method: 'post', path: () => `/api/admin/invitations/${NO_SUCH_ID}/resend`, expect: adminOnly(404) },
  { method: 'post', path: () => `/api/admin/invitations/${NO_SUCH_ID}/link`, expect: adminOnly(404) },
  { method: 'delete', path: () => `/api/admin/invitations/${NO_SUCH_ID}`, expect: adminOnly(404) },
  { method: 'get', path: () => '/api/admin/outbox', expect: adminOnly(200) },
  // An id that names no message: the role check comes first, then 404.
  { method: 'post', path: () => `/api/admin/outbox/${randomUUID()}/retry`, expect: adminOnly(404) },
  { method: 'get', path: () => '/api/admin/backup', expect: adminOnly(200) },
  // learning platforms (LTI): the platform's browser flow needs no sign-in
  { method: 'get', path: () => '/api/lti/jwks', expect: everyone(200) },
  { method: 'get', path: () => '/api/lti/login', expect: everyone(400) },
  { method: 'post', path: () => '/api/lti/login', body: () => ({}), expect: everyone(400) },
  { method: 'post', path: () => '/api/lti/launch', body: () => ({}), expect: everyone(400) },
  { method: 'get', path: () => `/api/lti/deep-linking/return/${FAKE_TOKEN}`, expect: everyone(404) },
  {
    method: 'post',
    path: () => '/api/lti/session',
    body: () => ({ code: FAKE_TOKEN }),
    expect: everyone(400),
  },
  { method: 'post', path: () => '/api/lti/session/refresh', expect: everyone(401) },
  { method: 'post', path: () => '/api/lti/session/sign-out', expect: everyone(204) },
  // LTI: admins register platforms and keep Slipway's keys
  { method: 'get', path: () => '/api/lti/tool', expect: adminOnly(200) },
  { method: 'post', path: () => '/api/lti/tool/keys/rotate', expect: adminOnly(200) },
  { method: 'get', path: () => '/api/lti/platforms', expect: adminOnly(200) },
  { method: 'post', path: () => '/api/lti/platforms', body: () => ({}), expect: adminOnly(400) },
  { method: 'get', path: () => `/api/lti/platforms/${NO_SUCH_ID}`, expect: adminOnly(404) },
  {
    method: 'patch',
    path: () => `/api/lti/platforms/${NO_SUCH_ID}`,
    body: () => ({ name: 'Renamed platform' }),
    expect: adminOnly(404),
  },
  { method: 'delete', path: () => `/api/lti/platforms/${NO_SUCH_ID}`, expect: adminOnly(404) },
  // LTI: instructors' course tools
  { method: 'get', path: () => `/api/lti/deep-linking/${NO_SUCH_ID}`, expect: staffOnly(404) },
  {
    method: 'post',
    path: () => `/api/lti/deep-linking/${NO_SUCH_ID}`,
    body: (w) => ({
      scenarioId: w.scenario.id,
      opensAt: future(-1),
      dueAt: future(5),
      attemptLimit: null,
      hintsAllowed: true,
    }),
    expect: staffOnly(404),
  },
  { method: 'get', path: (w) => `/api/lti/cohorts/${w.cohortA.id}`, expect: ownCohortStaff(200) },
  {
    method: 'post',
    path: (w) => `/api/lti/cohorts/${w.cohortA.id}/roster-pull`,
    expect: ownCohortStaff(409),
  },
  { method: 'get', path: (w) => `/api/lti/cohorts/${w.cohortA.id}/score-sync`, expect: ownCohortStaff(200) },
  {
    method: 'post',
    path: (w) => `/api/lti/cohorts/${w.cohortA.id}/score-sync/retry`,
    expect: ownCohortStaff(200),
  },
  // live classroom: the apprentice's own panel; the cohort's instructors (and admins) watch and command it
  {
    method: 'post',
    path: () => `/api/live/attempts/${LIVE_ATTEMPT}/session`,
    body: liveSession,
    // A classmate reusing the id: 409; Bea is not set the assignment: 403.
    expect: { ...ownPanel(200), peer: 409, outsider: 403 },
  },
  {
    method: 'post',
    path: () => `/api/live/attempts/${LIVE_ATTEMPT}/events`,
    body: () => ({ from: 0, events: [], status: STATUS }),
    expect: ownPanel(200),
  },
  {
    method: 'post',
    path: () => `/api/live/attempts/${LIVE_ATTEMPT}/close`,
    expect: ownPanel(204),
    restore: async (_w, api) => {
      await api.dataSource
        .getRepository(LiveSessionEntity)
        .update({ attemptId: LIVE_ATTEMPT }, { endedAt: null })
    },
  },
  {
    method: 'get',
    path: () => `/api/live/attempts/${LIVE_ATTEMPT}/inbox`,
    stream: true,
    expect: ownPanel(200),
  },
  { method: 'get', path: (w) => `/api/live/cohorts/${w.cohortA.id}/class`, expect: ownCohortStaff(200) },
  {
    method: 'get',
    path: (w) => `/api/live/cohorts/${w.cohortA.id}/stream`,
    stream: true,
    expect: ownCohortStaff(200),
  },
  { method: 'get', path: () => `/api/live/attempts/${LIVE_ATTEMPT}`, expect: ownCohortStaff(200) },
  {
    method: 'get',
    path: () => `/api/live/attempts/${LIVE_ATTEMPT}/stream`,
    stream: true,
    expect: ownCohortStaff(200),
  },
  {
    method: 'post',
    path: () => `/api/live/attempts/${LIVE_ATTEMPT}/injections`,
    body: () => ({ fault: { kind: 'blownFuse' } }),
    expect: ownCohortStaff(201),
    // A fault already on its way is not sent twice: each role meets a bench without one.
    restore: async (_w, api) => {
      await api.dataSource
        .getRepository(LiveCommandEntity)
        .delete({ attemptId: LIVE_ATTEMPT, kind: 'injection' })
    },
  },
  {
    method: 'post',
    path: () => '/api/live/messages',
    body: (w) => ({ cohortId: w.cohortA.id, kind: 'hint', text: 'Prove it dead before you touch it' }),
    expect: ownCohortStaff(200),
  },
]

function expected(e: Expect, who: Who): number {
  const peer = e.peer ?? e.apprentice
  const table: Record<Who, number> = {
    none: e.none ?? 401,
    apprentice: e.apprentice,
    peer,
    outsider: e.outsider ?? peer,
    instructor: e.instructor,
    otherInstructor: e.otherInstructor ?? e.instructor,
    admin: e.admin,
  }
  return table[who]
}

describe('access matrix: every route × every role', () => {
  let api: TestApi
  let w: World
  const users = () =>
    ({
      apprentice: w.apprenticeA1,
      peer: w.apprenticeA2,
      outsider: w.apprenticeB1,
      instructor: w.instructorA,
      otherInstructor: w.instructorB,
      admin: w.admin,
    }) as Record<Exclude<Who, 'none'>, TestUser>

  let server: Server
  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
    const opened = await supertest(api.app)
      .post(`/api/live/attempts/${LIVE_ATTEMPT}/session`)
      .set('Authorization', `Bearer ${w.apprenticeA1.token}`)
      .send(liveSession(w))
    expect(opened.status).toBe(201)
    server = api.app.listen(0, '127.0.0.1')
    await new Promise((resolve) => server.once('listening', resolve))
  })
  afterAll(async () => {
    server.closeAllConnections()
    await new Promise((resolve) => server.close(resolve))
    await api.close()
  })

  /** A stream's status and (refused) body from a real server; an accepted stream is dropped at once. */
  async function streamStatus(path: string, token: string | undefined) {
    const abort = new AbortController()
    const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}${path}`
    const response = await fetch(url, {
      headers: token ? { Authorization: `Bearer ${token}` } : {},
      signal: abort.signal,
    })
    const body = response.ok ? {} : ((await response.json()) as { error?: { code: string } })
    abort.abort()
    return { status: response.status, body, text: '' }
  }

  const cases = ROUTES.flatMap((route) =>
    WHO.map((who) => ({ route, who, status: expected(route.expect, who) })),
  )

  it.each(
    cases.map(
      (c) =>
        [
          `${c.route.method.toUpperCase()} ${c.route.path
            .toString()
            .replace(/^.*=>\s*/, '')
            .replace(/[`"']/g, '')
            .replace(/\$\{w\.(\w+)[^}]*\}/g, ':$1')} as ${c.who} → ${c.status}`,
          c,
        ] as const,
    ),
  )('%s', async (_name, { route, who, status }) => {
    await route.restore?.(w, api)
    const user = who === 'none' ? undefined : users()[who]
    if (route.stream) {
      const response = await streamStatus(route.path(w), user?.token)
      expect(response.status).toBe(status)
      if (status >= 400) expect(response.body.error?.code, 'error body').toEqual(expect.any(String))
      return
    }
    let request = supertest(api.app)[route.method](route.path(w))
    if (user) request = request.set('Authorization', `Bearer ${user.token}`)
    if (route.attach) {
      request = request.attach(route.attach.field, Buffer.from(route.attach.content(w)), {
        filename: route.attach.filename,
        contentType: route.attach.contentType,
      })
    } else if (route.body) {
      request = request.send(route.body(w))
    }
    const response = await request
    if (user && route.endsSessions) user.token = (await api.signIn(user.email, user.password)).token
    await route.restore?.(w, api)
    expect(response.status, (response.text ?? '').slice(0, 300)).toBe(status) // no text for a PDF or zip
    if (status >= 400) expect(response.body.error?.code, 'error body').toEqual(expect.any(String))
  })

  it('keeps one apprentice from changing another’s attempt by reusing its id', async () => {
    const response = await supertest(api.app)
      .post('/api/attempts')
      .set('Authorization', `Bearer ${w.apprenticeA2.token}`)
      .send({ id: w.attemptA1.id, assignmentId: w.assignmentA.id, status: 'inProgress', events: [] })
    expect(response.status).toBe(409)
    const stored = await supertest(api.app)
      .get(`/api/attempts/${w.attemptA1.id}`)
      .set('Authorization', `Bearer ${w.apprenticeA1.token}`)
    expect(stored.body.status).toBe('submitted')
  })
})
