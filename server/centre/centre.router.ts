// /api/centre: the centre's name and time zone; everyone signed in reads them, admins change them.
import { Router } from 'express'
import { updateCentreSettingsRequestSchema } from '@shared/api/centre'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { getCentreSettings, updateCentreSettings } from './centre.service'

export function centreRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx))

  router.get('/', async (_req, res) => {
    res.json(await getCentreSettings(ctx))
  })

  router.patch(
    '/',
    requireRole('admin'),
    validate({ body: updateCentreSettingsRequestSchema }),
    async (req, res) => {
      res.json(await updateCentreSettings(ctx, currentUser(req), req.body))
    },
  )

  return router
}
