// Attempts: history, one attempt's detail, submission, and the instructor's feedback and overrides.
import { defineStore } from 'pinia'
import {
  attemptDetailSchema,
  attemptOverviewSchema,
  attemptPageSchema,
  attemptSummarySchema,
  feedbackSchema,
  type AttemptListQuery,
  type FeedbackRequest,
  type GradeOverrideRequest,
  type SubmitAttemptRequest,
} from '@shared/api'
import { z } from 'zod'
import { request } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useAttemptsStore = defineStore('attempts', () => {
  async function page(query: AttemptListQuery = {}) {
    return request(endpoints.attempts.list, attemptPageSchema, {
      query: query as Record<string, string | number>,
    })
  }

  /** One attempt with its event log (replay, resuming). */
  async function get(id: string) {
    return request(endpoints.attempts.one(id), attemptDetailSchema)
  }

  /** One attempt without its event log (result and review pages). */
  async function overview(id: string) {
    return request(endpoints.attempts.overview(id), attemptOverviewSchema)
  }

  async function submit(body: SubmitAttemptRequest) {
    return request(endpoints.attempts.submit, attemptSummarySchema, { method: 'POST', body })
  }

  async function addFeedback(id: string, body: FeedbackRequest) {
    return request(endpoints.attempts.feedback(id), z.union([feedbackSchema, z.unknown()]), {
      method: 'POST',
      body,
    })
  }

  async function overrideGrade(id: string, body: GradeOverrideRequest) {
    return request(endpoints.attempts.override(id), z.unknown(), { method: 'POST', body })
  }

  async function markReviewed(id: string, reviewed: boolean) {
    return request(endpoints.attempts.review(id), attemptSummarySchema, {
      method: 'POST',
      body: { reviewed },
    })
  }

  return { page, get, overview, submit, addFeedback, overrideGrade, markReviewed }
})
