// Logging with pino: the process's logger, and the request log (method, path without query, status; no
// headers, so no tokens or cookies ever reach a log line). Every line written while a request is handled
// carries its requestId (from http/request-context.ts), whichever logger wrote it.
import type { RequestHandler } from 'express'
import { pino, type DestinationStream, type Logger } from 'pino'
import { pinoHttp } from 'pino-http'
import { currentRequestId } from './http/request-context'

export type { Logger }

/** `destination`: standard output unless given (tests read the lines back). */
export const createLogger = (level: string, destination?: DestinationStream): Logger =>
  pino(
    {
      level,
      mixin() {
        const requestId = currentRequestId()
        return requestId ? { requestId } : {}
      },
    },
    destination,
  )

export function requestLogger(log: Logger): RequestHandler {
  return pinoHttp({
    logger: log,
    // The id requestContext() gave the request, so the request log and the error body name the same one.
    genReqId: (req) => (req as { requestId?: string }).requestId ?? 'none',
    autoLogging: { ignore: (req) => req.url === '/api/health' || req.url === '/api/ready' },
    serializers: {
      req: (req: { method: string; url: string }) => ({ method: req.method, url: req.url.split('?')[0] }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
    customAttributeKeys: { reqId: 'requestId' },
  })
}
