// Assignments (mounted at /api): set in a cohort by its instructor, seen by its apprentices; statistics for staff.
import { Router } from 'express'
import {
  assignmentListQuerySchema,
  createAssignmentRequestSchema,
  updateAssignmentRequestSchema,
} from '@shared/api/assignments'
import { idParamsSchema } from '@shared/api/common'
import type { AppContext } from '../context'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import {
  assignmentStats,
  createAssignment,
  deleteAssignment,
  getAssignment,
  listAssignments,
  updateAssignment,
} from './assignments.service'

export function assignmentsRouter(ctx: AppContext): Router {
  const router = Router()
  const auth = authenticate(ctx)
  const staff = requireRole('instructor', 'admin')

  router.get('/assignments', auth, validate({ query: assignmentListQuerySchema }), async (req, res) => {
    res.json({ items: await listAssignments(ctx, currentUser(req), req.query) })
  })

  router.post(
    '/cohorts/:id/assignments',
    auth,
    staff,
    validate({ params: idParamsSchema, body: createAssignmentRequestSchema }),
    async (req, res) => {
      res.status(201).json(await createAssignment(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.get('/assignments/:id', auth, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getAssignment(ctx, currentUser(req), req.params.id))
  })

  router.patch(
    '/assignments/:id',
    auth,
    staff,
    validate({ params: idParamsSchema, body: updateAssignmentRequestSchema }),
    async (req, res) => {
      res.json(await updateAssignment(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.delete('/assignments/:id', auth, staff, validate({ params: idParamsSchema }), async (req, res) => {
    await deleteAssignment(ctx, currentUser(req), req.params.id)
    res.status(204).end()
  })

  router.get(
    '/assignments/:id/stats',
    auth,
    staff,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      res.json(await assignmentStats(ctx, currentUser(req), req.params.id))
    },
  )

  return router
}
