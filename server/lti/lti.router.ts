// /api/lti: Slipway as an LTI 1.3 tool. The platform's browser flow, the admins' registrations and the
// instructors' course tools, each in its own router.
import { Router } from 'express'
import type { AppContext } from '../context'
import { courseRouter } from './course.router'
import { launchRouter } from './launch.router'
import { registrationRouter } from './registration.router'
import { ltiRuntime, type LtiOptions } from './runtime'

export function ltiRouter(ctx: AppContext, options: LtiOptions = {}): Router {
  ltiRuntime(ctx, options)
  const router = Router()
  router.use(launchRouter(ctx))
  router.use(registrationRouter(ctx))
  router.use(courseRouter(ctx))
  return router
}
