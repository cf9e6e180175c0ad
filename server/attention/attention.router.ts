// /api/attention: what needs the signed-in instructor today, across their cohorts (admins: all cohorts).
import { Router } from 'express'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { attentionFor } from './attention.service'

export function attentionRouter(ctx: AppContext): Router {
  const router = Router()
  router.get('/', authenticate(ctx), requireRole('instructor', 'admin'), async (req, res) => {
    res.json(await attentionFor(ctx, currentUser(req)))
  })
  return router
}
