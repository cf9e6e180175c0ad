// The names LTI 1.3 and LTI Advantage give their claims, scopes and media types (1EdTech LTI Core 1.3,
// Deep Linking 2.0, Assignment and Grade Services 2.0, Names and Role Provisioning Services 2.0), and the
// shape of a launch's ID token as Slipway reads it.
import { z } from 'zod'

const LTI = 'https://purl.imsglobal.org/spec/lti/claim/'
export const CLAIM = {
  messageType: `${LTI}message_type`,
  version: `${LTI}version`,
  deploymentId: `${LTI}deployment_id`,
  targetLinkUri: `${LTI}target_link_uri`,
  resourceLink: `${LTI}resource_link`,
  roles: `${LTI}roles`,
  context: `${LTI}context`,
  custom: `${LTI}custom`,
  toolPlatform: `${LTI}tool_platform`,
  deepLinkingSettings: 'https://purl.imsglobal.org/spec/lti-dl/claim/deep_linking_settings',
  contentItems: 'https://purl.imsglobal.org/spec/lti-dl/claim/content_items',
  deepLinkingData: 'https://purl.imsglobal.org/spec/lti-dl/claim/data',
  agsEndpoint: 'https://purl.imsglobal.org/spec/lti-ags/claim/endpoint',
  nrps: 'https://purl.imsglobal.org/spec/lti-nrps/claim/namesroleservice',
} as const

export const LTI_VERSION = '1.3.0'
export const MESSAGE = {
  resourceLink: 'LtiResourceLinkRequest',
  deepLinkingRequest: 'LtiDeepLinkingRequest',
  deepLinkingResponse: 'LtiDeepLinkingResponse',
} as const

export const SCOPE = {
  lineItem: 'https://purl.imsglobal.org/spec/lti-ags/scope/lineitem',
  resultReadonly: 'https://purl.imsglobal.org/spec/lti-ags/scope/result.readonly',
  score: 'https://purl.imsglobal.org/spec/lti-ags/scope/score',
  memberships: 'https://purl.imsglobal.org/spec/lti-nrps/scope/contextmembership.readonly',
} as const
/** What Slipway asks a platform for: line items, scores and the course roster (never other results). */
export const TOOL_SCOPES = [SCOPE.lineItem, SCOPE.score, SCOPE.memberships]

export const MEDIA = {
  lineItem: 'application/vnd.ims.lis.v2.lineitem+json',
  lineItems: 'application/vnd.ims.lis.v2.lineitemcontainer+json',
  score: 'application/vnd.ims.lis.v1.score+json',
  memberships: 'application/vnd.ims.lti-nrps.v2.membershipcontainer+json',
} as const

/** The custom parameter a deep-linked activity carries back in its launches. */
export const ASSIGNMENT_PARAMETER = 'slipway_assignment_id'

const text = z.string().min(1).max(2000)

/**
 * A launch's claims after the signature is checked. Only the shape: the values (issuer, audience, times,
 * nonce, deployment, message type, version) are checked step by step in launch-verification.ts, each with
 * its own refusal, so the schema lets those through as they come.
 */
export const idTokenSchema = z.looseObject({
  iss: z.string(),
  sub: z.string().max(255).optional(),
  aud: z.union([z.string(), z.array(z.string())]),
  azp: z.string().optional(),
  exp: z.number(),
  iat: z.number(),
  nbf: z.number().optional(),
  nonce: z.string().optional(),
  name: z.string().max(500).optional(),
  given_name: z.string().max(250).optional(),
  family_name: z.string().max(250).optional(),
  email: z.string().max(254).optional(),
  [CLAIM.messageType]: z.string().optional(),
  [CLAIM.version]: z.string().optional(),
  [CLAIM.deploymentId]: z.string().optional(),
  [CLAIM.targetLinkUri]: z.string().optional(),
  [CLAIM.resourceLink]: z.looseObject({ id: text, title: z.string().optional() }).optional(),
  [CLAIM.roles]: z.array(z.string()).optional(),
  [CLAIM.context]: z
    .looseObject({ id: text, label: z.string().optional(), title: z.string().optional() })
    .optional(),
  [CLAIM.custom]: z.record(z.string(), z.unknown()).optional(),
  [CLAIM.toolPlatform]: z.looseObject({ name: z.string().optional() }).optional(),
  [CLAIM.deepLinkingSettings]: z
    .looseObject({
      deep_link_return_url: z.url(),
      accept_types: z.array(z.string()),
      accept_multiple: z.boolean().optional(),
      data: z.string().optional(),
    })
    .optional(),
  [CLAIM.agsEndpoint]: z
    .looseObject({
      scope: z.array(z.string()).default([]),
      lineitems: z.url().optional(),
      lineitem: z.url().optional(),
    })
    .optional(),
  [CLAIM.nrps]: z
    .looseObject({
      context_memberships_url: z.url(),
      service_versions: z.array(z.string()).optional(),
    })
    .optional(),
})
export type IdToken = z.infer<typeof idTokenSchema>

/** A member as NRPS 2.0 lists it. */
export const memberSchema = z.looseObject({
  user_id: z.string().min(1).max(255),
  status: z.string().optional(),
  roles: z.array(z.string()).default([]),
  name: z.string().max(500).optional(),
  given_name: z.string().optional(),
  family_name: z.string().optional(),
  email: z.string().max(254).optional(),
})
export const membershipContainerSchema = z.looseObject({
  context: z.looseObject({ id: z.string(), title: z.string().optional() }).optional(),
  members: z.array(memberSchema),
})
export type Member = z.infer<typeof memberSchema>

export const lineItemSchema = z.looseObject({
  id: z.url(),
  scoreMaximum: z.number().optional(),
  label: z.string().optional(),
  resourceLinkId: z.string().optional(),
  resourceId: z.string().optional(),
})
export type LineItem = z.infer<typeof lineItemSchema>
