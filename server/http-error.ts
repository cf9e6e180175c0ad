// The one error type route code throws; the error middleware turns it into the JSON error body.
import type { ErrorCode } from '@shared/api/common'

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
