// /api/scenarios: read (everyone signed in); drafts, reference solutions, publish, duplicate, retire,
// export and import packs (staff). The authoring rules are in shared/api/scenarioAuthoring.ts.
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  createDraftRequestSchema,
  exportPackQuerySchema,
  recordReferenceRequestSchema,
  saveDraftRequestSchema,
} from '@shared/api/scenarioAuthoring'
import {
  duplicateScenarioRequestSchema,
  scenarioKeyParamsSchema,
  scenarioListQuerySchema,
  scenarioVersionParamsSchema,
} from '@shared/api/scenarios'
import type { AppContext } from '../context'
import { uploadMiddleware } from '../infrastructure/storage/uploads'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import {
  createDraft,
  discardDraft,
  duplicateToDraft,
  getDraft,
  listDrafts,
  publishDraft,
  recordReference,
  saveDraft,
  startDraft,
} from './drafts.service'
import { exportPack, importPack, PACK_UPLOAD } from './packs.service'
import {
  getLatestScenario,
  getScenarioVersion,
  getScenarioVersionById,
  listScenarios,
  listScenarioVersions,
  setScenarioStatus,
} from './scenarios.service'

export function scenariosRouter(ctx: AppContext): Router {
  const router = Router()
  const staff = requireRole('instructor', 'admin')
  router.use(authenticate(ctx))

  router.get('/', validate({ query: scenarioListQuerySchema }), async (req, res) => {
    res.json({ items: await listScenarios(ctx, currentUser(req), req.query) })
  })

  // Fixed paths before /:key.
  router.get('/drafts', staff, async (_req, res) => {
    res.json({ items: await listDrafts(ctx) })
  })

  router.post('/drafts', staff, validate({ body: createDraftRequestSchema }), async (req, res) => {
    res.status(201).json(await createDraft(ctx, currentUser(req), req.body))
  })

  router.get('/export', staff, validate({ query: exportPackQuerySchema }), async (req, res) => {
    const { fileName, pack } = await exportPack(ctx, req.query.keys)
    res.setHeader('Content-Disposition', `attachment; filename="${fileName}"`)
    res.json(pack)
  })

  router.post('/upload', staff, uploadMiddleware(PACK_UPLOAD), async (req, res) => {
    res.status(201).json({ items: await importPack(ctx, currentUser(req), req.file) })
  })

  router.get('/:key', validate({ params: scenarioKeyParamsSchema }), async (req, res) => {
    res.json(await getLatestScenario(ctx, currentUser(req), req.params.key))
  })

  router.get('/:key/versions', staff, validate({ params: scenarioKeyParamsSchema }), async (req, res) => {
    res.json({ items: await listScenarioVersions(ctx, req.params.key) })
  })

  router.get(
    '/:key/versions/:version',
    validate({ params: scenarioVersionParamsSchema }),
    async (req, res) => {
      res.json(await getScenarioVersion(ctx, req.params.key, req.params.version))
    },
  )

  const keyParams = validate({ params: scenarioKeyParamsSchema })
  router.get('/:key/draft', staff, keyParams, async (req, res) => {
    res.json(await getDraft(ctx, req.params.key))
  })

  router.post('/:key/draft', staff, keyParams, async (req, res) => {
    const { draft, created } = await startDraft(ctx, currentUser(req), req.params.key)
    res.status(created ? 201 : 200).json(draft)
  })

  router.put(
    '/:key/draft',
    staff,
    validate({ params: scenarioKeyParamsSchema, body: saveDraftRequestSchema }),
    async (req, res) => {
      res.json(await saveDraft(ctx, currentUser(req), req.params.key, req.body.document))
    },
  )

  router.delete('/:key/draft', staff, keyParams, async (req, res) => {
    await discardDraft(ctx, req.params.key)
    res.status(204).end()
  })

  router.put(
    '/:key/draft/reference',
    staff,
    validate({ params: scenarioKeyParamsSchema, body: recordReferenceRequestSchema }),
    async (req, res) => {
      res.json(await recordReference(ctx, currentUser(req), req.params.key, req.body.events))
    },
  )

  router.post('/:key/draft/publish', staff, keyParams, async (req, res) => {
    res.status(201).json(await publishDraft(ctx, currentUser(req), req.params.key))
  })

  router.post(
    '/:key/duplicate',
    staff,
    validate({ params: scenarioKeyParamsSchema, body: duplicateScenarioRequestSchema }),
    async (req, res) => {
      res.status(201).json(await duplicateToDraft(ctx, currentUser(req), req.params.key, req.body))
    },
  )

  for (const [action, status] of [
    ['retire', 'retired'],
    ['restore', 'active'],
  ] as const) {
    router.post(`/:key/${action}`, staff, keyParams, async (req, res) => {
      res.json(await setScenarioStatus(ctx, req.params.key, status))
    })
  }

  return router
}

/** /api/scenario-versions/:id — one exact version, as assignments and attempts refer to it. */
export function scenarioVersionsRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx))
  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getScenarioVersionById(ctx, req.params.id))
  })
  return router
}
