// Verifying a launch's ID token, step by step as the 1EdTech Security Framework 1.0 §5.1.3 ("Authentication
// Response Validation") and LTI Core 1.3 §5.3 list them. jose does the cryptography (the compact JWS
// signature); every claim rule is written out here, each with its own refusal. The state and its browser
// binding are checked before this (launch.service.ts): they say which login, and so which platform, this is.
import { compactVerify, decodeProtectedHeader, errors as joseErrors } from 'jose'
import type { LtiPlatformRow } from '../entities'
import { CLAIM, idTokenSchema, LTI_VERSION, MESSAGE, type IdToken } from './claims'
import { PlatformKeyError, type PlatformKeyCache } from './platform-keys'
import { refuse } from './refusal'

/** Allowed difference between the platform's clock and ours (common practice: a minute). */
export const CLOCK_SKEW_SECONDS = 60
/** An ID token issued longer ago than this is refused even if it has not expired (common practice). */
export const MAX_TOKEN_AGE_SECONDS = 10 * 60
/** Security Framework §5.1.3 step 5: RS256 is the default, and the only one Slipway accepts. */
export const ALLOWED_ALGORITHMS = ['RS256']

export type LaunchMessageType = typeof MESSAGE.resourceLink | typeof MESSAGE.deepLinkingRequest

export interface VerifiedLaunch {
  claims: IdToken
  messageType: LaunchMessageType
  deploymentId: string
  subject: string
}

export interface VerifyLaunchInput {
  idToken: string
  platform: LtiPlatformRow
  /** The nonce Slipway sent in the authorisation request of this login. */
  expectedNonce: string
  isRegisteredDeployment(deploymentId: string): Promise<boolean>
  keys: PlatformKeyCache
  /** Seconds since the epoch (default now). */
  now?: number
}

export async function verifyLaunchToken(input: VerifyLaunchInput): Promise<VerifiedLaunch> {
  const { idToken, platform } = input
  const now = input.now ?? Math.floor(Date.now() / 1000)

  // Step 1: the signature, with the key the header names, from the platform's published key set.
  let header: ReturnType<typeof decodeProtectedHeader>
  try {
    header = decodeProtectedHeader(idToken)
  } catch {
    throw refuse('token_malformed', 'The launch message is not a signed token.', 400)
  }
  if (!header.alg || !ALLOWED_ALGORITHMS.includes(header.alg)) {
    throw refuse('wrong_algorithm', 'The launch message is signed with an algorithm Slipway does not accept.')
  }
  if (!header.kid) throw refuse('unknown_key', 'The launch message does not say which key signed it.')
  let key: Awaited<ReturnType<PlatformKeyCache['key']>>
  try {
    key = await input.keys.key(platform.jwksUrl, header.kid, header.alg)
  } catch (error) {
    if (error instanceof PlatformKeyError) {
      throw error.reason === 'unknown_key'
        ? refuse('unknown_key', 'The launch message is signed with a key the platform does not publish.')
        : refuse(
            'key_set_unavailable',
            'Slipway could not read the platform’s published keys. Try again shortly.',
            502,
          )
    }
    throw error
  }
  let payload: Uint8Array
  try {
    payload = (await compactVerify(idToken, key, { algorithms: ALLOWED_ALGORITHMS })).payload
  } catch (error) {
    if (error instanceof joseErrors.JWSSignatureVerificationFailed) {
      throw refuse('wrong_signature', 'The launch message’s signature does not match the platform’s key.')
    }
    throw refuse('token_malformed', 'The launch message could not be read.', 400)
  }
  let parsed: ReturnType<typeof idTokenSchema.safeParse>
  try {
    parsed = idTokenSchema.safeParse(JSON.parse(new TextDecoder().decode(payload)))
  } catch {
    throw refuse('token_malformed', 'The launch message could not be read.', 400)
  }
  if (!parsed.success) throw refuse('token_malformed', 'The launch message lacks required parts.', 400)
  const claims = parsed.data

  // Step 2: the issuer is exactly the registered platform's.
  if (claims.iss !== platform.issuer) {
    throw refuse('wrong_issuer', 'The launch message comes from a different platform than the sign-in did.')
  }
  // Step 3: the audience includes Slipway's client id; step 4: with several audiences the authorised party
  // must be present, and whenever present it must be Slipway's client id.
  const audiences = typeof claims.aud === 'string' ? [claims.aud] : claims.aud
  if (!audiences.includes(platform.clientId)) {
    throw refuse('wrong_audience', 'The launch message is addressed to another tool.')
  }
  if (
    (audiences.length > 1 && claims.azp === undefined) ||
    (claims.azp !== undefined && claims.azp !== platform.clientId)
  ) {
    throw refuse('wrong_authorised_party', 'The launch message names another tool as its authorised party.')
  }
  // Step 6: not expired; step 7: issued recently (both with a small allowance for clock differences).
  if (now - CLOCK_SKEW_SECONDS >= claims.exp) {
    throw refuse('expired', 'The launch message has expired. Open the activity again from the course.')
  }
  if (claims.iat > now + CLOCK_SKEW_SECONDS || claims.iat < now - MAX_TOKEN_AGE_SECONDS) {
    throw refuse('issued_at_out_of_range', 'The launch message’s issue time is too far from now.')
  }
  if (claims.nbf !== undefined && claims.nbf > now + CLOCK_SKEW_SECONDS) {
    throw refuse('not_yet_valid', 'The launch message is not valid yet.')
  }
  // Step 8: the nonce is the one sent with this login (whose single use the login row records).
  if (claims.nonce !== input.expectedNonce) {
    throw refuse('nonce_mismatch', 'The launch message does not answer this sign-in.')
  }

  // LTI Core §5.3: message type, version, deployment, and the claims each message type requires.
  const messageType = claims[CLAIM.messageType]
  if (messageType !== MESSAGE.resourceLink && messageType !== MESSAGE.deepLinkingRequest) {
    throw refuse('wrong_message_type', 'Slipway does not handle this kind of launch message.', 400)
  }
  if (claims[CLAIM.version] !== LTI_VERSION) {
    throw refuse(
      'wrong_version',
      `Slipway speaks LTI ${LTI_VERSION}; the platform sent another version.`,
      400,
    )
  }
  const deploymentId = claims[CLAIM.deploymentId]
  if (!deploymentId || !(await input.isRegisteredDeployment(deploymentId))) {
    throw refuse('unknown_deployment', 'This deployment of Slipway is not registered.', 403)
  }
  if (!claims.sub) {
    throw refuse('anonymous_launch', 'The platform did not say who is launching; Slipway needs to know.', 400)
  }
  if (!claims[CLAIM.roles]) throw refuse('missing_claim', 'The launch message lists no roles.', 400)
  if (messageType === MESSAGE.resourceLink && !claims[CLAIM.resourceLink]) {
    throw refuse('missing_claim', 'The launch message names no activity (resource link).', 400)
  }
  if (messageType === MESSAGE.deepLinkingRequest) {
    const settings = claims[CLAIM.deepLinkingSettings]
    if (!settings) throw refuse('missing_claim', 'The deep-linking request has no settings.', 400)
    if (!settings.accept_types.includes('ltiResourceLink')) {
      throw refuse('missing_claim', 'The platform does not accept activities (resource links) here.', 400)
    }
  }
  if (!claims[CLAIM.context]) {
    throw refuse(
      'missing_claim',
      'The launch message names no course (context); Slipway needs one for a cohort.',
      400,
    )
  }
  return { claims, messageType, deploymentId, subject: claims.sub }
}
