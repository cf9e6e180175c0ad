// Administration: accounts and roles, the mail outbox, the database backup.
import { defineStore } from 'pinia'
import {
  outboxPageSchema,
  outboxRetryResponseSchema,
  userPageSchema,
  meResponseSchema,
  inviteOutcomeSchema,
  invitationLinkSchema,
  pendingInvitationListSchema,
  type InviteRequest,
  type OutboxQuery,
  type PageQuery,
  type UpdateUserRequest,
  type UserListQuery,
} from '@shared/api'
import { downloadFile, request, requestVoid } from '@/api/client'
import { endpoints } from '@/api/endpoints'

type Query = Record<string, string | number>

export const useAdminStore = defineStore('admin', () => {
  const users = (query: UserListQuery) =>
    request(endpoints.admin.users, userPageSchema, { query: query as Query })
  // The server answers with `{ user }`, the same shape as the signed-in user's own record.
  const updateUser = async (id: string, body: UpdateUserRequest) =>
    (await request(endpoints.admin.user(id), meResponseSchema, { method: 'PATCH', body })).user
  const inviteInstructor = (body: InviteRequest) =>
    request(endpoints.admin.inviteInstructor, inviteOutcomeSchema, { method: 'POST', body })
  /** Everyone invited and not yet answered (instructors and apprentices). */
  const pendingInvitations = (query: PageQuery) =>
    request(endpoints.admin.invitations, pendingInvitationListSchema, { query: query as Query })
  const resendInvitation = async (id: string) => {
    await requestVoid(`${endpoints.admin.invitation(id)}/resend`, { method: 'POST' })
  }
  const invitationLink = (id: string) =>
    request(`${endpoints.admin.invitation(id)}/link`, invitationLinkSchema, { method: 'POST' })
  const revokeInvitation = (id: string) => requestVoid(endpoints.admin.invitation(id), { method: 'DELETE' })
  const outbox = (query: OutboxQuery) =>
    request(endpoints.admin.outbox, outboxPageSchema, { query: query as Query })
  const retryMessage = async (id: string) =>
    (await request(endpoints.admin.retryMessage(id), outboxRetryResponseSchema, { method: 'POST' })).message

  function downloadBackup() {
    const stamp = new Date().toISOString().slice(0, 19).replace(/[:T]/g, '-')
    return downloadFile(endpoints.admin.backup, `slipway-backup-${stamp}.sqlite`)
  }

  return {
    users,
    updateUser,
    inviteInstructor,
    pendingInvitations,
    resendInvitation,
    invitationLink,
    revokeInvitation,
    outbox,
    retryMessage,
    downloadBackup,
  }
})
