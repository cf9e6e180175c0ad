// validate(): parses params, query and body once, hands the parsed values to the handlers after it (typed),
// and turns a bad request into the 400 every route answers with.
import express from 'express'
import supertest from 'supertest'
import { describe, expect, expectTypeOf, it } from 'vitest'
import { z } from 'zod'
import { errorHandler } from '../../server/middleware/errors'
import { validate, type Middleware } from '../../server/middleware/validate'

const params = z.object({ id: z.uuid() })
const query = z.object({ page: z.coerce.number().int().min(1).default(1) })
const body = z.object({ name: z.string().trim().min(1) })
const ID = '0b7c6a4e-8f3e-4d2a-9c1b-2f5e6d7a8b9c'

function appWith(seen: unknown[]) {
  const passThrough: Middleware = (_req, _res, next) => next()
  const app = express()
  app.use(express.json())
  app.post('/things/:id', passThrough, validate({ params, query, body }), passThrough, (req, res) => {
    // The handler's types are the schemas' outputs: no casts.
    expectTypeOf(req.params).toEqualTypeOf<{ id: string }>()
    expectTypeOf(req.query).toEqualTypeOf<{ page: number }>()
    expectTypeOf(req.body).toEqualTypeOf<{ name: string }>()
    seen.push({ params: req.params, query: req.query, body: req.body })
    res.status(201).json({ page: req.query.page + 1, name: req.body.name })
  })
  app.post('/bare', validate({ body }), (req, res) => {
    // @ts-expect-error a part without a schema is unknown: it cannot be read unchecked
    res.json({ q: req.query.page })
  })
  app.use(errorHandler)
  return app
}

describe('validate()', () => {
  it('hands the handler the parsed values: coerced, trimmed and defaulted', async () => {
    const seen: unknown[] = []
    const res = await supertest(appWith(seen)).post(`/things/${ID}?page=3`).send({ name: '  Bench 4 ' })
    expect(res.status).toBe(201)
    expect(res.body).toEqual({ page: 4, name: 'Bench 4' })
    expect(seen).toEqual([{ params: { id: ID }, query: { page: 3 }, body: { name: 'Bench 4' } }])
  })

  it('fills a missing query value with its default', async () => {
    const seen: unknown[] = []
    await supertest(appWith(seen)).post(`/things/${ID}`).send({ name: 'x' })
    expect(seen).toEqual([{ params: { id: ID }, query: { page: 1 }, body: { name: 'x' } }])
  })

  it('answers 400 with the failing fields and never reaches the handler', async () => {
    const seen: unknown[] = []
    const res = await supertest(appWith(seen)).post('/things/not-a-uuid?page=0').send({ name: ' ' })
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('validation_failed')
    expect(Object.keys(res.body.error.details.fields)).toEqual(['id'])
    expect(seen).toEqual([])
  })

  it('checks the query and the body too', async () => {
    const seen: unknown[] = []
    const badQuery = await supertest(appWith(seen)).post(`/things/${ID}?page=0`).send({ name: 'x' })
    expect(Object.keys(badQuery.body.error.details.fields)).toEqual(['page'])
    const badBody = await supertest(appWith(seen)).post(`/things/${ID}`).send({ name: ' ' })
    expect(Object.keys(badBody.body.error.details.fields)).toEqual(['name'])
    expect(seen).toEqual([])
  })
})
