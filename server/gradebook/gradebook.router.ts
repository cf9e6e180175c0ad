// /api/cohorts/:id/gradebook (JSON, paged) and /api/cohorts/:id/gradebook.csv (the same rows, all of them).
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import { gradebookQuerySchema } from '@shared/api/gradebook'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { gradebookCsvFile, gradebookPage } from './gradebook.service'

export function gradebookRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx), requireRole('instructor', 'admin'))

  router.get(
    '/:id/gradebook',
    validate({ params: idParamsSchema, query: gradebookQuerySchema }),
    async (req, res) => {
      const { json, etag } = await gradebookPage(ctx, currentUser(req), req.params.id, req.query)
      // With the entity tag set, Express answers a matching If-None-Match with 304 and no body; browsers
      // must ask again each time (no-cache) and keep the private page out of shared caches.
      res.setHeader('ETag', etag)
      res.setHeader('Cache-Control', 'private, no-cache')
      res.type('application/json').send(json)
    },
  )

  router.get(
    '/:id/gradebook.csv',
    validate({ params: idParamsSchema, query: gradebookQuerySchema }),
    async (req, res) => {
      const { fileName, csv } = await gradebookCsvFile(ctx, currentUser(req), req.params.id, req.query)
      res.setHeader('Content-Type', 'text/csv; charset=utf-8')
      res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`)
      res.send(csv)
    },
  )

  return router
}
