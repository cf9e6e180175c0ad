// OIDC third-party initiated login (LTI Core 1.3 §5.1.1, 1EdTech Security Framework §5.1.1): the platform
// sends the browser here with its issuer and an opaque login hint; Slipway answers with a redirect to the
// platform's authorisation endpoint carrying a fresh state and nonce. The state is bound to the browser by a
// cookie (SameSite=None; Secure; Partitioned) whose hash the login row keeps; see launch.service.ts.
import { randomBytes } from 'node:crypto'
import { LessThan } from 'typeorm'
import { z } from 'zod'
import type { AppContext } from '../context'
import { LtiDeploymentEntity, LtiLoginEntity, LtiPlatformEntity, type LtiPlatformRow } from '../entities'
import { DAY, isoIn, nowIso } from '../infrastructure/clock'
import { hashToken } from '../infrastructure/security/tokens'
import { refuse } from './refusal'
import { toolUrls } from './registration.service'

/** How long a platform has to answer a login with its launch. */
export const LOGIN_TTL_MS = 10 * 60_000

export const loginRequestSchema = z.looseObject({
  iss: z.string().min(1).max(500),
  login_hint: z.string().min(1).max(2000),
  target_link_uri: z.string().min(1).max(2000),
  lti_message_hint: z.string().max(4000).optional(),
  client_id: z.string().max(255).optional(),
  lti_deployment_id: z.string().max(255).optional(),
})
export type LoginRequest = z.infer<typeof loginRequestSchema>

export interface LoginAnswer {
  redirectUrl: string
  /** The browser-binding cookie to set with the redirect. */
  binding: { name: string; value: string; maxAgeMs: number }
}

/** One binding cookie per login, named after its state, so two launches in one browser do not collide. */
export const bindingCookieName = (stateHash: string) => `slipway_lti_${stateHash.slice(0, 16)}`

const random = () => randomBytes(32).toString('base64url')

async function platformFor(ctx: AppContext, iss: string, clientId?: string): Promise<LtiPlatformRow> {
  const candidates = await ctx.dataSource
    .getRepository(LtiPlatformEntity)
    .findBy(clientId ? { issuer: iss, clientId } : { issuer: iss })
  if (candidates.length === 0) {
    throw refuse('unknown_platform', 'This learning platform is not registered with Slipway.', 400)
  }
  if (candidates.length > 1) {
    throw refuse(
      'ambiguous_platform',
      'This platform is registered more than once and did not say which registration it used.',
      400,
    )
  }
  return candidates[0]!
}

export function parseLoginRequest(input: unknown): LoginRequest {
  const parsed = loginRequestSchema.safeParse(input)
  if (!parsed.success) {
    throw refuse(
      'bad_request',
      'The platform sent an incomplete sign-in request (issuer, login hint or target).',
      400,
    )
  }
  return parsed.data
}

export async function initiateLogin(ctx: AppContext, request: LoginRequest): Promise<LoginAnswer> {
  const platform = await platformFor(ctx, request.iss, request.client_id)
  if (request.lti_deployment_id) {
    const known = await ctx.dataSource
      .getRepository(LtiDeploymentEntity)
      .countBy({ platformId: platform.id, deploymentId: request.lti_deployment_id })
    if (!known) throw refuse('unknown_deployment', 'This deployment of Slipway is not registered.', 400)
  }
  // Only Slipway's own launch address: the target is where the browser is sent back to.
  const launchUrl = toolUrls(ctx).launch
  if (!request.target_link_uri.startsWith(ctx.config.publicBaseUrl + '/')) {
    throw refuse('wrong_target', 'The platform asked to open an address that is not Slipway’s.', 400)
  }
  const state = random()
  const nonce = random()
  const binding = random()
  const stateHash = hashToken(state)
  const ds = ctx.dataSource
  // Old logins are useless after they expire; clear a day's worth behind us now and then.
  await ds
    .getRepository(LtiLoginEntity)
    .delete({ expiresAt: LessThan(new Date(Date.now() - DAY).toISOString()) })
  await ds.getRepository(LtiLoginEntity).insert({
    stateHash,
    platformId: platform.id,
    nonce,
    bindingHash: hashToken(binding),
    loginParams: JSON.stringify({
      iss: request.iss,
      login_hint: request.login_hint,
      target_link_uri: request.target_link_uri,
      lti_message_hint: request.lti_message_hint,
      client_id: request.client_id,
      lti_deployment_id: request.lti_deployment_id,
    }),
    expiresAt: isoIn(LOGIN_TTL_MS),
    usedAt: null,
    createdAt: nowIso(),
  })
  const url = new URL(platform.authorizationEndpoint)
  const query: Record<string, string | undefined> = {
    scope: 'openid',
    response_type: 'id_token',
    response_mode: 'form_post',
    prompt: 'none',
    client_id: platform.clientId,
    redirect_uri: launchUrl,
    login_hint: request.login_hint,
    lti_message_hint: request.lti_message_hint,
    state,
    nonce,
  }
  for (const [name, value] of Object.entries(query))
    if (value !== undefined) url.searchParams.set(name, value)
  return {
    redirectUrl: url.toString(),
    binding: { name: bindingCookieName(stateHash), value: binding, maxAgeMs: LOGIN_TTL_MS },
  }
}

/** The login address that starts the same launch again (in a new window when a frame lost the cookie). */
export function loginAgainUrl(ctx: AppContext, loginParams: string): string {
  const url = new URL(toolUrls(ctx).login)
  for (const [name, value] of Object.entries(JSON.parse(loginParams) as Record<string, string | undefined>)) {
    if (value !== undefined) url.searchParams.set(name, value)
  }
  return url.toString()
}
