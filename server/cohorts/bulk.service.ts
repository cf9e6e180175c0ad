// What an instructor does to several members of a cohort at once: a message by e-mail, or removal.
// All or nothing: one person named who is not a member refuses the lot, and says so.
import { In } from 'typeorm'
import type { CohortMessageRequest } from '@shared/api/cohorts'
import { cohortFor } from '../access/access.service'
import { appLink, type AppContext } from '../context'
import { EnrollmentEntity, UserEntity, type CohortRow, type UserRow } from '../entities'
import { HttpError } from '../http-error'
import { queueMail } from '../infrastructure/mail/mail-job'
import { cohortMessageMail } from '../infrastructure/mail/templates'

async function membersNamed(ctx: AppContext, cohort: CohortRow, userIds: string[]): Promise<string[]> {
  const wanted = [...new Set(userIds)]
  const enrolled = await ctx.dataSource
    .getRepository(EnrollmentEntity)
    .findBy({ cohortId: cohort.id, userId: In(wanted) })
  const outsiders = wanted.length - enrolled.length
  if (outsiders) {
    throw new HttpError(400, 'validation_failed', 'Choose only members of this cohort', {
      fields: { userIds: [`${outsiders} of those chosen are not members of this cohort`] },
    })
  }
  return wanted
}

/** Mails the message to each member chosen whose account is active; returns how many were sent. */
export async function messageMembers(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  body: CohortMessageRequest,
): Promise<{ sent: number }> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const ids = await membersNamed(ctx, cohort, body.userIds)
  const people = await ctx.dataSource.getRepository(UserEntity).findBy({ id: In(ids), active: true })
  // Queued together: either every message goes or none does.
  await ctx.dataSource.transaction(async (manager) => {
    for (const person of people) {
      await queueMail(
        manager,
        cohortMessageMail({
          to: person.email,
          name: person.name,
          cohortName: cohort.name,
          instructorName: user.name,
          subject: body.subject,
          body: body.body,
          url: appLink(ctx, '/learn'),
        }),
      )
    }
  })
  return { sent: people.length }
}

/** Takes the members chosen out of the cohort; their accounts and past attempts stay. */
export async function removeMembers(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  userIds: string[],
): Promise<{ removed: number }> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const ids = await membersNamed(ctx, cohort, userIds)
  const result = await ctx.dataSource
    .getRepository(EnrollmentEntity)
    .delete({ cohortId: cohort.id, userId: In(ids) })
  return { removed: result.affected ?? ids.length }
}
