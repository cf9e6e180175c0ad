// The one error type route code throws; the error middleware turns it into the JSON error body.
import type { ErrorCode } from '@shared/api/common'
import type { ZodError } from 'zod'

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly details?: unknown,
    readonly headers?: Record<string, string>,
  ) {
    super(message)
  }
}

export const notFound = (what: string) => new HttpError(404, 'not_found', `${what} not found`)
export const forbidden = (message = 'You do not have access to this') =>
  new HttpError(403, 'forbidden', message)
export const conflict = (code: ErrorCode, message: string, details?: unknown) =>
  new HttpError(409, code, message, details)

/** A zod error's issues as `details.fields`: dotted path → messages (the body of every validation error). */
export function zodDetails(error: ZodError) {
  const fields: Record<string, string[]> = {}
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join('.') : '(root)'
    ;(fields[key] ??= []).push(issue.message)
  }
  return { fields }
}

/** The message every validation error carries beside its fields. */
export const VALIDATION_MESSAGE = 'Some fields are not valid'
export const INVALID_JSON_MESSAGE = 'The request body is not valid JSON'
