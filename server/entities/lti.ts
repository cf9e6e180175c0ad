// Learning platforms (LTI 1.3), kept together because they only make sense as a set: registrations and their
// deployments, Slipway's own key pairs, one-time login and hand-over records, the links from a platform's
// people, courses and activities to Slipway's users, cohorts and assignments, and grades on their way back.
// Migration 1765000000000 creates the same tables.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import {
  belongsTo,
  integer,
  nullableReal,
  nullableText,
  nullableTimestamp,
  text,
  timestamp,
  uuidColumn,
  uuidPrimary,
  varchar,
} from './columns'

/** A platform as its admin registered it: one issuer and the client id it gave Slipway. */
export interface LtiPlatformRow {
  id: string
  name: string
  issuer: string
  clientId: string
  authorizationEndpoint: string
  tokenEndpoint: string
  jwksUrl: string
  /** JSON array of origins, besides the issuer's and the authorisation endpoint's, allowed to frame Slipway. */
  extraFrameOrigins: string
  createdAt: string
  updatedAt: string
  lastLaunchAt: string | null
}

export const LtiPlatformEntity = new EntitySchema<LtiPlatformRow>({
  name: 'LtiPlatform',
  tableName: 'lti_platforms',
  columns: {
    id: uuidPrimary,
    name: varchar(120),
    issuer: varchar(500),
    clientId: varchar(255),
    authorizationEndpoint: varchar(500),
    tokenEndpoint: varchar(500),
    jwksUrl: varchar(500),
    extraFrameOrigins: text,
    createdAt: timestamp,
    updatedAt: timestamp,
    lastLaunchAt: nullableTimestamp,
  },
  uniques: [{ name: 'uq_lti_platforms_issuer_client', columns: ['issuer', 'clientId'] }],
})

export interface LtiDeploymentRow {
  id: string
  platformId: string
  deploymentId: string
  createdAt: string
}

export const LtiDeploymentEntity = new EntitySchema<LtiDeploymentRow>({
  name: 'LtiDeployment',
  tableName: 'lti_deployments',
  columns: { id: uuidPrimary, platformId: uuidColumn, deploymentId: varchar(255), createdAt: timestamp },
  uniques: [{ name: 'uq_lti_deployments_platform_deployment', columns: ['platformId', 'deploymentId'] }],
  relations: {
    platform: belongsTo('LtiPlatform', 'platformId', 'CASCADE'),
  } as EntitySchemaOptions<LtiDeploymentRow>['relations'],
})

/** One of Slipway's RSA key pairs; the newest unretired one signs, retired ones stay published a while. */
export interface LtiToolKeyRow {
  /** The key id (kid) platforms see. */
  id: string
  algorithm: string
  publicJwk: string
  /** PKCS#8 PEM. Never leaves the server; it is in database backups like every other secret here. */
  privateKeyPem: string
  createdAt: string
  retiredAt: string | null
}

export const LtiToolKeyEntity = new EntitySchema<LtiToolKeyRow>({
  name: 'LtiToolKey',
  tableName: 'lti_tool_keys',
  columns: {
    id: { ...varchar(64), primary: true },
    algorithm: varchar(16),
    publicJwk: text,
    privateKeyPem: text,
    createdAt: timestamp,
    retiredAt: nullableTimestamp,
  },
})

/**
 * One OIDC login initiation: the state and nonce Slipway sent to the platform, bound to the browser by a
 * cookie whose hash is kept here. Consumed once by the launch that answers it.
 */
export interface LtiLoginRow {
  /** SHA-256 of the state value. */
  stateHash: string
  platformId: string
  nonce: string
  /** SHA-256 of the browser-binding cookie's value. */
  bindingHash: string
  /** The login request's own parameters (JSON), to start again in a new window if the frame lost the cookie. */
  loginParams: string
  expiresAt: string
  usedAt: string | null
  createdAt: string
}

