// A platform registration → the API's Platform (counts passed in; nothing secret is stored on it).
import type { Platform } from '@shared/api/lti'
import type { LtiPlatformRow } from '../entities'

export const presentPlatform = (
  row: LtiPlatformRow,
  related: { deploymentIds: string[]; linkedPeople: number; linkedCourses: number },
): Platform => ({
  id: row.id,
  name: row.name,
  issuer: row.issuer,
  clientId: row.clientId,
  deploymentIds: related.deploymentIds,
  authorizationEndpoint: row.authorizationEndpoint,
  tokenEndpoint: row.tokenEndpoint,
  jwksUrl: row.jwksUrl,
  extraFrameOrigins: JSON.parse(row.extraFrameOrigins) as string[],
  linkedPeople: related.linkedPeople,
  linkedCourses: related.linkedCourses,
  lastLaunchAt: row.lastLaunchAt,
  createdAt: row.createdAt,
})
