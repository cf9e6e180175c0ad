// Building blocks shared by every API contract: ids, timestamps, paging and the error body.
import { z } from 'zod'

export const idSchema = z.uuid({ error: 'Must be a UUID' })
export const isoDateTimeSchema = z.iso.datetime({ offset: true, error: 'Must be an ISO 8601 date-time' })
export const emailSchema = z
  .email({ error: 'Must be an e-mail address' })
  .max(254, { error: 'At most 254 characters' })
  .transform((value) => value.trim().toLowerCase())
export const personNameSchema = z
  .string()
  .trim()
  .min(1, { error: 'Enter a name' })
  .max(120, { error: 'At most 120 characters' })

export const idParamsSchema = z.object({ id: idSchema })

/** Query-string integers arrive as text; coerce them but keep limits explicit. */
export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
})
export type PageQuery = z.infer<typeof pageQuerySchema>

export function pageOf<T extends z.ZodType>(item: T) {
  return z.object({
    items: z.array(item),
    total: z.number().int().nonnegative(),
    page: z.number().int().min(1),
    pageSize: z.number().int().min(1),
  })
}
export interface Page<T> {
  items: T[]
  total: number
  page: number
  pageSize: number
}

export const sortOrderSchema = z.enum(['asc', 'desc']).default('asc')

/** Stable machine-readable codes; the message is for people, the code is for the client. */
export const errorCodes = [
  'bad_request',
  'validation_failed',
  'invalid_json',
  'payload_too_large',
  'unsupported_media_type',
  'unauthenticated',
  'token_expired',
  'token_invalid',
  'refresh_token_missing',
  'refresh_token_invalid',
  'refresh_token_reused',
  'account_inactive',
  'invalid_credentials',
  'forbidden',
  'not_found',
  'route_not_found',
  'conflict',
  'email_taken',
  'invitation_invalid',
  'reset_token_invalid',
  'attempt_conflict',
  'attempt_limit_reached',
  'attempt_diverged',
  'assignment_not_open',
  'assignment_closed',
  'cohort_archived',
  'scenario_retired',
  'practice_closed',
  'scenario_invalid',
  'hints_not_allowed',
  'draft_not_ready',
  'reference_missing',
  'reference_not_full',
  'live_out_of_step',
  'injection_unknown',
  'injection_pending',
  'message_unknown',
  'roster_invalid',
  'rate_limited',
  'server_busy',
  'shutting_down',
  'lti_launch_invalid',
  'lti_launch_refused',
  'lti_not_linked',
  'lti_service_failed',
  'internal_error',
] as const
export const errorCodeSchema = z.enum(errorCodes)
export type ErrorCode = z.infer<typeof errorCodeSchema>

/**
 * details: for validation errors, `fields` maps a dotted path to its messages. requestId: the id of the
 * request (also in the X-Request-Id header and in every server log line about it), for support.
 */
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
    requestId: z.string().optional(),
  }),
})
export type ApiError = z.infer<typeof apiErrorSchema>

export const validationDetailsSchema = z.object({
  fields: z.record(z.string(), z.array(z.string())),
})
export type ValidationDetails = z.infer<typeof validationDetailsSchema>
