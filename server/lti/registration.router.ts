// /api/lti (admin): platform registrations, the values a platform's administrator enters, key rotation.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import { createPlatformRequestSchema, updatePlatformRequestSchema } from '@shared/api/lti'
import type { AppContext } from '../context'
import { authenticate, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import {
  createPlatform,
  deletePlatform,
  getPlatform,
  listPlatforms,
  rotateToolKey,
  toolConfiguration,
  updatePlatform,
} from './registration.service'
import { ltiRuntime } from './runtime'

export function registrationRouter(ctx: AppContext): Router {
  const router = Router()
  const admin = [authenticate(ctx), requireRole('admin')]
  // A registration changes which sites may frame Slipway: this instance applies it at once.
  const framingChanged = () => ltiRuntime(ctx).frameOrigins.invalidate()

  router.get('/tool', ...admin, async (_req, res) => {
    res.json(await toolConfiguration(ctx))
  })

  router.post('/tool/keys/rotate', ...admin, async (_req, res) => {
    res.json(await rotateToolKey(ctx))
  })

  router.get('/platforms', ...admin, async (_req, res) => {
    res.json({ items: await listPlatforms(ctx) })
  })

  router.post('/platforms', ...admin, validate({ body: createPlatformRequestSchema }), async (req, res) => {
    const platform = await createPlatform(ctx, req.body)
    framingChanged()
    res.status(201).json(platform)
  })

  router.get('/platforms/:id', ...admin, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getPlatform(ctx, req.params.id))
  })

  router.patch(
    '/platforms/:id',
    ...admin,
    validate({ params: idParamsSchema, body: updatePlatformRequestSchema }),
    async (req, res) => {
      const platform = await updatePlatform(ctx, req.params.id, req.body)
      framingChanged()
      res.json(platform)
    },
  )

  router.delete('/platforms/:id', ...admin, validate({ params: idParamsSchema }), async (req, res) => {
    await deletePlatform(ctx, req.params.id)
    framingChanged()
    res.status(204).end()
  })

  return router
}
