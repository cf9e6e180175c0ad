// Deep linking (LTI Deep Linking 2.0): an instructor adding an activity in the platform picks a Slipway
// scenario with its window, attempt allowance and score policy; Slipway sets the assignment in the course's
// cohort and answers with a signed LtiDeepLinkingResponse holding one resource link, whose custom parameter
// names the assignment and whose lineItem asks the platform for a gradebook column. The answer reaches the
// platform as a form the browser posts from a page of Slipway's (returnPage).
import { randomBytes } from 'node:crypto'
import { IsNull } from 'typeorm'
import type { DeepLinkingChoice, DeepLinkingRequest, DeepLinkingResult } from '@shared/api/lti'
import { createAssignment } from '../assignments/assignments.service'
import type { AppContext } from '../context'
import {
  LtiContextEntity,
  LtiDeepLinkRequestEntity,
  LtiPlatformEntity,
  type LtiDeepLinkRequestRow,
  type UserRow,
} from '../entities'
import { forbidden, HttpError, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import { hashToken, newOpaqueToken } from '../infrastructure/security/tokens'
import { ASSIGNMENT_PARAMETER, CLAIM, LTI_VERSION, MESSAGE } from './claims'
import { SCORE_MAXIMUM } from './passback.service'
import { toolUrls } from './registration.service'
import { signWithToolKey } from './tool-keys'

/** The answer is posted right away; a platform refuses one much older than this. */
const RESPONSE_TTL_SECONDS = 10 * 60

async function openRequest(ctx: AppContext, user: UserRow, id: string): Promise<LtiDeepLinkRequestRow> {
  const request = await findById(ctx.dataSource, LtiDeepLinkRequestEntity, id)
  if (!request) throw notFound('Activity request')
  if (request.userId !== user.id && user.role !== 'admin') {
    throw forbidden('This activity is being added by another instructor')
  }
  if (request.respondedAt || request.returnCodeHash) {
    throw new HttpError(409, 'conflict', 'This activity has already been added. Add another from the course.')
  }
  if (request.expiresAt <= nowIso()) {
    throw new HttpError(
      409,
      'conflict',
      'This request has expired. Start adding the activity again from the course.',
    )
  }
  return request
}

export async function getDeepLinkRequest(
  ctx: AppContext,
  user: UserRow,
  id: string,
): Promise<DeepLinkingRequest> {
  const request = await openRequest(ctx, user, id)
  const platform = await findById(ctx.dataSource, LtiPlatformEntity, request.platformId)
  const context = await findById(ctx.dataSource, LtiContextEntity, request.contextRowId)
  return {
    id: request.id,
    platformName: platform?.name ?? '',
    courseTitle: context?.title ?? '',
    cohortId: context!.cohortId,
    expiresAt: request.expiresAt,
  }
}

export async function answerDeepLink(
  ctx: AppContext,
  user: UserRow,
  id: string,
  choice: Required<Pick<DeepLinkingChoice, 'scorePolicy'>> & DeepLinkingChoice,
): Promise<DeepLinkingResult> {
  const ds = ctx.dataSource
  const request = await openRequest(ctx, user, id)
  const platform = (await findById(ds, LtiPlatformEntity, request.platformId))!
  const context = (await findById(ds, LtiContextEntity, request.contextRowId))!
  const assignment = await createAssignment(ctx, user, context.cohortId, {
    scenarioId: choice.scenarioId,
    title: choice.title,
    opensAt: choice.opensAt,
    dueAt: choice.dueAt,
    attemptLimit: choice.attemptLimit,
    assistanceLevel: choice.assistanceLevel,
    hintsAllowed: choice.hintsAllowed,
    scorePolicy: choice.scorePolicy,
    // The course's own gradebook keeps its late rules; Slipway accepts late work without a penalty.
    latePolicy: 'acceptLate',
    latePenalty: 0,
  })
  const contentItem = {
    type: 'ltiResourceLink',
    title: assignment.title,
    text: `A Slipway exercise${assignment.attemptLimit ? `, ${assignment.attemptLimit} attempt(s) allowed` : ''}.`,
    url: toolUrls(ctx).launch,
    custom: { [ASSIGNMENT_PARAMETER]: assignment.id },
    lineItem: {
      scoreMaximum: SCORE_MAXIMUM,
      label: assignment.title,
      resourceId: assignment.id,
      tag: 'slipway',
    },
    available: { startDateTime: assignment.opensAt },
    submission: { endDateTime: assignment.dueAt },
  }
  const jwt = await signWithToolKey(
    ds,
    {
      iss: platform.clientId,
      aud: platform.issuer,
      nonce: randomBytes(16).toString('base64url'),
      [CLAIM.messageType]: MESSAGE.deepLinkingResponse,
      [CLAIM.version]: LTI_VERSION,
      [CLAIM.deploymentId]: request.deploymentId,
      [CLAIM.contentItems]: [contentItem],
      ...(request.data !== null ? { [CLAIM.deepLinkingData]: request.data } : {}),
    },
    RESPONSE_TTL_SECONDS,
  )
  const { token, hash } = newOpaqueToken()
  await ds
    .getRepository(LtiDeepLinkRequestEntity)
    .update({ id: request.id }, { returnCodeHash: hash, responseJwt: jwt })
  return {
    returnPageUrl: `${ctx.config.publicBaseUrl}/api/lti/deep-linking/return/${token}`,
    assignmentId: assignment.id,
  }
}

/** The signed answer and where to post it, once: the page that posts it spends the code. */
export async function takeDeepLinkAnswer(
  ctx: AppContext,
  code: string,
): Promise<{ returnUrl: string; jwt: string }> {
  const repo = ctx.dataSource.getRepository(LtiDeepLinkRequestEntity)
  const returnCodeHash = hashToken(code)
  const request = await repo.findOneBy({ returnCodeHash })
  const spent =
    request && (await repo.update({ id: request.id, respondedAt: IsNull() }, { respondedAt: nowIso() }))
  if (!request?.responseJwt || !spent?.affected) {
    throw new HttpError(404, 'not_found', 'This answer was already sent to the course, or never existed.')
  }
  return { returnUrl: request.returnUrl, jwt: request.responseJwt }
}
