// Cohorts: listed as each role may see them, created and edited by their instructor (or an admin), and
// their members.
import { randomUUID } from 'node:crypto'
import { In } from 'typeorm'
import type { z } from 'zod'
import type {
  Cohort,
  CohortMember,
  cohortListQuerySchema,
  createCohortRequestSchema,
  UpdateCohortRequest,
} from '@shared/api/cohorts'
import { cohortFor, readableCohortIds } from '../access/access.service'
import type { AppContext } from '../context'
import { CohortEntity, EnrollmentEntity, UserEntity, type CohortRow, type UserRow } from '../entities'
import { HttpError, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { presentCohort, presentCohortMember } from './cohort.presenter'

type CohortListQuery = z.output<typeof cohortListQuerySchema>
type CreateCohort = z.output<typeof createCohortRequestSchema>

/** Cohorts as the API shows them, with their owners' names and member counts read in two queries. */
async function presentCohorts(ctx: AppContext, rows: CohortRow[]): Promise<Cohort[]> {
  if (rows.length === 0) return []
  const ds = ctx.dataSource
  const owners = await ds
    .getRepository(UserEntity)
    .findBy({ id: In([...new Set(rows.map((r) => r.ownerId))]) })
  const counts: { cohortId: string; n: number }[] = await ds
    .getRepository(EnrollmentEntity)
    .createQueryBuilder('e')
    .select('e.cohortId', 'cohortId')
    .addSelect('COUNT(*)', 'n')
    .where('e.cohortId IN (:...ids)', { ids: rows.map((r) => r.id) })
    .groupBy('e.cohortId')
    .getRawMany()
  return rows.map((row) =>
    presentCohort(row, {
      ownerName: owners.find((o) => o.id === row.ownerId)?.name ?? '',
      memberCount: Number(counts.find((c) => c.cohortId === row.id)?.n ?? 0),
    }),
  )
}

export async function presentCohortFor(ctx: AppContext, row: CohortRow): Promise<Cohort> {
  return (await presentCohorts(ctx, [row]))[0]!
}

export async function listCohorts(
  ctx: AppContext,
  user: UserRow,
  { includeArchived }: CohortListQuery,
): Promise<Cohort[]> {
  const ids = await readableCohortIds(ctx.dataSource, user)
  const rows = await ctx.dataSource.getRepository(CohortEntity).find({
    where: { ...(ids ? { id: In(ids) } : {}), ...(includeArchived ? {} : { archived: false }) },
    order: { name: 'ASC' },
  })
  return presentCohorts(ctx, rows)
}

/** An instructor creates their own cohort; an admin may create one for an instructor (ownerId). */
export async function createCohort(ctx: AppContext, user: UserRow, body: CreateCohort): Promise<Cohort> {
  let ownerId = user.id
  if (body.ownerId && body.ownerId !== user.id) {
    if (user.role !== 'admin')
      throw new HttpError(403, 'forbidden', 'Only an admin can create a cohort for someone else')
    const owner = await ctx.dataSource.getRepository(UserEntity).findOneBy({ id: body.ownerId })
    if (owner?.role !== 'instructor') {
      throw new HttpError(400, 'validation_failed', 'The owner must be an instructor', {
        fields: { ownerId: ['Not an instructor'] },
      })
    }
    ownerId = owner.id
  }
  const row: CohortRow = {
    id: randomUUID(),
    name: body.name,
    description: body.description,
    ownerId,
    archived: false,
    createdAt: nowIso(),
  }
  await ctx.dataSource.getRepository(CohortEntity).insert(row)
  return presentCohortFor(ctx, row)
}

export async function getCohort(ctx: AppContext, user: UserRow, cohortId: string): Promise<Cohort> {
  return presentCohortFor(ctx, await cohortFor(ctx.dataSource, user, cohortId, 'read'))
}

export async function updateCohort(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  changes: UpdateCohortRequest,
): Promise<Cohort> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const next: CohortRow = {
    ...cohort,
    ...Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined)),
  }
  await ctx.dataSource
    .getRepository(CohortEntity)
    .update({ id: cohort.id }, { name: next.name, description: next.description, archived: next.archived })
  return presentCohortFor(ctx, next)
}

export async function listMembers(ctx: AppContext, user: UserRow, cohortId: string): Promise<CohortMember[]> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const enrollments = await ctx.dataSource.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })
  const users = enrollments.length
    ? await ctx.dataSource.getRepository(UserEntity).findBy({ id: In(enrollments.map((e) => e.userId)) })
    : []
  return enrollments
    .map((e) =>
      presentCohortMember(
        e,
        users.find((u) => u.id === e.userId)!,
      ),
    )
    .sort((a, b) => a.name.localeCompare(b.name))
}

export async function removeMember(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  memberId: string,
): Promise<void> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const result = await ctx.dataSource
    .getRepository(EnrollmentEntity)
    .delete({ cohortId: cohort.id, userId: memberId })
  if (!result.affected) throw notFound('Member')
}
