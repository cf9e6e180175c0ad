// Who teaches a cohort (its owner and co-instructors), and copying a cohort for its next intake.
import { defineStore } from 'pinia'
import {
  cohortInstructorListSchema,
  cohortInstructorSchema,
  copyCohortResultSchema,
  type CopyCohortRequest,
} from '@shared/api'
import { request, requestVoid } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useCohortTeachingStore = defineStore('cohortTeaching', () => {
  async function instructors(cohortId: string) {
    return (await request(endpoints.cohorts.instructors(cohortId), cohortInstructorListSchema)).items
  }

  async function addCoInstructor(cohortId: string, email: string) {
    return request(endpoints.cohorts.instructors(cohortId), cohortInstructorSchema, {
      method: 'POST',
      body: { email },
    })
  }

  /** Removes a co-instructor (or, with one's own id, leaves the cohort). */
  async function removeCoInstructor(cohortId: string, userId: string) {
    await requestVoid(endpoints.cohorts.instructor(cohortId, userId), { method: 'DELETE' })
  }

  async function copy(cohortId: string, body: CopyCohortRequest) {
    return request(endpoints.cohorts.copy(cohortId), copyCohortResultSchema, { method: 'POST', body })
  }

  return { instructors, addCoInstructor, removeCoInstructor, copy }
})
