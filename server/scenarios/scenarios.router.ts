// /api/scenarios: read (everyone signed in); create, new version, duplicate, retire, upload a pack (staff).
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  createScenarioRequestSchema,
  duplicateScenarioRequestSchema,
  scenarioKeyParamsSchema,
  scenarioListQuerySchema,
  scenarioVersionParamsSchema,
  updateScenarioRequestSchema,
} from '@shared/api/scenarios'
import type { AppContext } from '../context'
import { uploadMiddleware } from '../infrastructure/storage/uploads'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import {
  createScenario,
  duplicateScenario,
  getLatestScenario,
  getScenarioVersion,
  getScenarioVersionById,
  listScenarios,
  listScenarioVersions,
  PACK_UPLOAD,
  setScenarioStatus,
  updateScenario,
  uploadScenarioPack,
} from './scenarios.service'

export function scenariosRouter(ctx: AppContext): Router {
  const router = Router()
  const staff = requireRole('instructor', 'admin')
  router.use(authenticate(ctx))

  router.get('/', validate({ query: scenarioListQuerySchema }), async (req, res) => {
    res.json({ items: await listScenarios(ctx, currentUser(req), req.query) })
  })

  router.post('/', staff, validate({ body: createScenarioRequestSchema }), async (req, res) => {
    res.status(201).json(await createScenario(ctx, currentUser(req), req.body))
  })

  router.post('/upload', staff, uploadMiddleware(PACK_UPLOAD), async (req, res) => {
    res.status(201).json({ items: await uploadScenarioPack(ctx, currentUser(req), req.file) })
  })

  router.get('/:key', validate({ params: scenarioKeyParamsSchema }), async (req, res) => {
    res.json(await getLatestScenario(ctx, currentUser(req), req.params.key))
  })

  router.put(
    '/:key',
    staff,
    validate({ params: scenarioKeyParamsSchema, body: updateScenarioRequestSchema }),
    async (req, res) => {
      res.status(201).json(await updateScenario(ctx, currentUser(req), req.params.key, req.body))
    },
  )

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

  router.post(
    '/:key/duplicate',
    staff,
    validate({ params: scenarioKeyParamsSchema, body: duplicateScenarioRequestSchema }),
    async (req, res) => {
      res.status(201).json(await duplicateScenario(ctx, currentUser(req), req.params.key, req.body))
    },
  )

  for (const [action, status] of [
    ['retire', 'retired'],
    ['restore', 'active'],
  ] as const) {
    router.post(`/:key/${action}`, staff, validate({ params: scenarioKeyParamsSchema }), async (req, res) => {
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
