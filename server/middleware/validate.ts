// validate({ body, query, params }): parse once at the edge, replace the request's values with the result,
// and type them for the handlers after it, so a route reads `req.body.name` with no cast.
import type { RequestHandler } from 'express'
import type { z } from 'zod'

type Schema = z.ZodType | undefined

/** What a schema parses to; a part without a schema is `unknown`, so it cannot be read unchecked. */
type Parsed<S extends Schema> = S extends z.ZodType ? z.output<S> : unknown

export interface RequestSchemas<P extends Schema, Q extends Schema, B extends Schema> {
  params?: P
  query?: Q
  body?: B
}

/**
 * A middleware that reads none of the route's params, query or body (authentication, roles, rate limits,
 * uploads). Its `unknown`s leave Express's inference to validate(): declared as a plain RequestHandler, its
 * ParsedQs / ParamsDictionary would compete with the parsed types and the route would not compile.
 */
export type Middleware = RequestHandler<unknown, unknown, unknown, unknown>

export function validate<
  P extends Schema = undefined,
  Q extends Schema = undefined,
  B extends Schema = undefined,
>(schemas: RequestSchemas<P, Q, B>): RequestHandler<Parsed<P>, unknown, Parsed<B>, Parsed<Q>> {
  return (req, _res, next) => {
    if (schemas.params) req.params = schemas.params.parse(req.params) as Parsed<P>
    // In Express 5 req.query is a getter; shadow it with the parsed value.
    if (schemas.query)
      Object.defineProperty(req, 'query', { value: schemas.query.parse(req.query), writable: true })
    if (schemas.body) req.body = schemas.body.parse(req.body ?? {}) as Parsed<B>
    next()
  }
}

/** A library's middleware (typed with Express's defaults) used as a Middleware: it reads no validated part. */
export const asMiddleware = (handler: RequestHandler): Middleware => handler as Middleware