export const LtiLoginEntity = new EntitySchema<LtiLoginRow>({
  name: 'LtiLogin',
  tableName: 'lti_logins',
  columns: {
    stateHash: { ...varchar(64), primary: true },
    platformId: uuidColumn,
    nonce: varchar(64),
    bindingHash: varchar(64),
    loginParams: text,
    expiresAt: timestamp,
    usedAt: nullableTimestamp,
    createdAt: timestamp,
  },
  indices: [{ name: 'idx_lti_logins_expires', columns: ['expiresAt'] }],
  relations: {
    platform: belongsTo('LtiPlatform', 'platformId', 'CASCADE'),
  } as EntitySchemaOptions<LtiLoginRow>['relations'],
})

/** A one-time code that hands a verified launch to the client, which swaps it for a session. */
export interface LtiHandoffRow {
  codeHash: string
  userId: string
  platformId: string
  /** JSON LaunchDestination. */
  destination: string
  expiresAt: string
  usedAt: string | null
  createdAt: string
}

export const LtiHandoffEntity = new EntitySchema<LtiHandoffRow>({
  name: 'LtiHandoff',
  tableName: 'lti_handoffs',
  columns: {
    codeHash: { ...varchar(64), primary: true },
    userId: uuidColumn,
    platformId: uuidColumn,
    destination: text,
    expiresAt: timestamp,
    usedAt: nullableTimestamp,
    createdAt: timestamp,
  },
  relations: {
    user: belongsTo('User', 'userId', 'CASCADE'),
    platform: belongsTo('LtiPlatform', 'platformId', 'CASCADE'),
  } as EntitySchemaOptions<LtiHandoffRow>['relations'],
})

/** A platform user (issuer + subject) and the Slipway account it signs in as. */
export interface LtiIdentityRow {
  id: string
  platformId: string
  issuer: string
  subject: string
  userId: string
  createdAt: string
}

