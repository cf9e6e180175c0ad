// Central error handling: every failure leaves as { error: { code, message, details } }, never a stack trace.
import type { ErrorRequestHandler, RequestHandler } from 'express'
import { MulterError } from 'multer'
import { ZodError } from 'zod'
import { HttpError, INVALID_JSON_MESSAGE, VALIDATION_MESSAGE, zodDetails } from '../http-error'

export const apiNotFound: RequestHandler = (req) => {
  throw new HttpError(404, 'route_not_found', `No API route ${req.method} ${req.baseUrl}${req.path}`)
}

interface BodyParserError extends Error {
  type?: string
  status?: number
}

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const send = (status: number, code: string, message: string, details?: unknown) => {
    if (res.headersSent) return
    const requestId = req.requestId
    res.status(status).json({
      error: { code, message, ...(details === undefined ? {} : { details }), ...(requestId ? { requestId } : {}) },
    })
  }
  if (err instanceof HttpError) {
    for (const [name, value] of Object.entries(err.headers ?? {})) res.setHeader(name, value)
    return send(err.status, err.code, err.message, err.details)
  }
  if (err instanceof ZodError) {
    return send(400, 'validation_failed', VALIDATION_MESSAGE, zodDetails(err))
  }
  if (err instanceof MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE') return send(413, 'payload_too_large', 'The file is too large')
    return send(400, 'bad_request', `Upload refused: ${err.message}`, { field: err.field })
  }
  const bodyError = err as BodyParserError
  if (bodyError?.type === 'entity.too.large')
    return send(413, 'payload_too_large', 'The request body is too large')
  if (bodyError?.type === 'entity.parse.failed')
    return send(400, 'invalid_json', INVALID_JSON_MESSAGE)
  if (typeof bodyError?.status === 'number' && bodyError.status >= 400 && bodyError.status < 500) {
    return send(bodyError.status, 'bad_request', 'The request could not be read')
  }
  req.log?.error({ err }, 'unhandled error')
  send(500, 'internal_error', 'Something went wrong on the server')
}
