// The one error type the UI shows: the server's `{ error: { code, message, details } }`, or our own
// codes for failures that never reached the server ('network') or came back malformed ('bad_response').

export interface FieldIssue {
  path: string
  message: string
}

export class ApiError extends Error {
  readonly status: number
  readonly code: string
  readonly details: unknown

  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message)
    this.name = 'ApiError'
    this.status = status
    this.code = code
    this.details = details
  }

  /** Field messages keyed by field path, from zod-style details (`fieldErrors`, `issues` or a plain map). */
  fieldErrors(): Record<string, string> {
    return fieldErrorsFrom(this.details)
  }
}

function fieldErrorsFrom(details: unknown): Record<string, string> {
  const out: Record<string, string> = {}
  if (!details || typeof details !== 'object') return out
  const d = details as Record<string, unknown>
  if (Array.isArray(d.issues)) {
    for (const issue of d.issues as { path?: unknown; message?: unknown }[]) {
      const path = Array.isArray(issue.path) ? issue.path.join('.') : String(issue.path ?? '')
      if (typeof issue.message === 'string' && !(path in out)) out[path] = issue.message
    }
    return out
  }
  const fields = (d.fieldErrors ?? d.fields ?? d) as Record<string, unknown>
  for (const [key, value] of Object.entries(fields)) {
    if (typeof value === 'string') out[key] = value
    else if (Array.isArray(value) && typeof value[0] === 'string') out[key] = value[0]
  }
  return out
}

const FRIENDLY: Record<number, string> = {
  400: 'The request was not accepted.',
  401: 'Please sign in again.',
  403: 'You are not allowed to do that.',
  404: 'That could not be found.',
  409: 'That conflicts with something that already exists.',
  413: 'That file or request is too large.',
  415: 'That file type is not accepted.',
  429: 'Too many attempts. Please wait a moment and try again.',
}

/** Turns whatever a failed fetch produced into an ApiError. */
export function toApiError(status: number | undefined, body: unknown, cause?: unknown): ApiError {
  if (!status) {
    return new ApiError(
      0,
      'network',
      'Slipway could not reach the server. Check the connection and try again.',
      cause,
    )
  }
  const err = (body as { error?: { code?: unknown; message?: unknown; details?: unknown } } | null)?.error
  if (err && typeof err.code === 'string') {
    const message =
      typeof err.message === 'string' && err.message ? err.message : (FRIENDLY[status] ?? 'Error')
    return new ApiError(status, err.code, message, err.details)
  }
  const fallback =
    FRIENDLY[status] ?? (status >= 500 ? 'The server had a problem. Please try again.' : 'Error')
  return new ApiError(status, status >= 500 ? 'server_error' : 'http_error', fallback)
}

export function isApiError(e: unknown): e is ApiError {
  return e instanceof ApiError
}

/** A message for any thrown value, for alerts. */
export function messageOf(e: unknown): string {
  if (e instanceof Error) return e.message
  return 'Something went wrong.'
}
