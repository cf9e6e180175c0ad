// /api/lti (instructors): the deep-linking picker's request and answer, a cohort's course link, roster pulls,
// and the state of grades sent back to the course.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import { deepLinkingChoiceSchema } from '@shared/api/lti'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { answerDeepLink, getDeepLinkRequest } from './deep-linking.service'
import { cohortScoreSyncs, retryFailedScores } from './passback.service'
import { cohortLink, pullRoster } from './roster.service'

export function courseRouter(ctx: AppContext): Router {
  const router = Router()
  const staff = [authenticate(ctx), requireRole('instructor', 'admin')]

  router.get('/deep-linking/:id', ...staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getDeepLinkRequest(ctx, currentUser(req), req.params.id))
  })

  router.post(
    '/deep-linking/:id',
    ...staff,
    validate({ params: idParamsSchema, body: deepLinkingChoiceSchema }),
    async (req, res) => {
      res.status(201).json(await answerDeepLink(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.get('/cohorts/:id', ...staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await cohortLink(ctx, currentUser(req), req.params.id))
  })

  router.post(
    '/cohorts/:id/roster-pull',
    ...staff,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      res.json(await pullRoster(ctx, currentUser(req), req.params.id))
    },
  )

  router.get('/cohorts/:id/score-sync', ...staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.setHeader('Cache-Control', 'no-store')
    res.json(await cohortScoreSyncs(ctx, currentUser(req), req.params.id))
  })

  router.post(
    '/cohorts/:id/score-sync/retry',
    ...staff,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      res.json(await retryFailedScores(ctx, currentUser(req), req.params.id))
    },
  )

  return router
}
