// Learning platforms (LTI 1.3): registration by an admin, the session a launch hands over, deep linking,
// roster pulls and the state of grades sent back. The platform-facing messages themselves (OIDC login,
// launch, key set) are form posts and JWTs, read on the server only (server/lti/claims.ts).
import { z } from 'zod'
import { assistanceLevelSchema } from '../scenario/assistance'
import { scorePolicySchema } from './assignments'
import { sessionResponseSchema } from './auth'
import { idSchema, isoDateTimeSchema } from './common'

const httpsOrLocalUrl = z
  .url({ error: 'Must be a web address such as https://learn.example.edu/…' })
  .max(500, { error: 'At most 500 characters' })
  .refine(
    (value) => /^https:\/\//i.test(value) || /^http:\/\/(localhost|127\.0\.0\.1)(:\d+)?(\/|$)/i.test(value),
    {
      error: 'Must start with https:// (plain http:// only for a platform on this machine)',
    },
  )

/** The origin of a platform page that shows Slipway in a frame, e.g. https://learn.example.edu */
const originSchema = httpsOrLocalUrl.transform((value) => new URL(value).origin)

const platformFields = {
  name: z.string().trim().min(1, { error: 'Give the platform a name' }).max(120),
  issuer: httpsOrLocalUrl,
  clientId: z.string().trim().min(1, { error: 'Enter the client id the platform gave Slipway' }).max(255),
  deploymentIds: z
    .array(z.string().trim().min(1).max(255))
    .min(1, { error: 'Enter at least one deployment id' })
    .max(50)
    .refine((ids) => new Set(ids).size === ids.length, { error: 'A deployment id is listed twice' }),
  authorizationEndpoint: httpsOrLocalUrl,
  tokenEndpoint: httpsOrLocalUrl,
  jwksUrl: httpsOrLocalUrl,
  /** Other web addresses whose pages show Slipway in a frame (the issuer's and the sign-in page's are implied). */
  extraFrameOrigins: z.array(originSchema).max(10).default([]),
}

export const createPlatformRequestSchema = z.object(platformFields)
export type CreatePlatformRequest = z.input<typeof createPlatformRequestSchema>

export const updatePlatformRequestSchema = z
  .object({
    name: platformFields.name.optional(),
    clientId: platformFields.clientId.optional(),
    deploymentIds: platformFields.deploymentIds.optional(),
    authorizationEndpoint: platformFields.authorizationEndpoint.optional(),
    tokenEndpoint: platformFields.tokenEndpoint.optional(),
    jwksUrl: platformFields.jwksUrl.optional(),
    extraFrameOrigins: z.array(originSchema).max(10).optional(),
  })
  .refine((value) => Object.values(value).some((field) => field !== undefined), {
    error: 'Give at least one field to change',
  })
export type UpdatePlatformRequest = z.input<typeof updatePlatformRequestSchema>

export const platformSchema = z.object({
  id: idSchema,
  name: z.string(),
  issuer: z.string(),
  clientId: z.string(),
  deploymentIds: z.array(z.string()),
  authorizationEndpoint: z.string(),
  tokenEndpoint: z.string(),
  jwksUrl: z.string(),
  extraFrameOrigins: z.array(z.string()),
  /** People who have come in from this platform (a used registration cannot be removed). */
  linkedPeople: z.number().int().nonnegative(),
  linkedCourses: z.number().int().nonnegative(),
  lastLaunchAt: isoDateTimeSchema.nullable(),
  createdAt: isoDateTimeSchema,
})
export type Platform = z.infer<typeof platformSchema>
export const platformListSchema = z.object({ items: z.array(platformSchema) })
export type PlatformList = z.infer<typeof platformListSchema>

/** Slipway's own signing key as the admin page shows it: public parts only. */
export const toolKeySchema = z.object({
  kid: z.string(),
  algorithm: z.string(),
  state: z.enum(['current', 'previous']),
  createdAt: isoDateTimeSchema,
  /** A previous key stays published until then, so platforms that cached it still verify. */
  publishedUntil: isoDateTimeSchema.nullable(),
})
export type ToolKey = z.infer<typeof toolKeySchema>

/** What a platform administrator enters when registering Slipway as a tool. */
export const toolConfigurationSchema = z.object({
  loginInitiationUrl: z.string(),
  launchUrl: z.string(),
  redirectUris: z.array(z.string()),
  jwksUrl: z.string(),
  deepLinkingUrl: z.string(),
  /** The LTI Advantage services Slipway asks for, as the platform lists them. */
  scopes: z.array(z.string()),
  keys: z.array(toolKeySchema),
})
export type ToolConfiguration = z.infer<typeof toolConfigurationSchema>

