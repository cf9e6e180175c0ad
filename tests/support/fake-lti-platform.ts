// A learning platform played by the tests (never shipped): its own RSA keys and key set, the OIDC
// authorisation endpoint that answers a login with a signed launch (an auto-submitted form, as a platform's
// page does), a page that shows a course activity in an iframe, the deep-linking return address, a token
// endpoint (client credentials with a signed JWT assertion, checked against Slipway's published key set),
// and line-item, score and membership endpoints. Everything it receives is recorded for the tests to read.
import { randomUUID } from 'node:crypto'
import type { Server } from 'node:http'
import express from 'express'
import {
  createLocalJWKSet,
  exportJWK,
  generateKeyPair,
  jwtVerify,
  SignJWT,
  type CryptoKey,
  type JSONWebKeySet,
  type JWK,
  type JWTPayload,
} from 'jose'

const LTI = 'https://purl.imsglobal.org/spec/lti/claim/'
export const ROLE = {
  learner: 'http://purl.imsglobal.org/vocab/lis/v2/membership#Learner',
  instructor: 'http://purl.imsglobal.org/vocab/lis/v2/membership#Instructor',
}
const SCOPES = {
  lineItem: 'https://purl.imsglobal.org/spec/lti-ags/scope/lineitem',
  score: 'https://purl.imsglobal.org/spec/lti-ags/scope/score',
  memberships: 'https://purl.imsglobal.org/spec/lti-nrps/scope/contextmembership.readonly',
}

export interface FakePerson {
  sub: string
  name?: string
  email?: string
  roles: string[]
  status?: 'Active' | 'Inactive'
}

export interface FakeLaunchSpec {
  person: string // sub
  messageType?: 'LtiResourceLinkRequest' | 'LtiDeepLinkingRequest'
  resourceLinkId?: string
  custom?: Record<string, string>
  /** Line item URL the launch names (the platform made one from a deep-linking answer). */
  lineItem?: string
}

interface SigningKey {
  kid: string
  privateKey: CryptoKey
  publicJwk: JWK
}

async function newKey(): Promise<SigningKey> {
  const { privateKey, publicKey } = await generateKeyPair('RS256', { extractable: true })
  const kid = randomUUID()
  return { kid, privateKey, publicJwk: { ...(await exportJWK(publicKey)), kid, alg: 'RS256', use: 'sig' } }
}

export interface RecordedScore {
  lineItemId: string
  userId: string
  scoreGiven: number
  scoreMaximum: number
  timestamp: string
  activityProgress: string
  gradingProgress: string
}

export interface FakePlatformOptions {
  /** Slipway's public key set, to check its client assertions and deep-linking answers. */
  toolKeySet: () => Promise<JSONWebKeySet>
  /** Slipway's address, for the course page's iframe. */
  toolUrl?: string
  clientId?: string
  deploymentId?: string
}

export class FakeLtiPlatform {
  readonly clientId: string
  readonly deploymentId: string
  readonly contextId = 'course-wiring-101'
  readonly contextTitle = 'Drive Wiring 101 (Kestrel Vale, spring)'
  url = ''
  people = new Map<string, FakePerson>()
  /** Every score posted, in order. */
  scores: RecordedScore[] = []
  /** Line items: id → body. */
  lineItems = new Map<string, Record<string, unknown>>()
  tokenRequests: { scope: string; ok: boolean }[] = []
  /** Activities made from deep-linking answers: resource link id → its custom parameters. */
  activities = new Map<string, { title: string; custom: Record<string, string> }>()
  /** Deep-linking answers received (verified payloads). */
  deepLinkAnswers: JWTPayload[] = []
  /** How many score posts to refuse with 503 before accepting (to test retries). */
  failNextScores = 0
  private keys: SigningKey[] = []
  private server?: Server
  private issuedTokens = new Map<string, string>() // access token → scope

  constructor(private readonly options: FakePlatformOptions) {
    this.clientId = options.clientId ?? 'slipway-client-7731'
    this.deploymentId = options.deploymentId ?? 'deployment-1'
  }

