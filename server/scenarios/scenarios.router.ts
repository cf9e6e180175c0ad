// /api/scenarios: read (everyone signed in); create, new version, duplicate, retire, upload a pack (staff).
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  createScenarioRequestSchema,
  duplicateScenarioRequestSchema,
  SCENARIO_PACK_FIELD,
  SCENARIO_PACK_MAX_BYTES,
  scenarioKeyParamsSchema,
  scenarioListQuerySchema,
  scenarioPackSchema,
  scenarioVersionParamsSchema,
  updateScenarioRequestSchema,
  type DuplicateScenarioRequest,
} from '@shared/api/scenarios'
import type { Scenario } from '@shared/scenario/schema'
import type { AppContext } from '../context'
import { ScenarioEntity, type ScenarioRow } from '../entities'
import { HttpError, notFound } from '../http-error'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { parseOrThrow } from '../middleware/errors'
import { presentScenario, presentScenarioDetail } from '../services/presenters'
import { latestVersion, storeScenarioVersion } from './scenarios.service'
import { keepUpload, uploadedText, uploadMiddleware, type UploadKind } from '../infrastructure/storage/uploads'

const PACK_UPLOAD: UploadKind = {
  purpose: 'scenarioPack',
  field: SCENARIO_PACK_FIELD,
  maxBytes: SCENARIO_PACK_MAX_BYTES,
  extensions: ['.json'],
  mimeTypes: ['application/json', 'text/json', 'text/plain'],
  label: 'scenario pack',
}

export function scenariosRouter(ctx: AppContext): Router {
  const router = Router()
  const ds = ctx.dataSource
  const repo = () => ds.getRepository(ScenarioEntity)
  const staff = requireRole('instructor', 'admin')
  router.use(authenticate(ctx))

  async function latestOrThrow(key: string): Promise<ScenarioRow> {
    const row = await latestVersion(ds, key)
    if (!row) throw notFound('Scenario')
    return row
  }

  router.get('/', validate({ query: scenarioListQuerySchema }), async (req, res) => {
    const { includeRetired } = req.query as unknown as { includeRetired: boolean }
    const rows = await repo().find({ order: { key: 'ASC', version: 'DESC' } })
    const latest = rows.filter((row, i) => i === 0 || rows[i - 1]!.key !== row.key)
    // Apprentices only ever see what can still be practised.
    const showRetired = includeRetired && currentUser(req).role !== 'apprentice'
    res.json({ items: latest.filter((row) => showRetired || row.status === 'active').map(presentScenario) })
  })

  router.post('/', staff, validate({ body: createScenarioRequestSchema }), async (req, res) => {
    const { row } = await ds.transaction((m) =>
      storeScenarioVersion(m, req.body as Scenario, currentUser(req).id, 'new'),
    )
    res.status(201).json(presentScenarioDetail(row))
  })

  router.post('/upload', staff, uploadMiddleware(PACK_UPLOAD), async (req, res) => {
    const { file, text } = uploadedText(req, PACK_UPLOAD)
    let json: unknown
    try {
      json = JSON.parse(text)
    } catch {
      throw new HttpError(415, 'unsupported_media_type', 'The scenario pack is not valid JSON')
    }
    // Parse by the shape given, so an error names its place: `1.id` is the second scenario's id.
    const documents = Array.isArray(json)
      ? parseOrThrow(scenarioPackSchema.options[1], json)
      : [parseOrThrow(scenarioPackSchema.options[0], json)]
    const user = currentUser(req)
    const items = await ds.transaction(async (manager) => {
      const stored = []
      for (const [index, document] of documents.entries()) {
        const prefix = Array.isArray(json) ? `[${index}]` : ''
        stored.push(await storeScenarioVersion(manager, document, user.id, 'either', prefix))
      }
      await keepUpload(ctx, manager, user.id, PACK_UPLOAD, file)
      return stored
    })
    res
      .status(201)
      .json({ items: items.map(({ row, created }) => ({ scenario: presentScenario(row), created })) })
  })

  router.get('/:key', validate({ params: scenarioKeyParamsSchema }), async (req, res) => {
    const row = await latestOrThrow(String(req.params.key))
    if (row.status === 'retired' && currentUser(req).role === 'apprentice') throw notFound('Scenario')
    res.json(presentScenarioDetail(row))
  })

  router.put(
    '/:key',
    staff,
    validate({ params: scenarioKeyParamsSchema, body: updateScenarioRequestSchema }),
    async (req, res) => {
      const document = req.body as Scenario
      if (document.id !== req.params.key) {
        throw new HttpError(
          400,
          'validation_failed',
          'The document id must match the scenario being updated',
          {
            fields: { id: [`Must be “${String(req.params.key)}”`] },
          },
        )
      }
      const { row } = await ds.transaction((m) =>
        storeScenarioVersion(m, document, currentUser(req).id, 'existing'),
      )
      res.status(201).json(presentScenarioDetail(row))
    },
  )

  router.get('/:key/versions', staff, validate({ params: scenarioKeyParamsSchema }), async (req, res) => {
    const rows = await repo().find({ where: { key: String(req.params.key) }, order: { version: 'DESC' } })
    if (rows.length === 0) throw notFound('Scenario')
    res.json({ items: rows.map(presentScenario) })
  })

  router.get(
    '/:key/versions/:version',
    validate({ params: scenarioVersionParamsSchema }),
    async (req, res) => {
      const row = await repo().findOneBy({ key: String(req.params.key), version: Number(req.params.version) })
      if (!row) throw notFound('Scenario version')
      res.json(presentScenarioDetail(row))
    },
  )

  router.post(
    '/:key/duplicate',
    staff,
    validate({ params: scenarioKeyParamsSchema, body: duplicateScenarioRequestSchema }),
    async (req, res) => {
      const source = await latestOrThrow(String(req.params.key))
      const { newKey, title } = req.body as DuplicateScenarioRequest
      const document = { ...(JSON.parse(source.document) as Scenario), id: newKey, version: 1 }
      if (title) document.title = title
      else document.title = `${document.title} (copy)`.slice(0, 120)
      const { row } = await ds.transaction((m) =>
        storeScenarioVersion(m, document, currentUser(req).id, 'new'),
      )
      res.status(201).json(presentScenarioDetail(row))
    },
  )

  for (const [action, status] of [
    ['retire', 'retired'],
    ['restore', 'active'],
  ] as const) {
    router.post(`/:key/${action}`, staff, validate({ params: scenarioKeyParamsSchema }), async (req, res) => {
      const key = String(req.params.key)
      await latestOrThrow(key)
      await repo().update({ key }, { status })
      res.json(presentScenario(await latestOrThrow(key)))
    })
  }

  return router
}

/** /api/scenario-versions/:id — one exact version, as assignments and attempts refer to it. */
export function scenarioVersionsRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx))
  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    const row = await ctx.dataSource.getRepository(ScenarioEntity).findOneBy({ id: String(req.params.id) })
    if (!row) throw notFound('Scenario version')
    res.json(presentScenarioDetail(row))
  })
  return router
}
