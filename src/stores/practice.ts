// Free practice: what the signed-in user may practise, and a cohort's practice policy (stateless: views hold
// the state with useAsync).
import { defineStore } from 'pinia'
import {
  cohortPracticeSchema,
  practiceListSchema,
  practiceOpenSchema,
  type PracticePolicy,
} from '@shared/api'
import { request } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const usePracticeStore = defineStore('practice', () => {
  const list = () => request(endpoints.practice.list, practiceListSchema)
  /** Resolves when practice of `key` is open for the user; rejects with the server's words when not. */
  const check = (key: string) => request(endpoints.practice.check(key), practiceOpenSchema)
  const ofCohort = (cohortId: string) => request(endpoints.cohorts.practice(cohortId), cohortPracticeSchema)
  const setPolicy = (cohortId: string, policy: PracticePolicy) =>
    request(endpoints.cohorts.practice(cohortId), cohortPracticeSchema, { method: 'PUT', body: policy })
  return { list, check, ofCohort, setPolicy }
})
