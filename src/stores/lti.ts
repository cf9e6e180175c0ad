// Learning platforms (LTI): registrations and Slipway's keys (admins), the deep-linking picker, a cohort's
// course link, roster pulls and the state of grades sent back (instructors).
import { defineStore } from 'pinia'
import {
  cohortLinkSchema,
  deepLinkingRequestSchema,
  deepLinkingResultSchema,
  platformListSchema,
  platformSchema,
  rosterPullResultSchema,
  scoreSyncListSchema,
  toolConfigurationSchema,
  type CreatePlatformRequest,
  type DeepLinkingChoice,
  type UpdatePlatformRequest,
} from '@shared/api'
import { request, requestVoid } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useLtiStore = defineStore('lti', () => {
  const e = endpoints.lti
  return {
    tool: () => request(e.tool, toolConfigurationSchema),
    rotateKey: () => request(e.rotateKey, toolConfigurationSchema, { method: 'POST' }),
    platforms: async () => (await request(e.platforms, platformListSchema)).items,
    createPlatform: (body: CreatePlatformRequest) =>
      request(e.platforms, platformSchema, { method: 'POST', body }),
    updatePlatform: (id: string, body: UpdatePlatformRequest) =>
      request(e.platform(id), platformSchema, { method: 'PATCH', body }),
    deletePlatform: (id: string) => requestVoid(e.platform(id), { method: 'DELETE' }),
    deepLinkRequest: (id: string) => request(e.deepLinking(id), deepLinkingRequestSchema),
    answerDeepLink: (id: string, body: DeepLinkingChoice) =>
      request(e.deepLinking(id), deepLinkingResultSchema, { method: 'POST', body }),
    cohortLink: (cohortId: string) => request(e.cohort(cohortId), cohortLinkSchema),
    pullRoster: (cohortId: string) =>
      request(e.rosterPull(cohortId), rosterPullResultSchema, { method: 'POST' }),
    scoreSync: (cohortId: string) => request(e.scoreSync(cohortId), scoreSyncListSchema),
    retryScores: (cohortId: string) =>
      request(e.scoreSyncRetry(cohortId), scoreSyncListSchema, { method: 'POST' }),
  }
})
