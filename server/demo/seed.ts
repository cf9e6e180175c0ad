// The demo seed: an invented training centre with an admin, two instructors, two cohorts, a dozen
// apprentices, assignments of the shipped scenarios, and sample attempts graded by the real grader.
import { randomUUID } from 'node:crypto'
import type { DataSource } from 'typeorm'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import type { Logger } from '../infrastructure/logging'
import { CENTRE_ID } from '../centre/centre.service'
import {
  AssignmentEntity,
  CentreSettingsEntity,
  CohortEntity,
  EnrollmentEntity,
  ScenarioEntity,
  UserEntity,
  type AssignmentRow,
  type CohortRow,
  type UserRow,
} from '../entities'
import { DAY, nowIso } from '../infrastructure/clock'
import { DEMO_ACCOUNTS, DEMO_CENTRE, DEMO_COHORTS, DEMO_TIME_ZONE } from './demo-accounts'
import type { PasswordHasher } from '../infrastructure/security/passwords'
import { seedSampleAttempts } from './seed-attempts'

/** Which shipped scenarios each demo cohort is set, by scenario id, with due dates in days from now. */
// Isolation is assessed unaided; a first wiring exercise is guided; the rest are set at the standard level.
const DEMO_ASSIGNMENTS: {
  cohort: number
  key: string
  opensInDays: number
  dueInDays: number
  level: AssistanceLevel
}[] = [
  { cohort: 0, key: 'safe-isolation', opensInDays: -21, dueInDays: -7, level: 'assessment' },
  { cohort: 0, key: 'two-wire-run-stop', opensInDays: -14, dueInDays: 7, level: 'guided' },
  // Due tomorrow: the instructor's needs-attention page has work closing soon to show.
  { cohort: 0, key: 'raise-lower-commissioning', opensInDays: -3, dueInDays: 1, level: 'standard' },
  { cohort: 1, key: 'safe-isolation', opensInDays: -7, dueInDays: 7, level: 'assessment' },
  { cohort: 1, key: 'three-wire-start-stop', opensInDays: -2, dueInDays: 21, level: 'standard' },
]

const ENROLLED_DAYS_AGO = 30

export async function isDatabaseEmpty(dataSource: DataSource): Promise<boolean> {
  return (await dataSource.getRepository(UserEntity).count()) === 0
}

/** Whether the demo admin exists (then the start-up banner lists the demo sign-ins). */
export async function hasDemoAccounts(dataSource: DataSource): Promise<boolean> {
  return (await dataSource.getRepository(UserEntity).countBy({ email: DEMO_ACCOUNTS[0]!.email })) > 0
}

export async function seedDemo(
  dataSource: DataSource,
  passwords: PasswordHasher,
  log: Logger,
): Promise<void> {
  const now = nowIso()
  const users: UserRow[] = []
  for (const account of DEMO_ACCOUNTS) {
    users.push({
      id: randomUUID(),
      email: account.email,
      name: account.name,
      role: account.role,
      passwordHash: await passwords.hash(account.password),
      active: true,
      tokenVersion: 0,
      createdAt: now,
      updatedAt: now,
      lastSignInAt: null,
    })
  }
  const cohorts: CohortRow[] = DEMO_COHORTS.map((c, index) => ({
    id: randomUUID(),
    name: c.name,
    description: c.description,
    ownerId: users[DEMO_ACCOUNTS.findIndex((a) => a.role === 'instructor' && a.cohort === index)]!.id,
    archived: false,
    createdAt: now,
  }))
  const assignments: AssignmentRow[] = []
  await dataSource.transaction(async (manager) => {
    await manager.getRepository(UserEntity).insert(users)
    await manager.getRepository(CentreSettingsEntity).insert({
      id: CENTRE_ID,
      name: DEMO_CENTRE,
      timeZone: DEMO_TIME_ZONE,
      updatedAt: now,
    })
    // Not repository.insert: for a column with a database default (gradebookRevision) TypeORM re-reads the
    // rows of a multi-row insert on SQLite and merges them back by position, unordered — which swapped the
    // cohorts' ids in `cohorts` and enrolled apprentices in the wrong cohort. updateEntity(false) skips it.
    await manager
      .createQueryBuilder()
      .insert()
      .into(CohortEntity)
      .values(cohorts)
      .updateEntity(false)
      .execute()
    const enrollments = DEMO_ACCOUNTS.flatMap((account, index) =>
      account.role === 'apprentice' && account.cohort !== undefined
        ? [
            {
              id: randomUUID(),
              cohortId: cohorts[account.cohort]!.id,
              userId: users[index]!.id,
              // Enrolled at the start of term, before any demo work fell due.
              createdAt: new Date(Date.now() - ENROLLED_DAYS_AGO * DAY).toISOString(),
            },
          ]
        : [],
    )
    await manager.getRepository(EnrollmentEntity).insert(enrollments)
    for (const plan of DEMO_ASSIGNMENTS) {
      const scenario = await manager
        .getRepository(ScenarioEntity)
        .findOne({ where: { key: plan.key }, order: { version: 'DESC' } })
      if (!scenario) continue
      const cohort = cohorts[plan.cohort]!
      assignments.push({
        id: randomUUID(),
        cohortId: cohort.id,
        scenarioId: scenario.id,
        title: scenario.title,
        opensAt: new Date(Date.now() + plan.opensInDays * DAY).toISOString(),
        dueAt: new Date(Date.now() + plan.dueInDays * DAY).toISOString(),
        attemptLimit: 3,
        hintsAllowed: plan.level !== 'assessment',
        assistanceLevel: plan.level,
        scorePolicy: 'best',
        createdById: cohort.ownerId,
        createdAt: now,
        latePolicy: 'acceptLate',
        latePenalty: 10,
        audience: 'cohort',
      })
    }
    // updateEntity(false): scorePolicy has a default, so a plain multi-row insert re-reads the rows on SQLite and
    // merges them back by position, which swapped ids between these objects and put the sample attempts
    // under the wrong assignments (see CohortRow.gradebookRevision).
    if (assignments.length) {
      await manager
        .createQueryBuilder()
        .insert()
        .into(AssignmentEntity)
        .values(assignments)
        .updateEntity(false)
        .execute()
    }
  })
  const attempts = await seedSampleAttempts(dataSource, users, cohorts, assignments)
  log.info(
    { users: users.length, cohorts: cohorts.length, assignments: assignments.length, attempts },
    'demo data created',
  )
}
