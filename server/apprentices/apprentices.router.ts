// /api/apprentices/:id — one apprentice's record, for the instructors of their cohorts and admins.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { apprenticeRecord } from './apprentices.service'

export function apprenticesRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx), requireRole('instructor', 'admin'))

  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await apprenticeRecord(ctx, currentUser(req), req.params.id))
  })

  return router
}
