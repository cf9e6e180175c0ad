// /api/cohorts/:id/instructors and /api/cohorts/:id/copy: who teaches a cohort, and its next intake.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  addCoInstructorRequestSchema,
  cohortInstructorParamsSchema,
  copyCohortRequestSchema,
} from '@shared/api/cohorts'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { addCoInstructor, copyCohort, listInstructors, removeCoInstructor } from './teaching.service'

export function cohortTeachingRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx))
  const staff = requireRole('instructor', 'admin')

  router.get('/:id/instructors', staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ items: await listInstructors(ctx, currentUser(req), req.params.id) })
  })

  router.post(
    '/:id/instructors',
    staff,
    validate({ params: idParamsSchema, body: addCoInstructorRequestSchema }),
    async (req, res) => {
      res.status(201).json(await addCoInstructor(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.delete(
    '/:id/instructors/:userId',
    staff,
    validate({ params: cohortInstructorParamsSchema }),
    async (req, res) => {
      await removeCoInstructor(ctx, currentUser(req), req.params.id, req.params.userId)
      res.status(204).end()
    },
  )

  router.post(
    '/:id/copy',
    staff,
    validate({ params: idParamsSchema, body: copyCohortRequestSchema }),
    async (req, res) => {
      res.status(201).json(await copyCohort(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  return router
}