export const LtiIdentityEntity = new EntitySchema<LtiIdentityRow>({
  name: 'LtiIdentity',
  tableName: 'lti_identities',
  columns: {
    id: uuidPrimary,
    platformId: uuidColumn,
    issuer: varchar(500),
    subject: varchar(255),
    userId: uuidColumn,
    createdAt: timestamp,
  },
  uniques: [{ name: 'uq_lti_identities_issuer_subject', columns: ['issuer', 'subject'] }],
  indices: [{ name: 'idx_lti_identities_user', columns: ['userId'] }],
  relations: {
    platform: belongsTo('LtiPlatform', 'platformId', 'RESTRICT'),
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<LtiIdentityRow>['relations'],
})

/** A platform course (context) and its cohort, with the service addresses its launches offered. */
export interface LtiContextRow {
  id: string
  platformId: string
  contextId: string
  cohortId: string
  title: string
  /** Names and Role Provisioning Services: the membership container URL. */
  membershipsUrl: string | null
  /** Assignment and Grade Services: the course's line-items URL and the scopes granted (JSON array). */
  lineItemsUrl: string | null
  agsScopes: string
  lastRosterPullAt: string | null
  createdAt: string
  updatedAt: string
}

export const LtiContextEntity = new EntitySchema<LtiContextRow>({
  name: 'LtiContext',
  tableName: 'lti_contexts',
  columns: {
    id: uuidPrimary,
    platformId: uuidColumn,
    contextId: varchar(255),
    cohortId: uuidColumn,
    title: varchar(255),
    membershipsUrl: nullableText,
    lineItemsUrl: nullableText,
    agsScopes: text,
    lastRosterPullAt: nullableTimestamp,
    createdAt: timestamp,
    updatedAt: timestamp,
  },
  uniques: [
    { name: 'uq_lti_contexts_platform_context', columns: ['platformId', 'contextId'] },
    { name: 'uq_lti_contexts_cohort', columns: ['cohortId'] },
  ],
  relations: {
    platform: belongsTo('LtiPlatform', 'platformId', 'RESTRICT'),
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE'),
  } as EntitySchemaOptions<LtiContextRow>['relations'],
})

/** A platform activity (resource link) and the assignment it opens; its line item receives the grades. */
export interface LtiResourceLinkRow {
  id: string
  contextRowId: string
  resourceLinkId: string
  assignmentId: string
  lineItemUrl: string | null
  createdAt: string
  updatedAt: string
}

export const LtiResourceLinkEntity = new EntitySchema<LtiResourceLinkRow>({
  name: 'LtiResourceLink',
  tableName: 'lti_resource_links',
  columns: {
    id: uuidPrimary,
    contextRowId: uuidColumn,
    resourceLinkId: varchar(255),
    assignmentId: uuidColumn,
    lineItemUrl: nullableText,
    createdAt: timestamp,
    updatedAt: timestamp,
  },
  uniques: [{ name: 'uq_lti_resource_links_context_link', columns: ['contextRowId', 'resourceLinkId'] }],
  indices: [{ name: 'idx_lti_resource_links_assignment', columns: ['assignmentId'] }],
  relations: {
    context: belongsTo('LtiContext', 'contextRowId', 'CASCADE'),
    assignment: belongsTo('Assignment', 'assignmentId', 'CASCADE'),
  } as EntitySchemaOptions<LtiResourceLinkRow>['relations'],
})

/** An instructor's deep-linking request, waiting for the picker's answer. */
export interface LtiDeepLinkRequestRow {
  id: string
  platformId: string
  deploymentId: string
  contextRowId: string
  userId: string
  returnUrl: string
  /** The platform's opaque `data`, echoed back unchanged. */
  data: string | null
  /** One-time code of the page that posts the answer back; set once the instructor has chosen. */
  returnCodeHash: string | null
  /** The signed answer (a JWT) the page posts. */
  responseJwt: string | null
  expiresAt: string
  respondedAt: string | null
  createdAt: string
}

export const LtiDeepLinkRequestEntity = new EntitySchema<LtiDeepLinkRequestRow>({
  name: 'LtiDeepLinkRequest',
  tableName: 'lti_deep_link_requests',
  columns: {
    id: uuidPrimary,
    platformId: uuidColumn,
    deploymentId: varchar(255),
    contextRowId: uuidColumn,
    userId: uuidColumn,
    returnUrl: text,
    data: nullableText,
    returnCodeHash: varchar(64, true),
    responseJwt: nullableText,
    expiresAt: timestamp,
    respondedAt: nullableTimestamp,
    createdAt: timestamp,
  },
  relations: {
    platform: belongsTo('LtiPlatform', 'platformId', 'CASCADE'),
    context: belongsTo('LtiContext', 'contextRowId', 'CASCADE'),
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<LtiDeepLinkRequestRow>['relations'],
})

/** Where an apprentice's grade on a linked assignment stands on its way to the platform's gradebook. */
export interface LtiScoreSyncRow {
  id: string
  assignmentId: string
  userId: string
  state: 'waiting' | 'sent' | 'failed'
  score: number | null
  tries: number
  problem: string | null
  /** When the grade last changed: the score's timestamp, so the platform keeps the newest. */
  changedAt: string
  sentAt: string | null
  updatedAt: string
}

export const LtiScoreSyncEntity = new EntitySchema<LtiScoreSyncRow>({
  name: 'LtiScoreSync',
  tableName: 'lti_score_syncs',
  columns: {
    id: uuidPrimary,
    assignmentId: uuidColumn,
    userId: uuidColumn,
    state: varchar(16),
    score: nullableReal,
    tries: integer,
    problem: nullableText,
    changedAt: timestamp,
    sentAt: nullableTimestamp,
    updatedAt: timestamp,
  },
  uniques: [{ name: 'uq_lti_score_syncs_assignment_user', columns: ['assignmentId', 'userId'] }],
  relations: {
    assignment: belongsTo('Assignment', 'assignmentId', 'CASCADE'),
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<LtiScoreSyncRow>['relations'],
})

export const ltiEntities = [
  LtiPlatformEntity,
  LtiDeploymentEntity,
  LtiToolKeyEntity,
  LtiLoginEntity,
  LtiHandoffEntity,
  LtiIdentityEntity,
  LtiContextEntity,
  LtiResourceLinkEntity,
  LtiDeepLinkRequestEntity,
  LtiScoreSyncEntity,
]
