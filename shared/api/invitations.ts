// Invitations by e-mail: apprentices into a cohort (one or a roster CSV), instructors by an admin.
import { z } from 'zod'
import { emailSchema, idSchema, isoDateTimeSchema, pageOf, pageQuerySchema, personNameSchema } from './common'
import { passwordSchema, roleSchema } from './auth'

export const inviteRequestSchema = z.object({ email: emailSchema, name: personNameSchema })
export type InviteRequest = z.input<typeof inviteRequestSchema>

export const invitationSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  cohortId: idSchema.nullable(),
  invitedById: idSchema,
  expiresAt: isoDateTimeSchema,
  acceptedAt: isoDateTimeSchema.nullable(),
  createdAt: isoDateTimeSchema,
})
export type Invitation = z.infer<typeof invitationSchema>
export const invitationListSchema = z.object({ items: z.array(invitationSchema) })
export type InvitationList = z.infer<typeof invitationListSchema>

/** `invited`: an e-mail with a link went out; `enrolled`: the apprentice already had an account. */
export const inviteOutcomeSchema = z.object({
  outcome: z.enum(['invited', 'enrolled', 'alreadyMember']),
  email: z.string(),
  invitation: invitationSchema.nullable(),
})
export type InviteOutcome = z.infer<typeof inviteOutcomeSchema>

/** Roster CSV: a header row with `name` and `email` columns (any order, case-insensitive). */
export const ROSTER_MAX_BYTES = 256 * 1024
export const ROSTER_MAX_ROWS = 500
export const rosterRowErrorSchema = z.object({
  row: z.number().int().min(1), // 1-based line number in the file, header included
  field: z.string(),
  message: z.string(),
})
export type RosterRowError = z.infer<typeof rosterRowErrorSchema>
export const rosterImportResultSchema = z.object({
  items: z.array(inviteOutcomeSchema),
  /** Rows left out by an import of the valid rows only, each with its reason (empty otherwise). */
  skipped: z.array(rosterRowErrorSchema).default([]),
})
export type RosterImportResult = z.infer<typeof rosterImportResultSchema>

/** `all`: every row or nobody (the default); `valid`: the rows that can be invited, the others skipped. */
export const ROSTER_IMPORT_MODES = ['all', 'valid'] as const
export type RosterImportMode = (typeof ROSTER_IMPORT_MODES)[number]
export const rosterImportQuerySchema = z.object({
  rows: z.enum(ROSTER_IMPORT_MODES, { error: 'Choose all rows or the valid rows' }).default('all'),
})

/**
 * /api/cohorts/:id/invitations/:invitationId — DELETE withdraws a pending invitation; POST …/resend sends it
 * again with a new link; POST …/link makes a new link to hand over another way. Admins have the same under
 * /api/admin/invitations/:id for every pending invitation.
 */
export const cohortInvitationParamsSchema = z.object({ id: idSchema, invitationId: idSchema })

/** A new link for a pending invitation: the earlier link (and the one in the e-mail) stops working. */
export const invitationLinkSchema = z.object({ url: z.string(), expiresAt: isoDateTimeSchema })
export type InvitationLink = z.infer<typeof invitationLinkSchema>

/** A pending invitation as an admin sees it: where to and from whom, in names. */
export const pendingInvitationSchema = invitationSchema.extend({
  cohortName: z.string().nullable(),
  invitedByName: z.string(),
})
export type PendingInvitation = z.infer<typeof pendingInvitationSchema>
/** GET /api/admin/invitations: one page, newest first (a centre may have hundreds outstanding after a roster). */
export const pendingInvitationQuerySchema = pageQuerySchema
export const pendingInvitationListSchema = pageOf(pendingInvitationSchema)
export type PendingInvitationPage = z.infer<typeof pendingInvitationListSchema>

export const invitationTokenParamsSchema = z.object({ token: z.string().min(16).max(200) })

/** What the invitee sees before setting a password (public, by token). */
export const invitationPreviewSchema = z.object({
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  cohortName: z.string().nullable(),
  invitedByName: z.string(),
  expiresAt: isoDateTimeSchema,
})
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>

export const acceptInvitationRequestSchema = z.object({
  name: personNameSchema.optional(),
  password: passwordSchema,
})
export type AcceptInvitationRequest = z.input<typeof acceptInvitationRequestSchema>