/** Where the client goes after a launch: an exercise, a course page, or the deep-linking picker. */
export const launchDestinationSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('exercise'),
    assignmentId: idSchema,
    scenarioKey: z.string(),
    scenarioVersion: z.number().int(),
  }),
  z.object({ kind: z.literal('cohort'), cohortId: idSchema }),
  z.object({ kind: z.literal('deepLinking'), requestId: idSchema }),
  z.object({ kind: z.literal('notReady'), message: z.string() }),
])
export type LaunchDestination = z.infer<typeof launchDestinationSchema>

export const launchExchangeRequestSchema = z.object({ code: z.string().min(16).max(200) })
export type LaunchExchangeRequest = z.infer<typeof launchExchangeRequestSchema>
export const launchSessionSchema = sessionResponseSchema.extend({
  destination: launchDestinationSchema,
  platformName: z.string(),
})
export type LaunchSession = z.infer<typeof launchSessionSchema>

export const deepLinkingRequestSchema = z.object({
  id: idSchema,
  platformName: z.string(),
  courseTitle: z.string(),
  cohortId: idSchema,
  expiresAt: isoDateTimeSchema,
})
export type DeepLinkingRequest = z.infer<typeof deepLinkingRequestSchema>

export const deepLinkingChoiceSchema = z
  .object({
    scenarioId: idSchema,
    title: z.string().trim().max(160).optional(),
    opensAt: z.iso.datetime({ offset: true, error: 'Must be an ISO 8601 date-time' }),
    dueAt: z.iso.datetime({ offset: true, error: 'Must be an ISO 8601 date-time' }),
    attemptLimit: z.number().int().min(1).max(100).nullable(),
    /** The assistance level (absent: from `hintsAllowed`, where false is an assessment). */
    assistanceLevel: assistanceLevelSchema.optional(),
    hintsAllowed: z.boolean().optional(),
    scorePolicy: scorePolicySchema.default('best'),
  })
  .refine((value) => Date.parse(value.dueAt) > Date.parse(value.opensAt), {
    error: 'The due date must be after the opening date',
    path: ['dueAt'],
  })
export type DeepLinkingChoice = z.input<typeof deepLinkingChoiceSchema>

/** The page that carries the signed answer back to the platform (an auto-submitted form). */
export const deepLinkingResultSchema = z.object({ returnPageUrl: z.string(), assignmentId: idSchema })
export type DeepLinkingResult = z.infer<typeof deepLinkingResultSchema>

export const cohortLinkSchema = z.object({
  cohortId: idSchema,
  linked: z.boolean(),
  platformName: z.string().nullable(),
  courseTitle: z.string().nullable(),
  /** Whether the platform offered its roster service in a launch (needed to pull the roster). */
  canPullRoster: z.boolean(),
  lastRosterPullAt: isoDateTimeSchema.nullable(),
})
export type CohortLink = z.infer<typeof cohortLinkSchema>

export const rosterPullResultSchema = z.object({
  enrolled: z.number().int().nonnegative(),
  alreadyEnrolled: z.number().int().nonnegative(),
  staff: z.number().int().nonnegative(),
  inactive: z.number().int().nonnegative(),
  /** Apprentices in the cohort whom the platform no longer lists (left for the instructor to decide). */
  notInCourse: z.array(z.object({ userId: idSchema, name: z.string() })),
})
export type RosterPullResult = z.infer<typeof rosterPullResultSchema>

export const scoreSyncStateSchema = z.enum(['waiting', 'sent', 'failed'])
export type ScoreSyncState = z.infer<typeof scoreSyncStateSchema>

export const scoreSyncCellSchema = z.object({
  assignmentId: idSchema,
  userId: idSchema,
  state: scoreSyncStateSchema,
  /** The score last sent (or being sent), 0–100. */
  score: z.number().nullable(),
  tries: z.number().int().nonnegative(),
  /** Why the last try failed, in plain words. */
  problem: z.string().nullable(),
  updatedAt: isoDateTimeSchema,
})
export type ScoreSyncCell = z.infer<typeof scoreSyncCellSchema>
export const scoreSyncListSchema = z.object({
  /** Assignments of the cohort that send grades to a platform. */
  linkedAssignmentIds: z.array(idSchema),
  cells: z.array(scoreSyncCellSchema),
})
export type ScoreSyncList = z.infer<typeof scoreSyncListSchema>
