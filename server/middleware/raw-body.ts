// A JSON body kept as bytes, for the one route that parses it in a grading thread (attempt submission):
// the bytes come from express.raw (same size limit, gzip and 413 as express.json); this checks the charset
// as express.json would and hands on a Uint8Array, or null when no JSON body was sent.
import type { RequestHandler } from 'express'
import { HttpError } from '../http-error'

declare module 'express-serve-static-core' {
  interface Request {
    rawJson?: Uint8Array | null
  }
}

export const keepRawJsonBody: RequestHandler = (req, _res, next) => {
  const charset = /;\s*charset=([^;]+)/i.exec(req.headers['content-type'] ?? '')?.[1]?.trim().toLowerCase()
  if (charset && charset !== 'utf-8' && charset !== 'utf8') {
    throw new HttpError(415, 'bad_request', 'The request could not be read')
  }
  req.rawJson = Buffer.isBuffer(req.body) ? req.body : null
  next()
}
