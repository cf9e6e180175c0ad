// One apprentice's record for their instructors (stateless: views hold the state with useAsync).
import { defineStore } from 'pinia'
import { apprenticeRecordSchema, attemptNeighboursSchema } from '@shared/api'
import { request } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useApprenticesStore = defineStore('apprentices', () => {
  const record = (id: string) => request(endpoints.apprentices.one(id), apprenticeRecordSchema)
  const neighbours = (attemptId: string) =>
    request(endpoints.attempts.neighbours(attemptId), attemptNeighboursSchema)
  return { record, neighbours }
})
