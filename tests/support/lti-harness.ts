// Driving Slipway's LTI routes as a platform's browser would, through supertest: register the fake platform,
// start a login (collecting the state, nonce and binding cookie), post a signed launch, swap the code.
import supertest from 'supertest'
import type { JWTPayload } from 'jose'
import type { LaunchSession, Platform } from '../../shared/api/lti'
import { bearer, type TestApi, type TestUser } from './api-harness'
import { FakeLtiPlatform, type FakeLaunchSpec } from './fake-lti-platform'

export const TOOL_URL = 'http://slipway.test'
export const LAUNCH_URL = `${TOOL_URL}/api/lti/launch`

export async function startFakePlatform(api: TestApi): Promise<FakeLtiPlatform> {
  const platform = new FakeLtiPlatform({
    toolKeySet: async () => (await supertest(api.app).get('/api/lti/jwks')).body,
    toolUrl: TOOL_URL,
  })
  await platform.start()
  return platform
}

export async function registerPlatform(
  api: TestApi,
  admin: TestUser,
  platform: FakeLtiPlatform,
): Promise<Platform> {
  const response = await supertest(api.app)
    .post('/api/lti/platforms')
    .set(bearer(admin.token))
    .send(platform.registration)
  if (response.status !== 201) throw new Error(`registration failed: ${response.status} ${response.text}`)
  return response.body as Platform
}

export interface StartedLogin {
  state: string
  nonce: string
  /** `name=value` of the binding cookie. */
  cookie: string
  redirect: URL
}

export async function startLogin(
  api: TestApi,
  platform: FakeLtiPlatform,
  query: Record<string, string> = {},
): Promise<StartedLogin> {
  const response = await supertest(api.app)
    .get('/api/lti/login')
    .query({
      iss: platform.issuer,
      login_hint: 'opaque-hint',
      target_link_uri: LAUNCH_URL,
      client_id: platform.clientId,
      lti_deployment_id: platform.deploymentId,
      ...query,
    })
  if (response.status !== 302) throw new Error(`login failed: ${response.status} ${response.text}`)
  const redirect = new URL(response.headers.location!)
  const cookie = ([] as string[]).concat(response.headers['set-cookie'] ?? [])[0]!.split(';')[0]!
  return {
    state: redirect.searchParams.get('state')!,
    nonce: redirect.searchParams.get('nonce')!,
    cookie,
    redirect,
  }
}

export function postLaunch(api: TestApi, form: Record<string, string>, cookie?: string) {
  // As a browser posts the platform's form: it asks for a page.
  const request = supertest(api.app).post('/api/lti/launch').type('form').set('Accept', 'text/html')
  if (cookie) request.set('Cookie', cookie)
  return request.send(form)
}

/** A whole launch: login, the platform's signed message (claims changed as given), the post. */
export async function launch(
  api: TestApi,
  platform: FakeLtiPlatform,
  spec: FakeLaunchSpec,
  change: (claims: JWTPayload) => JWTPayload = (c) => c,
) {
  const login = await startLogin(api, platform)
  const idToken = await platform.sign(change({ ...platform.launchClaims(spec), nonce: login.nonce }))
  return postLaunch(api, { id_token: idToken, state: login.state }, login.cookie)
}

/** The hand-over code of a successful launch's redirect. */
export function codeOf(response: supertest.Response): string {
  if (response.status !== 303)
    throw new Error(`launch refused: ${response.status} ${response.headers['x-slipway-lti-refusal']}`)
  const location = new URL(response.headers.location!)
  return new URLSearchParams(location.hash.slice(1)).get('code')!
}

export async function launchSession(
  api: TestApi,
  platform: FakeLtiPlatform,
  spec: FakeLaunchSpec,
): Promise<{ session: LaunchSession; refreshCookie: string; setCookie: string }> {
  const code = codeOf(await launch(api, platform, spec))
  const response = await supertest(api.app).post('/api/lti/session').send({ code })
  if (response.status !== 200) throw new Error(`code exchange failed: ${response.status} ${response.text}`)
  const setCookie = ([] as string[]).concat(response.headers['set-cookie'] ?? [])[0]!
  return { session: response.body as LaunchSession, refreshCookie: setCookie.split(';')[0]!, setCookie }
}
