// /api/assignments/:id/insight and /api/cohorts/:id/insight — class insight for the cohort's instructor.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { insightForAssignment, insightForCohort } from './insight.service'

export function insightRouter(ctx: AppContext): Router {
  const router = Router()
  const staff = [authenticate(ctx), requireRole('instructor', 'admin')]

  router.get('/assignments/:id/insight', ...staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await insightForAssignment(ctx, currentUser(req), req.params.id))
  })

  router.get('/cohorts/:id/insight', ...staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await insightForCohort(ctx, currentUser(req), req.params.id))
  })

  return router
}
