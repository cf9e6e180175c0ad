// /api/live: the live classroom (shared/api/live.ts has the flow). The apprentice's panel opens a session, posts
// its events and reads its inbox; the cohort's instructors read the class view and watch streams, inject
// faults and send messages.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  injectFaultRequestSchema,
  liveStreamQuerySchema,
  openLiveSessionRequestSchema,
  postLiveEventsRequestSchema,
  sendLiveMessageRequestSchema,
} from '@shared/api/live'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { classView, liveAttempt } from './live-class.service'
import { injectFault, sendMessage } from './live-commands.service'
import { closeSession, openSession, postEvents } from './live-sessions.service'
import { streamClass, streamInbox, streamWatch } from './live-streams'

export function liveRouter(ctx: AppContext): Router {
  const router = Router()
  const apprentice = requireRole('apprentice')
  router.use(authenticate(ctx))

  router.post(
    '/attempts/:id/session',
    apprentice,
    validate({ params: idParamsSchema, body: openLiveSessionRequestSchema }),
    async (req, res) => {
      const { created, session } = await openSession(ctx, currentUser(req), req.params.id, req.body)
      res.status(created ? 201 : 200).json(session)
    },
  )

  router.post(
    '/attempts/:id/events',
    apprentice,
    validate({ params: idParamsSchema, body: postLiveEventsRequestSchema }),
    async (req, res) => {
      res.json(await postEvents(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.post('/attempts/:id/close', apprentice, validate({ params: idParamsSchema }), async (req, res) => {
    await closeSession(ctx, currentUser(req), req.params.id)
    res.status(204).end()
  })

  router.get(
    '/attempts/:id/inbox',
    apprentice,
    validate({ params: idParamsSchema, query: liveStreamQuerySchema }),
    async (req, res) => {
      await streamInbox(ctx, req, res, currentUser(req), req.params.id, req.query.after)
    },
  )

  router.get('/cohorts/:id/class', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await classView(ctx, currentUser(req), req.params.id))
  })

  router.get('/cohorts/:id/stream', validate({ params: idParamsSchema }), async (req, res) => {
    await streamClass(ctx, req, res, currentUser(req), req.params.id)
  })

  router.get('/attempts/:id', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await liveAttempt(ctx, currentUser(req), req.params.id))
  })

  router.get(
    '/attempts/:id/stream',
    validate({ params: idParamsSchema, query: liveStreamQuerySchema }),
    async (req, res) => {
      await streamWatch(ctx, req, res, currentUser(req), req.params.id, req.query.after)
    },
  )

  router.post(
    '/attempts/:id/injections',
    validate({ params: idParamsSchema, body: injectFaultRequestSchema }),
    async (req, res) => {
      res.status(201).json(await injectFault(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.post('/messages', validate({ body: sendLiveMessageRequestSchema }), async (req, res) => {
    res.json(await sendMessage(ctx, currentUser(req), req.body))
  })

  return router
}
