// Logging with pino: the process's logger, and the request log (method, path without query, status; no
// headers, so no tokens or cookies ever reach a log line).
import type { RequestHandler } from 'express'
import { pino, type Logger } from 'pino'
import { pinoHttp } from 'pino-http'

export type { Logger }

export const createLogger = (level: string): Logger => pino({ level })

export function requestLogger(log: Logger): RequestHandler {
  return pinoHttp({
    logger: log,
    autoLogging: { ignore: (req) => req.url === '/api/health' },
    serializers: {
      req: (req: { id: unknown; method: string; url: string }) => ({
        id: req.id,
        method: req.method,
        url: req.url.split('?')[0],
      }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
  })
}
