// The launch (LTI Core 1.3 §5.1.2, the OIDC authentication response): the platform's page posts an ID
// token and the state back to Slipway's launch URL. In order: the state names a login that is known, not
// expired, bound to this browser and not used before (its nonce is spent here, once); the token passes every
// check of launch-verification.ts; then the person, course and activity are matched or created, and the
// browser is handed a one-time code (in the URL fragment, never sent to a server or a Referer) that the
// client swaps for a session (session.service.ts).
import { randomUUID } from 'node:crypto'
import { IsNull } from 'typeorm'
import type { LaunchDestination } from '@shared/api/lti'
import { teaches } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  LtiDeepLinkRequestEntity,
  LtiDeploymentEntity,
  LtiHandoffEntity,
  LtiLoginEntity,
  LtiPlatformEntity,
  LtiResourceLinkEntity,
  ScenarioEntity,
  type CohortRow,
  type LtiContextRow,
  type LtiPlatformRow,
  type UserRow,
} from '../entities'
import { isoIn, nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import { hashToken, newOpaqueToken } from '../infrastructure/security/tokens'
import { ASSIGNMENT_PARAMETER, CLAIM, MESSAGE, SCOPE } from './claims'
import { verifyLaunchToken, type VerifiedLaunch } from './launch-verification'
import { bindingCookieName, loginAgainUrl } from './login.service'
import { accountFor, cohortForCourse, enrol } from './provisioning'
import { refuse } from './refusal'
import { slipwayRoleOf } from './roles'
import { ltiRuntime } from './runtime'

/** How long the client has to swap the hand-over code for a session. */
export const HANDOFF_TTL_MS = 2 * 60_000
/** How long an instructor has to pick an activity after a deep-linking request. */
export const DEEP_LINK_TTL_MS = 60 * 60_000

export interface LaunchForm {
  id_token?: unknown
  state?: unknown
  error?: unknown
  error_description?: unknown
}

export interface LaunchAnswer {
  /** Where the browser goes next: the client's hand-over page with the code in the fragment. */
  redirectUrl: string
  /** The login's binding cookie, spent now. */
  clearCookie: string
}

/** The state's login, bound to this browser, spent once. */
async function spendLogin(ctx: AppContext, form: LaunchForm, cookies: Record<string, unknown>) {
  if (typeof form.error === 'string') {
    // The platform answered the login with an OIDC error (e.g. login_required): nothing to verify.
    throw refuse(
      'bad_request',
      `The platform did not sign you in (${form.error_description ?? form.error}).`,
      400,
    )
  }
  if (typeof form.state !== 'string' || form.state === '') {
    throw refuse('state_missing', 'The launch came without the state of its sign-in.', 400)
  }
  if (typeof form.id_token !== 'string' || form.id_token === '') {
    throw refuse('bad_request', 'The launch came without its signed message.', 400)
  }
  const stateHash = hashToken(form.state)
  const logins = ctx.dataSource.getRepository(LtiLoginEntity)
  const login = await logins.findOneBy({ stateHash })
  if (!login) throw refuse('state_unknown', 'This launch does not answer a sign-in Slipway started.')
  if (login.expiresAt <= nowIso()) {
    throw refuse('state_expired', 'The sign-in took too long. Open the activity again from the course.')
  }
  const cookieName = bindingCookieName(stateHash)
  const binding = cookies[cookieName]
  if (typeof binding !== 'string' || binding === '') {
    // The browser kept no cookie for this frame (third-party cookies blocked): the launch cannot be tied to
    // this browser here, but the same login started in a window of its own can.
    throw Object.assign(
      refuse('state_cookie_missing', 'Your browser did not keep the sign-in check for this launch.'),
      { newWindowUrl: loginAgainUrl(ctx, login.loginParams) },
    )
  }
  if (hashToken(binding) !== login.bindingHash) {
    throw refuse('state_mismatch', 'This launch was started in another browser or window.')
  }
  // Spent atomically: of two posts of the same launch, one wins; the other is a replay.
  const spent = await logins.update({ stateHash, usedAt: IsNull() }, { usedAt: nowIso() })
  if (!spent.affected) {
    throw refuse('nonce_replayed', 'This launch was already used. Open the activity again from the course.')
  }
  return { login, cookieName }
}

export async function handleLaunch(
  ctx: AppContext,
  form: LaunchForm,
  cookies: Record<string, unknown>,
): Promise<LaunchAnswer> {
  const { login, cookieName } = await spendLogin(ctx, form, cookies)
  const ds = ctx.dataSource
  const platform = await findById(ds, LtiPlatformEntity, login.platformId)
  if (!platform) throw refuse('unknown_platform', 'This learning platform is no longer registered.', 400)
  const launch = await verifyLaunchToken({
    idToken: form.id_token as string,
    platform,
    expectedNonce: login.nonce,
    keys: ltiRuntime(ctx).platformKeys,
    isRegisteredDeployment: async (deploymentId) =>
      (await ds.getRepository(LtiDeploymentEntity).countBy({ platformId: platform.id, deploymentId })) > 0,
  })
  const user = await accountFor(ctx, platform, {
    subject: launch.subject,
    role: slipwayRoleOf(launch.claims[CLAIM.roles] ?? []),
    name: launch.claims.name,
    givenName: launch.claims.given_name,
    familyName: launch.claims.family_name,
    email: launch.claims.email,
  })
  if (!user.active) throw refuse('not_allowed', 'Your Slipway account has been deactivated.', 403)
  const destination = await destinationOf(ctx, platform, launch, user)
  await ds.getRepository(LtiPlatformEntity).update({ id: platform.id }, { lastLaunchAt: nowIso() })
  const { token, hash } = newOpaqueToken()
  await ds.getRepository(LtiHandoffEntity).insert({
    codeHash: hash,
    userId: user.id,
    platformId: platform.id,
    destination: JSON.stringify(destination),
    expiresAt: isoIn(HANDOFF_TTL_MS),
    usedAt: null,
    createdAt: nowIso(),
  })
  return { redirectUrl: `${ctx.config.publicBaseUrl}/lti/launch#code=${token}`, clearCookie: cookieName }
}

/** The course's cohort (made by its first instructor) and where this launch leads. */
async function destinationOf(
  ctx: AppContext,
  platform: LtiPlatformRow,
  launch: VerifiedLaunch,
  user: UserRow,
): Promise<LaunchDestination> {
  const claims = launch.claims
  const course = claims[CLAIM.context]!
  const ags = claims[CLAIM.agsEndpoint]
  const { cohort, context } = await cohortForCourse(
    ctx,
    platform,
    {
      contextId: course.id,
      title: course.title,
      label: course.label,
      membershipsUrl: claims[CLAIM.nrps]?.context_memberships_url,
      lineItemsUrl: ags?.lineitems,
      agsScopes: ags?.scope,
    },
    user,
  )
  if (user.role === 'apprentice') await enrol(ctx, cohort.id, user.id)

  if (launch.messageType === MESSAGE.deepLinkingRequest) {
    if (user.role === 'apprentice') {
      throw refuse('not_allowed', 'Only the course’s instructors can add Slipway activities.', 403)
    }
    const settings = claims[CLAIM.deepLinkingSettings]!
    const id = randomUUID()
    await ctx.dataSource.getRepository(LtiDeepLinkRequestEntity).insert({
      id,
      platformId: platform.id,
      deploymentId: launch.deploymentId,
      contextRowId: context.id,
      userId: user.id,
      returnUrl: settings.deep_link_return_url,
      data: settings.data ?? null,
      returnCodeHash: null,
      responseJwt: null,
      expiresAt: isoIn(DEEP_LINK_TTL_MS),
      respondedAt: null,
      createdAt: nowIso(),
    })
    return { kind: 'deepLinking', requestId: id }
  }

  const assignmentId = await assignmentOfActivity(ctx, launch, context, cohort)
  if (user.role !== 'apprentice') {
    if (user.role === 'instructor' && !(await teaches(ctx.dataSource, cohort, user.id))) {
      return {
        kind: 'notReady',
        message:
          'This course’s cohort in Slipway belongs to another instructor. Ask them, or a Slipway admin, to hand it over.',
      }
    }
    return { kind: 'cohort', cohortId: cohort.id }
  }
  if (!assignmentId) {
    return {
      kind: 'notReady',
      message: 'This activity is not linked to a Slipway exercise yet. Tell your instructor.',
    }
  }
  const assignment = (await findById(ctx.dataSource, AssignmentEntity, assignmentId))!
  const scenario = await findById(ctx.dataSource, ScenarioEntity, assignment.scenarioId)
  if (!scenario) throw new Error(`assignment ${assignment.id} names a missing scenario version`)
  return { kind: 'exercise', assignmentId, scenarioKey: scenario.key, scenarioVersion: scenario.version }
}

/**
 * The assignment an activity (resource link) opens: recorded at its first launch, from the custom parameter
 * the deep-linking answer gave it. An assignment of another course is never opened through it.
 */
async function assignmentOfActivity(
  ctx: AppContext,
  launch: VerifiedLaunch,
  context: LtiContextRow,
  cohort: CohortRow,
): Promise<string | null> {
  const ds = ctx.dataSource
  const links = ds.getRepository(LtiResourceLinkEntity)
  const resourceLinkId = launch.claims[CLAIM.resourceLink]!.id
  const ags = launch.claims[CLAIM.agsEndpoint]
  // The launch's own line item, when the platform made one (from the deep-linking answer's lineItem).
  const lineItemUrl = ags?.lineitem && ags.scope.includes(SCOPE.score) ? ags.lineitem : undefined
  const existing = await links.findOneBy({ contextRowId: context.id, resourceLinkId })
  if (existing) {
    if (lineItemUrl && lineItemUrl !== existing.lineItemUrl) {
      await links.update({ id: existing.id }, { lineItemUrl, updatedAt: nowIso() })
    }
    return existing.assignmentId
  }
  const named = launch.claims[CLAIM.custom]?.[ASSIGNMENT_PARAMETER]
  if (typeof named !== 'string') return null
  const assignment = await ds.getRepository(AssignmentEntity).findOneBy({ id: named })
  if (!assignment || assignment.cohortId !== cohort.id) return null
  try {
    await links.insert({
      id: randomUUID(),
      contextRowId: context.id,
      resourceLinkId,
      assignmentId: assignment.id,
      lineItemUrl: lineItemUrl ?? null,
      createdAt: nowIso(),
      updatedAt: nowIso(),
    })
  } catch (error) {
    // The activity's first two launches at once: the other recorded it.
    if (!(await links.countBy({ contextRowId: context.id, resourceLinkId }))) throw error
  }
  return assignment.id
}
