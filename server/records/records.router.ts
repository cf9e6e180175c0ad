// Records (mounted at /api): the commissioning record of an attempt, an apprentice's training record
// (JSON and PDF), a cohort's training records as a zip, and an instructor's sign-off of an outcome.
import { Router, type Response } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  signOffRequestSchema,
  signOffWithdrawalRequestSchema,
  trainingRecordQuerySchema,
} from '@shared/api/records'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import {
  cohortTrainingRecordsZip,
  commissioningRecordJson,
  commissioningRecordFile,
  signOffOutcome,
  trainingRecordFile,
  trainingRecordSummary,
  withdrawSignOff,
  type RecordFile,
} from './records.service'

function sendFile(res: Response, type: string, file: RecordFile) {
  res.setHeader('Content-Type', type)
  res.setHeader('Content-Disposition', `attachment; filename="${file.fileName}"`)
  res.setHeader('Cache-Control', 'private, no-store')
  res.send(file.bytes)
}

export function recordsRouter(ctx: AppContext): Router {
  const router = Router()
  const auth = authenticate(ctx)
  const staff = requireRole('instructor', 'admin')

  router.get(
    '/attempts/:id/commissioning-record.pdf',
    auth,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      sendFile(res, 'application/pdf', await commissioningRecordFile(ctx, currentUser(req), req.params.id))
    },
  )

  router.get(
    '/attempts/:id/commissioning-record',
    auth,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      res.json(await commissioningRecordJson(ctx, currentUser(req), req.params.id))
    },
  )

  router.get(
    '/apprentices/:id/training-record',
    auth,
    validate({ params: idParamsSchema, query: trainingRecordQuerySchema }),
    async (req, res) => {
      res.json(await trainingRecordSummary(ctx, currentUser(req), req.params.id, req.query))
    },
  )

  router.get(
    '/apprentices/:id/training-record.pdf',
    auth,
    validate({ params: idParamsSchema, query: trainingRecordQuerySchema }),
    async (req, res) => {
      sendFile(
        res,
        'application/pdf',
        await trainingRecordFile(ctx, currentUser(req), req.params.id, req.query),
      )
    },
  )

  router.post(
    '/apprentices/:id/sign-offs',
    auth,
    staff,
    validate({ params: idParamsSchema, body: signOffRequestSchema }),
    async (req, res) => {
      res.status(201).json(await signOffOutcome(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.post(
    '/sign-offs/:id/withdrawal',
    auth,
    staff,
    validate({ params: idParamsSchema, body: signOffWithdrawalRequestSchema }),
    async (req, res) => {
      res.status(201).json(await withdrawSignOff(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.get(
    '/cohorts/:id/training-records.zip',
    auth,
    staff,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      sendFile(res, 'application/zip', await cohortTrainingRecordsZip(ctx, currentUser(req), req.params.id))
    },
  )

  return router
}
