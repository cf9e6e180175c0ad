// /api/attempts: submit or save progress, list and read (with replay log), feedback and grade overrides.
import { Router } from 'express'
import {
  attemptListQuerySchema,
  feedbackRequestSchema,
  gradeOverrideRequestSchema,
  reviewRequestSchema,
  submitAttemptRequestSchema,
} from '@shared/api/attempts'
import { idParamsSchema } from '@shared/api/common'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { addFeedback, getAttemptDetail, listAttempts, markReviewed, overrideGrade } from './attempts.service'
import { attemptNeighbours } from './neighbours'
import { submitAttempt } from './submission.service'

export function attemptsRouter(ctx: AppContext): Router {
  const router = Router()
  const staff = requireRole('instructor', 'admin')
  router.use(authenticate(ctx))

  router.post('/', validate({ body: submitAttemptRequestSchema }), async (req, res) => {
    const { created, attempt } = await submitAttempt(ctx, currentUser(req), req.body)
    res.status(created ? 201 : 200).json(attempt)
  })

  router.get('/', validate({ query: attemptListQuerySchema }), async (req, res) => {
    res.json(await listAttempts(ctx, currentUser(req), req.query))
  })

  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getAttemptDetail(ctx, currentUser(req), req.params.id))
  })

  router.post(
    '/:id/feedback',
    staff,
    validate({ params: idParamsSchema, body: feedbackRequestSchema }),
    async (req, res) => {
      res.status(201).json(await addFeedback(ctx, currentUser(req), req.params.id, req.body.body))
    },
  )

  router.get('/:id/neighbours', staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await attemptNeighbours(ctx, currentUser(req), req.params.id))
  })

  router.post(
    '/:id/review',
    staff,
    validate({ params: idParamsSchema, body: reviewRequestSchema }),
    async (req, res) => {
      res.json(await markReviewed(ctx, currentUser(req), req.params.id, req.body.reviewed))
    },
  )

  router.post(
    '/:id/grade-override',
    staff,
    validate({ params: idParamsSchema, body: gradeOverrideRequestSchema }),
    async (req, res) => {
      res.json(await overrideGrade(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  return router
}
