// The platform-facing routes (no sign-in): the key set, OIDC login initiation, the launch, the page that
// posts a deep-linking answer back, and the session a launch hands over (plus its refresh inside a frame).
// Browser-flow failures are pages, not JSON: the person is looking at them inside the platform.
import { randomBytes } from 'node:crypto'
import cookieParser from 'cookie-parser'
import express, { Router, type Request, type Response } from 'express'
import { launchExchangeRequestSchema } from '@shared/api/lti'
import type { AppContext } from '../context'
import { HttpError } from '../http-error'
import { asMiddleware, validate } from '../middleware/validate'
import { endSession, refreshSession, SessionEnded } from '../auth/sessions.service'
import { takeDeepLinkAnswer } from './deep-linking.service'
import { frameAncestorsFor } from './framing'
import { handleLaunch } from './launch.service'
import { initiateLogin, parseLoginRequest } from './login.service'
import { autoPostPage, refusalPage } from './pages'
import { LtiRefusal, REFUSAL_HEADER } from './refusal'
import { exchangeLaunchCode } from './session.service'
import {
  clearBindingCookie,
  clearFramedSession,
  framedRefreshToken,
  sendFramedSession,
  setBindingCookie,
} from './session-cookie'
import { publicKeySet } from './tool-keys'

/** A page for a browser (the usual case: the platform's form post), the API's error body for anything else. */
function sendRefusal(ctx: AppContext, req: Request, res: Response, error: unknown) {
  if (!(error instanceof LtiRefusal)) throw error
  ctx.log.info({ reason: error.reason }, 'LTI launch refused')
  const newWindowUrl = (error as LtiRefusal & { newWindowUrl?: string }).newWindowUrl
  res.status(error.status).setHeader(REFUSAL_HEADER, error.reason).setHeader('Cache-Control', 'no-store')
  if (req.get('accept')?.includes('text/html')) {
    res.type('html').send(refusalPage(error.message, { newWindowUrl }))
  } else {
    res.json({
      error: { code: 'lti_launch_refused', message: error.message, details: { reason: error.reason } },
    })
  }
}

export function launchRouter(ctx: AppContext): Router {
  const router = Router()
  // Platforms post forms (application/x-www-form-urlencoded); an ID token is a few kilobytes.
  const forms = asMiddleware(express.urlencoded({ extended: false, limit: '64kb' }))
  const cookies = asMiddleware(cookieParser())
  const limit = ctx.limits.ltiLaunch

  router.get('/jwks', async (_req, res) => {
    res.setHeader('Cache-Control', 'public, max-age=300')
    res.json(await publicKeySet(ctx.dataSource))
  })

  // LTI Core §5.1.1: the platform may send the login initiation as a GET or a form POST.
  router.all('/login', limit, forms, async (req, res) => {
    if (req.method !== 'GET' && req.method !== 'POST')
      throw new HttpError(405, 'bad_request', 'Use GET or POST')
    try {
      const answer = await initiateLogin(ctx, parseLoginRequest(req.method === 'GET' ? req.query : req.body))
      setBindingCookie(res, answer.binding)
      res.setHeader('Cache-Control', 'no-store')
      res.redirect(302, answer.redirectUrl)
    } catch (error) {
      sendRefusal(ctx, req as Request, res, error)
    }
  })

  router.post('/launch', limit, forms, cookies, async (req, res) => {
    try {
      const answer = await handleLaunch(ctx, (req.body ?? {}) as Record<string, unknown>, req.cookies ?? {})
      clearBindingCookie(res, answer.clearCookie)
      res.setHeader('Cache-Control', 'no-store')
      // 303: the browser follows with a GET of the client's hand-over page.
      res.redirect(303, answer.redirectUrl)
    } catch (error) {
      sendRefusal(ctx, req as Request, res, error)
    }
  })

  router.get('/deep-linking/return/:code', async (req, res) => {
    const { returnUrl, jwt } = await takeDeepLinkAnswer(ctx, String(req.params.code))
    const nonce = randomBytes(16).toString('base64')
    const ancestors = await frameAncestorsFor(ctx)
    // This page's own policy: its one script, and a form that may post to the platform's return address only.
    res.setHeader(
      'Content-Security-Policy',
      `default-src 'none'; script-src 'nonce-${nonce}'; style-src 'unsafe-inline'; base-uri 'none'; ` +
        `form-action ${new URL(returnUrl).origin}; frame-ancestors ${ancestors}`,
    )
    res.removeHeader('X-Frame-Options')
    res.setHeader('Cache-Control', 'no-store')
    res.type('html').send(autoPostPage(returnUrl, { JWT: jwt }, nonce))
  })

  router.post('/session', limit, validate({ body: launchExchangeRequestSchema }), async (req, res) => {
    sendFramedSession(res, await exchangeLaunchCode(ctx, req.body.code))
  })

  router.post('/session/refresh', cookies, async (req, res) => {
    try {
      sendFramedSession(res, await refreshSession(ctx, framedRefreshToken(req)))
    } catch (error) {
      if (error instanceof SessionEnded) clearFramedSession(res)
      throw error
    }
  })

  router.post('/session/sign-out', cookies, async (req, res) => {
    await endSession(ctx, framedRefreshToken(req))
    clearFramedSession(res)
    res.status(204).end()
  })

  return router
}
