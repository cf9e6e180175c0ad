// From one attempt's review to the next apprentice's: the apprentices of the assignment's cohort who have
// submitted it, by name, each with their latest submitted attempt.
import { In } from 'typeorm'
import type { AttemptNeighbours } from '@shared/api/apprentices'
import { attemptFor } from '../access/access.service'
import type { AppContext } from '../context'
import { AssignmentEntity, AttemptEntity, EnrollmentEntity, UserEntity, type UserRow } from '../entities'

const collator = new Intl.Collator()

export async function attemptNeighbours(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<AttemptNeighbours> {
  const ds = ctx.dataSource
  // 'read': an instructor may open a practice attempt of theirs for review (it has no neighbours).
  const attempt = await attemptFor(ds, user, attemptId, 'read')
  const assignment = attempt.assignmentId
    ? await ds.getRepository(AssignmentEntity).findOneBy({ id: attempt.assignmentId })
    : null
  if (!assignment) return { position: 0, of: 0, previous: null, next: null }
  const members = await ds
    .getRepository(EnrollmentEntity)
    .find({ where: { cohortId: assignment.cohortId }, select: { userId: true } })
  const submitted = await ds.getRepository(AttemptEntity).find({
    where: { assignmentId: assignment.id, status: 'submitted' },
    select: { id: true, userId: true, submittedAt: true },
    order: { submittedAt: 'DESC' },
  })
  const latest = new Map<string, string>()
  for (const a of submitted) if (!latest.has(a.userId)) latest.set(a.userId, a.id)
  const ids = members.map((m) => m.userId).filter((id) => latest.has(id) || id === attempt.userId)
  const people = ids.length
    ? await ds.getRepository(UserEntity).find({ where: { id: In(ids) }, select: { id: true, name: true } })
    : []
  people.sort((a, b) => collator.compare(a.name, b.name) || collator.compare(a.id, b.id))
  const at = people.findIndex((p) => p.id === attempt.userId)
  const step = (index: number) => {
    const person = people[index]
    const id = person && latest.get(person.id)
    return person && id ? { attemptId: id, userName: person.name } : null
  }
  return { position: at + 1, of: people.length, previous: step(at - 1), next: step(at + 1) }
}
