// /api/practice (what the signed-in user may practise) and /api/cohorts/:id/practice (a cohort's policy).
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import { practiceKeyParamsSchema, practicePolicySchema } from '@shared/api/practice'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { checkPracticeOpen, cohortPractice, practiceList, setCohortPractice } from './practice.service'

export function practiceRouter(ctx: AppContext): Router {
  const router = Router()
  const signedIn = authenticate(ctx)
  const staff = [signedIn, requireRole('instructor', 'admin')]

  router.get('/practice', signedIn, async (req, res) => {
    res.json(await practiceList(ctx, currentUser(req)))
  })

  router.get('/practice/:key', signedIn, validate({ params: practiceKeyParamsSchema }), async (req, res) => {
    res.json(await checkPracticeOpen(ctx, currentUser(req), req.params.key))
  })

  router.get('/cohorts/:id/practice', ...staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await cohortPractice(ctx, currentUser(req), req.params.id))
  })

  router.put(
    '/cohorts/:id/practice',
    ...staff,
    validate({ params: idParamsSchema, body: practicePolicySchema }),
    async (req, res) => {
      res.json(await setCohortPractice(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  return router
}
