// /api/cohorts/:id/gradebook (JSON, paged) and /api/cohorts/:id/gradebook.csv (the same rows, all of them).
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import { gradebookQuerySchema } from '@shared/api/gradebook'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { cohortFor } from '../access/access.service'
import { toCsv } from '../infrastructure/csv'
import type { GradebookFilter } from './gradebook.service'
import type { GradebookPageQuery } from './gradebook-cache'
import { nowIso } from '../infrastructure/clock'

export function gradebookRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx), requireRole('instructor', 'admin'))

  router.get(
    '/:id/gradebook',
    validate({ params: idParamsSchema, query: gradebookQuerySchema }),
    async (req, res) => {
      const cohort = await cohortFor(ctx.dataSource, currentUser(req), String(req.params.id), 'manage')
      const { json, etag } = await ctx.gradebooks.page(cohort, req.query as unknown as GradebookPageQuery)
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
      const cohort = await cohortFor(ctx.dataSource, currentUser(req), String(req.params.id), 'manage')
      const { assignments, rows } = await ctx.gradebooks.view(cohort, req.query as unknown as GradebookFilter)
      const header = [
        'Name',
        'E-mail',
        'Average',
        'Last activity',
        ...assignments.flatMap((a) => [`${a.title} — best`, `${a.title} — attempts`, `${a.title} — status`]),
      ]
      const body = rows.map((row) => [
        row.name,
        row.email,
        row.average === null ? '' : row.average.toFixed(1),
        row.lastActivity ?? '',
        ...row.cells.flatMap((c) => [
          c.bestScore === null ? '' : c.bestScore.toFixed(1),
          c.attempts,
          c.status,
        ]),
      ])
      const safeName =
        cohort.name
          .replace(/[^A-Za-z0-9-]+/g, '-')
          .replace(/^-|-$/g, '')
          .slice(0, 60) || 'cohort'
      res.setHeader('Content-Type', 'text/csv; charset=utf-8')
      res.setHeader(
        'Content-Disposition',
        `attachment; filename="gradebook-${safeName}-${nowIso().slice(0, 10)}.csv"`,
      )
      res.send('\uFEFF' + toCsv(header, body))
    },
  )

  return router
}
