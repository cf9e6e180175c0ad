// /api/attempts: submit or save progress, list and read (with replay log, or the overview without it),
// feedback and grade overrides.
import { Router } from 'express'
import {
  attemptListQuerySchema,
  feedbackRequestSchema,
  gradeOverrideRequestSchema,
  reviewRequestSchema,
} from '@shared/api/attempts'
import { idParamsSchema } from '@shared/api/common'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { keepRawJsonBody } from '../middleware/raw-body'
import { asMiddleware, validate } from '../middleware/validate'
import {
  addFeedback,
  getAttemptDetail,
  getAttemptOverview,
  listAttempts,
  markReviewed,
  overrideGrade,
} from './attempts.service'
import { attemptNeighbours } from './neighbours'
import { submitAttempt } from './submission.service'

export function attemptsRouter(ctx: AppContext): Router {
  const router = Router()
  const staff = requireRole('instructor', 'admin')
  router.use(authenticate(ctx))

  // The body arrives as bytes (app.ts): a grading thread parses and validates it with
  // submitAttemptRequestSchema, so a 2 MB log never holds up the event loop.
  router.post('/', asMiddleware(keepRawJsonBody), async (req, res) => {
    const { created, attempt } = await submitAttempt(ctx, currentUser(req), req.rawJson ?? null)
    res.status(created ? 201 : 200).json(attempt)
  })

  router.get('/', validate({ query: attemptListQuerySchema }), async (req, res) => {
    res.json(await listAttempts(ctx, currentUser(req), req.query))
  })

  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getAttemptDetail(ctx, currentUser(req), req.params.id))
  })

  // The same without the event log (which can run to megabytes): for result and review pages.
  router.get('/:id/overview', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getAttemptOverview(ctx, currentUser(req), req.params.id))
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
