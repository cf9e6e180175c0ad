// validate({ body, query, params }): parse once at the edge and replace the request's values with the result.
import type { RequestHandler } from 'express'
import type { z } from 'zod'

interface Schemas {
  body?: z.ZodType
  query?: z.ZodType
  params?: z.ZodType
}

export function validate(schemas: Schemas): RequestHandler {
  return (req, _res, next) => {
    if (schemas.params) req.params = schemas.params.parse(req.params) as typeof req.params
    // Express 5 exposes req.query as a getter; shadow it with the parsed value.
    if (schemas.query)
      Object.defineProperty(req, 'query', { value: schemas.query.parse(req.query), writable: true })
    if (schemas.body) req.body = schemas.body.parse(req.body ?? {})
    next()
  }
}
