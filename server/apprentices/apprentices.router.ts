// /api/apprentices/:id — one apprentice's record, for the instructors of their cohorts and admins.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { apprenticeRecord } from './apprentices.service'

export function apprenticesRouter(ctx: AppContext): Router {
  const router = Router()
  // The role check sits on the route, not the router: other features (records) answer apprentices under
  // /api/apprentices/:id/… too, and apprentices may read those.
  const staff = [authenticate(ctx), requireRole('instructor', 'admin')]

  router.get('/:id', ...staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await apprenticeRecord(ctx, currentUser(req), req.params.id))
  })

  return router
}