  get issuer() {
    return this.url
  }
  get registration() {
    return {
      name: 'Harbour Learning (test platform)',
      issuer: this.issuer,
      clientId: this.clientId,
      deploymentIds: [this.deploymentId],
      authorizationEndpoint: `${this.url}/auth`,
      tokenEndpoint: `${this.url}/token`,
      jwksUrl: `${this.url}/jwks`,
    }
  }
  get currentKid() {
    return this.keys[0]!.kid
  }
  membershipsUrl() {
    return `${this.url}/courses/${this.contextId}/memberships`
  }
  lineItemsUrl() {
    return `${this.url}/courses/${this.contextId}/lineitems`
  }

  addPerson(person: FakePerson) {
    this.people.set(person.sub, person)
    return person
  }

  /** A new published key that signs from now on; the old one stays published. */
  async rotateKey() {
    this.keys.unshift(await newKey())
  }

  /** The claims of a launch, as this platform would send them (before nonce and times). */
  launchClaims(spec: FakeLaunchSpec): JWTPayload {
    const person = this.people.get(spec.person)
    if (!person) throw new Error(`no person ${spec.person}`)
    const messageType = spec.messageType ?? 'LtiResourceLinkRequest'
    const claims: JWTPayload = {
      iss: this.issuer,
      aud: this.clientId,
      sub: person.sub,
      ...(person.name ? { name: person.name } : {}),
      ...(person.email ? { email: person.email } : {}),
      [`${LTI}message_type`]: messageType,
      [`${LTI}version`]: '1.3.0',
      [`${LTI}deployment_id`]: this.deploymentId,
      [`${LTI}target_link_uri`]: `${this.options.toolUrl ?? 'http://slipway.test'}/api/lti/launch`,
      [`${LTI}roles`]: person.roles,
      [`${LTI}context`]: { id: this.contextId, title: this.contextTitle, label: 'DW101' },
      [`${LTI}tool_platform`]: { guid: 'harbour-test', name: 'Harbour Learning' },
      'https://purl.imsglobal.org/spec/lti-nrps/claim/namesroleservice': {
        context_memberships_url: this.membershipsUrl(),
        service_versions: ['2.0'],
      },
      'https://purl.imsglobal.org/spec/lti-ags/claim/endpoint': {
        scope: [SCOPES.lineItem, SCOPES.score],
        lineitems: this.lineItemsUrl(),
        ...(spec.lineItem ? { lineitem: spec.lineItem } : {}),
      },
    }
    if (messageType === 'LtiDeepLinkingRequest') {
      claims['https://purl.imsglobal.org/spec/lti-dl/claim/deep_linking_settings'] = {
        deep_link_return_url: `${this.url}/deep-link-return`,
        accept_types: ['ltiResourceLink'],
        accept_presentation_document_targets: ['iframe', 'window'],
        accept_multiple: false,
        data: 'opaque-platform-data-42',
      }
    } else {
      claims[`${LTI}resource_link`] = {
        id: spec.resourceLinkId ?? 'activity-1',
        title: 'Commissioning exercise',
      }
      if (spec.custom) claims[`${LTI}custom`] = spec.custom
    }
    return claims
  }

  /** Signs claims as an ID token (now-based iat/exp unless given), with the current key or another. */
  async sign(claims: JWTPayload, options: { key?: SigningKey; kid?: string } = {}): Promise<string> {
    const key = options.key ?? this.keys[0]!
    const now = Math.floor(Date.now() / 1000)
    return new SignJWT({ iat: now, exp: now + 300, ...claims })
      .setProtectedHeader({ alg: 'RS256', kid: options.kid ?? key.kid, typ: 'JWT' })
      .sign(key.privateKey)
  }

  /** A key pair the platform never published (for wrong-signature and unknown-key tests). */
  unpublishedKey(): Promise<SigningKey> {
    return newKey()
  }

  private async verifyToolJwt(token: string, audience: string) {
    const keySet = createLocalJWKSet(await this.options.toolKeySet())
    return (await jwtVerify(token, keySet, { audience, algorithms: ['RS256'] })).payload
  }

  private bearerScope(header: string | undefined): string | undefined {
    return header?.startsWith('Bearer ') ? this.issuedTokens.get(header.slice(7)) : undefined
  }

