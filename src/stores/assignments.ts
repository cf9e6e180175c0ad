// Assignments: for an apprentice their own (with progress), for an instructor those of a cohort.
import { ref } from 'vue'
import { defineStore } from 'pinia'
import {
  assignmentApprenticeListSchema,
  assignmentListSchema,
  assignmentSchema,
  assignmentStatsSchema,
  assignmentInsightSchema,
  type Assignment,
  type CreateAssignmentRequest,
  type ExceptionRequest,
  type UpdateAssignmentRequest,
} from '@shared/api'
import { request, requestVoid } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useAssignmentsStore = defineStore('assignments', () => {
  const items = ref<Assignment[]>([])
  const loading = ref(false)
  const error = ref<unknown>(null)

  async function load(cohortId?: string) {
    loading.value = true
    error.value = null
    try {
      items.value = (
        await request(endpoints.assignments.list, assignmentListSchema, { query: { cohortId } })
      ).items
    } catch (e) {
      error.value = e
    } finally {
      loading.value = false
    }
  }

  async function list(cohortId?: string) {
    return (await request(endpoints.assignments.list, assignmentListSchema, { query: { cohortId } })).items
  }

  async function get(id: string) {
    return request(endpoints.assignments.one(id), assignmentSchema)
  }

  async function create(cohortId: string, body: CreateAssignmentRequest) {
    return request(endpoints.cohorts.assignments(cohortId), assignmentSchema, { method: 'POST', body })
  }

  async function update(id: string, body: UpdateAssignmentRequest) {
    return request(endpoints.assignments.one(id), assignmentSchema, { method: 'PATCH', body })
  }

  async function remove(id: string) {
    await requestVoid(endpoints.assignments.one(id), { method: 'DELETE' })
  }

  async function stats(id: string) {
    return request(endpoints.assignments.stats(id), assignmentStatsSchema)
  }
  const insight = (id: string) => request(endpoints.assignments.insight(id), assignmentInsightSchema)

  /** The cohort's apprentices under their own terms on one assignment. */
  async function apprentices(id: string) {
    return (await request(endpoints.assignments.apprentices(id), assignmentApprenticeListSchema)).items
  }

  async function setExceptions(id: string, body: ExceptionRequest) {
    return (
      await request(endpoints.assignments.exceptions(id), assignmentApprenticeListSchema, {
        method: 'POST',
        body,
      })
    ).items
  }

  async function clearException(id: string, userId: string) {
    await requestVoid(endpoints.assignments.exception(id, userId), { method: 'DELETE' })
  }

  return {
    items,
    loading,
    error,
    load,
    list,
    get,
    create,
    update,
    remove,
    stats,
    insight,
    apprentices,
    setExceptions,
    clearException,
  }
})
