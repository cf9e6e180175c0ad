// Cohorts an instructor owns, their members and invitations.
import { ref } from 'vue'
import { defineStore } from 'pinia'
import {
  cohortListSchema,
  cohortMemberListSchema,
  cohortMessageResultSchema,
  cohortSchema,
  cohortInsightSchema,
  invitationListSchema,
  invitationLinkSchema,
  type RosterImportMode,
  inviteOutcomeSchema,
  removeMembersResultSchema,
  rosterImportResultSchema,
  type Cohort,
  type CohortMessageRequest,
  type CreateCohortRequest,
  type InviteRequest,
  type UpdateCohortRequest,
} from '@shared/api'
import { request, requestVoid } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useCohortsStore = defineStore('cohorts', () => {
  const items = ref<Cohort[]>([])
  const loading = ref(false)
  const error = ref<unknown>(null)

  async function load(includeArchived = false) {
    loading.value = true
    error.value = null
    try {
      items.value = (
        await request(endpoints.cohorts.list, cohortListSchema, {
          query: { includeArchived: String(includeArchived) },
        })
      ).items
    } catch (e) {
      error.value = e
    } finally {
      loading.value = false
    }
  }

  const insight = (id: string) => request(endpoints.cohorts.insight(id), cohortInsightSchema)

  async function get(id: string) {
    return request(endpoints.cohorts.one(id), cohortSchema)
  }

  async function create(body: CreateCohortRequest) {
    const cohort = await request(endpoints.cohorts.list, cohortSchema, { method: 'POST', body })
    items.value = [cohort, ...items.value]
    return cohort
  }

  async function update(id: string, body: UpdateCohortRequest) {
    const cohort = await request(endpoints.cohorts.one(id), cohortSchema, { method: 'PATCH', body })
    items.value = items.value.map((c) => (c.id === id ? cohort : c))
    return cohort
  }

  async function members(id: string) {
    return (await request(endpoints.cohorts.members(id), cohortMemberListSchema)).items
  }

  async function removeMember(id: string, userId: string) {
    await requestVoid(endpoints.cohorts.member(id, userId), { method: 'DELETE' })
  }

  /** Removes several members at once; how many left. */
  async function removeMembers(id: string, userIds: string[]) {
    return request(endpoints.cohorts.removeMembers(id), removeMembersResultSchema, {
      method: 'POST',
      body: { userIds },
    })
  }

  /** E-mails a message to the members chosen; how many were sent. */
  async function message(id: string, body: CohortMessageRequest) {
    return request(endpoints.cohorts.messages(id), cohortMessageResultSchema, { method: 'POST', body })
  }

  async function invitations(id: string) {
    return (await request(endpoints.cohorts.invitations(id), invitationListSchema)).items
  }

  async function invite(id: string, body: InviteRequest) {
    return request(endpoints.cohorts.invitations(id), inviteOutcomeSchema, { method: 'POST', body })
  }

  /** `all`: every row or nothing; `valid`: the valid rows, the others skipped (with reasons). */
  async function uploadRoster(id: string, file: File, rows: RosterImportMode = 'all') {
    const form = new FormData()
    form.append('roster', file)
    return request(endpoints.cohorts.roster(id), rosterImportResultSchema, {
      method: 'POST',
      body: form,
      query: { rows },
    })
  }

  /** Sends a pending invitation again, with a new link (the old one stops working). */
  async function resendInvitation(id: string, invitationId: string) {
    await requestVoid(`${endpoints.cohorts.invitation(id, invitationId)}/resend`, { method: 'POST' })
  }

  /** A new link for a pending invitation, to hand over another way (the mailed one stops working). */
  const invitationLink = (id: string, invitationId: string) =>
    request(`${endpoints.cohorts.invitation(id, invitationId)}/link`, invitationLinkSchema, {
      method: 'POST',
    })

  const revokeInvitation = (id: string, invitationId: string) =>
    requestVoid(endpoints.cohorts.invitation(id, invitationId), { method: 'DELETE' })

  return {
    items,
    loading,
    error,
    load,
    get,
    insight,
    create,
    update,
    members,
    removeMember,
    invitations,
    invite,
    uploadRoster,
    resendInvitation,
    invitationLink,
    revokeInvitation,
    removeMembers,
    message,
  }
})