  async start(): Promise<void> {
    this.keys = [await newKey()]
    const app = express()
    app.use(express.urlencoded({ extended: false }))
    app.use(express.json({ type: ['application/json', 'application/*+json'] }))

    app.get('/jwks', (_req, res) => {
      res.json({ keys: this.keys.map((k) => k.publicJwk) })
    })

    // A course page showing an activity: the iframe starts Slipway's login (third-party initiated login).
    app.get('/course', (req, res) => {
      const resourceLinkId = String(req.query.link ?? 'activity-1')
      const spec: FakeLaunchSpec = {
        person: String(req.query.person),
        resourceLinkId,
        custom: this.activities.get(resourceLinkId)?.custom,
        messageType: req.query.deepLink ? 'LtiDeepLinkingRequest' : undefined,
      }
      const login = new URL(`${this.options.toolUrl}/api/lti/login`)
      login.searchParams.set('iss', this.issuer)
      login.searchParams.set('login_hint', spec.person)
      login.searchParams.set('target_link_uri', `${this.options.toolUrl}/api/lti/launch`)
      login.searchParams.set('lti_message_hint', Buffer.from(JSON.stringify(spec)).toString('base64url'))
      login.searchParams.set('client_id', this.clientId)
      login.searchParams.set('lti_deployment_id', this.deploymentId)
      res.type('html')
        .send(`<!doctype html><html><head><meta name="viewport" content="width=device-width,initial-scale=1">
<title>Harbour Learning — ${this.contextTitle}</title><style>body{margin:0;font-family:sans-serif;background:#eef1ee}
header{background:#2d4a3e;color:#fff;padding:.6rem 1rem;font-size:1rem}iframe{display:block;border:0;width:100%;height:calc(100vh - 2.6rem)}</style></head>
<body><header>Harbour Learning · ${this.contextTitle}</header>
<iframe id="tool" title="Slipway activity" src="${login}" allow="fullscreen"></iframe></body></html>`)
    })

    // OIDC authorisation endpoint: answers with the launch as an auto-submitted form (response_mode=form_post).
    app.get('/auth', async (req, res) => {
      const q = req.query as Record<string, string>
      const spec = JSON.parse(
        Buffer.from(q.lti_message_hint ?? '', 'base64url').toString() || '{}',
      ) as FakeLaunchSpec
      if (
        q.client_id !== this.clientId ||
        !q.redirect_uri ||
        !q.state ||
        !q.nonce ||
        q.response_mode !== 'form_post'
      ) {
        res.status(400).send('bad authorisation request')
        return
      }
      const idToken = await this.sign({
        ...this.launchClaims({ ...spec, lineItem: this.lineItemFor(spec) }),
        nonce: q.nonce,
      })
      res.type('html').send(`<!doctype html><html><body><form id="f" method="post" action="${q.redirect_uri}">
<input type="hidden" name="id_token" value="${idToken}"><input type="hidden" name="state" value="${q.state}"></form>
<script>document.getElementById('f').submit()</script></body></html>`)
    })

    app.post('/deep-link-return', async (req, res) => {
      try {
        const payload = await this.verifyToolJwt(String(req.body.JWT), this.issuer)
        this.deepLinkAnswers.push(payload)
        // As a platform does: each resource link becomes an activity, with a gradebook column if asked for.
        type Item = { title: string; custom?: Record<string, string>; lineItem?: { label: string } }
        for (const item of (payload['https://purl.imsglobal.org/spec/lti-dl/claim/content_items'] ??
          []) as Item[]) {
          const resourceLinkId = `activity-${this.activities.size + 1}`
          this.activities.set(resourceLinkId, { title: item.title, custom: item.custom ?? {} })
          if (item.lineItem) this.createLineItem(resourceLinkId, item.lineItem.label)
        }
        res
          .type('html')
          .send('<!doctype html><html><body><h1>Activity added to the course</h1></body></html>')
      } catch (error) {
        res.status(400).send(`deep-linking answer refused: ${(error as Error).message}`)
      }
    })

    app.post('/token', async (req, res) => {
      const body = req.body as Record<string, string>
      try {
        if (body.grant_type !== 'client_credentials') throw new Error('grant_type')
        if (body.client_assertion_type !== 'urn:ietf:params:oauth:client-assertion-type:jwt-bearer') {
          throw new Error('client_assertion_type')
        }
        const claims = await this.verifyToolJwt(body.client_assertion ?? '', `${this.url}/token`)
        if (claims.iss !== this.clientId || claims.sub !== this.clientId) throw new Error('iss/sub')
        const allowed = new Set(Object.values(SCOPES))
        const scope = (body.scope ?? '')
          .split(' ')
          .filter((s) => allowed.has(s))
          .join(' ')
        const token = randomUUID()
        this.issuedTokens.set(token, scope)
        this.tokenRequests.push({ scope, ok: true })
        res.json({ access_token: token, token_type: 'Bearer', expires_in: 3600, scope })
      } catch (error) {
        this.tokenRequests.push({ scope: body.scope ?? '', ok: false })
        res.status(401).json({ error: 'invalid_client', error_description: (error as Error).message })
      }
    })

    const courseUrl = `/courses/${this.contextId}`
    app.get(`${courseUrl}/lineitems`, (req, res) => {
      if (!this.bearerScope(req.headers.authorization)?.includes(SCOPES.lineItem))
        return void res.status(401).end()
      const link = req.query.resource_link_id
      res
        .type('application/vnd.ims.lis.v2.lineitemcontainer+json')
        .send([...this.lineItems.values()].filter((item) => !link || item.resourceLinkId === link))
    })
    app.post(`${courseUrl}/lineitems`, (req, res) => {
      if (!this.bearerScope(req.headers.authorization)?.includes(SCOPES.lineItem))
        return void res.status(401).end()
      const id = `${this.url}${courseUrl}/lineitems/${randomUUID()}`
      const item = { ...(req.body as Record<string, unknown>), id }
      this.lineItems.set(id, item)
      res.status(201).type('application/vnd.ims.lis.v2.lineitem+json').send(item)
    })
    app.post(`${courseUrl}/lineitems/:item/scores`, (req, res) => {
      if (!this.bearerScope(req.headers.authorization)?.includes(SCOPES.score))
        return void res.status(401).end()
      if (req.headers['content-type'] !== 'application/vnd.ims.lis.v1.score+json')
        return void res.status(415).end()
      if (this.failNextScores > 0) {
        this.failNextScores--
        return void res.status(503).end()
      }
      this.scores.push({
        lineItemId: `${this.url}${courseUrl}/lineitems/${req.params.item}`,
        ...(req.body as Omit<RecordedScore, 'lineItemId'>),
      })
      res.status(204).end()
    })
    app.get(`${courseUrl}/memberships`, (req, res) => {
      if (!this.bearerScope(req.headers.authorization)?.includes(SCOPES.memberships))
        return void res.status(401).end()
      // Two members a page, so Slipway has to follow the Link header (NRPS 2.0 §2.4.2).
      const all = [...this.people.values()]
      const page = Number(req.query.page ?? 1)
      const members = all.slice((page - 1) * 2, page * 2).map((p) => ({
        user_id: p.sub,
        status: p.status ?? 'Active',
        roles: p.roles,
        ...(p.name ? { name: p.name } : {}),
        ...(p.email ? { email: p.email } : {}),
      }))
      if (page * 2 < all.length)
        res.setHeader('Link', `<${this.membershipsUrl()}?page=${page + 1}>; rel="next"`)
      res.type('application/vnd.ims.lti-nrps.v2.membershipcontainer+json').send({
        id: this.membershipsUrl(),
        context: { id: this.contextId, title: this.contextTitle },
        members,
      })
    })

    await new Promise<void>((resolve) => {
      this.server = app.listen(0, '127.0.0.1', () => resolve())
    })
    const address = this.server!.address()
    this.url = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`
  }

  /** The line item a launch names: the one made for its activity, if any. */
  private lineItemFor(spec: FakeLaunchSpec): string | undefined {
    return [...this.lineItems.values()].find((item) => item.resourceLinkId === spec.resourceLinkId)?.id as
      string | undefined
  }

  /** Makes the line item a platform creates from a deep-linking answer's lineItem, for an activity. */
  createLineItem(resourceLinkId: string, label: string): string {
    const id = `${this.url}/courses/${this.contextId}/lineitems/${randomUUID()}`
    this.lineItems.set(id, { id, resourceLinkId, label, scoreMaximum: 100 })
    return id
  }

  async stop(): Promise<void> {
    await new Promise<void>((resolve) => (this.server ? this.server.close(() => resolve()) : resolve()))
  }
}
