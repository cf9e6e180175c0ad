// The hot-path primary-key lookup must read a row exactly as TypeORM's findOneBy does (same properties,
// same hydrated types: booleans, integers, nulls), on whichever database the suite runs against.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  ScenarioEntity,
  UserEntity,
} from '../../server/entities'
import { findById } from '../../server/infrastructure/database/lookups'
import { createTestApi, type TestApi } from '../support/api-harness'
import { buildWorld, type World } from '../support/world'

describe('primary-key lookups', () => {
  let api: TestApi
  let world: World

  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
    // A deactivated user, so a false boolean and a changed integer are read too.
    await api.dataSource
      .getRepository(UserEntity)
      .update({ id: world.apprenticeB1.user.id }, { active: false, tokenVersion: 3 })
  })
  afterAll(() => api.close())

  it('reads users as findOneBy does', async () => {
    for (const { user } of [world.admin, world.instructorA, world.apprenticeA1, world.apprenticeB1]) {
      const expected = await api.dataSource.getRepository(UserEntity).findOneBy({ id: user.id })
      const row = await findById(api.dataSource, UserEntity, user.id)
      expect(row).toEqual(expected)
      expect(typeof row!.active).toBe('boolean')
      expect(typeof row!.tokenVersion).toBe('number')
    }
    expect((await findById(api.dataSource, UserEntity, world.apprenticeB1.user.id))!.active).toBe(false)
  })

  it('reads cohorts and attempts as findOneBy does, including the trigger-kept revision', async () => {
    for (const id of [world.cohortA.id, world.cohortB.id]) {
      const row = await findById(api.dataSource, CohortEntity, id)
      expect(row).toEqual(await api.dataSource.getRepository(CohortEntity).findOneBy({ id }))
      expect(row!.gradebookRevision).toBeGreaterThan(0)
    }
    const attempt = await findById(api.dataSource, AttemptEntity, world.attemptA1.id)
    expect(attempt).toEqual(
      await api.dataSource.getRepository(AttemptEntity).findOneBy({ id: world.attemptA1.id }),
    )
  })

  it('reads assignments and scenario versions as findOneBy does', async () => {
    const assignment = await findById(api.dataSource, AssignmentEntity, world.assignmentA.id)
    expect(assignment).toEqual(
      await api.dataSource.getRepository(AssignmentEntity).findOneBy({ id: world.assignmentA.id }),
    )
    const scenario = await findById(api.dataSource, ScenarioEntity, world.scenario.id)
    expect(scenario).toEqual(
      await api.dataSource.getRepository(ScenarioEntity).findOneBy({ id: world.scenario.id }),
    )
  })

  it('answers null for an id that is not there', async () => {
    expect(await findById(api.dataSource, CohortEntity, '00000000-0000-4000-8000-000000000000')).toBeNull()
  })
})
