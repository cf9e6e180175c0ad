// The SSE writer (server/live/sse.ts) on a real listening server: the headers that keep proxies from
// buffering, id/event/data frames, the comment heartbeat, Last-Event-ID over ?after=, and the end from either
// side (the client going away, the server draining).
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import express from 'express'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createLifecycle } from '../../server/infrastructure/http/lifecycle'
import { openSse, resumeAfter, type SseStream } from '../../server/live/sse'

describe('server-sent events', () => {
  const lifecycle = createLifecycle()
  const streams: SseStream[] = []
  const closed: number[] = []
  let server: Server
  let url: string
  beforeAll(async () => {
    const app = express()
    app.use(lifecycle.middleware)
    app.get('/stream', (req, res) => {
      const after = resumeAfter(
        req,
        typeof req.query.after === 'string' ? Number(req.query.after) : undefined,
      )
      const stream = openSse(req, res, lifecycle, 50)
      const n = streams.push(stream)
      stream.onClose(() => closed.push(n))
      stream.send('hello', { after: after ?? null }, 7)
    })
    server = app.listen(0, '127.0.0.1')
    await new Promise((resolve) => server.once('listening', resolve))
    url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/stream`
  })
  afterAll(async () => {
    server.closeAllConnections()
    await new Promise((resolve) => server.close(resolve))
  })

  async function read(headers: Record<string, string> = {}, query = '') {
    const abort = new AbortController()
    const response = await fetch(url + query, { headers, signal: abort.signal })
    const reader = response.body!.getReader()
    let text = ''
    const until = async (pattern: RegExp) => {
      while (!pattern.test(text)) {
        const { value, done } = await reader.read()
        if (done) return false
        text += new TextDecoder().decode(value)
      }
      return true
    }
    return { response, until, text: () => text, abort: () => abort.abort() }
  }

  it('sends unbuffered headers, id/event/data frames and a comment heartbeat', async () => {
    const s = await read({}, '?after=3')
    expect(s.response.headers.get('content-type')).toMatch(/^text\/event-stream/)
    expect(s.response.headers.get('cache-control')).toContain('no-transform')
    expect(s.response.headers.get('x-accel-buffering')).toBe('no')
    await s.until(/event: hello/)
    expect(s.text()).toContain('id: 7\nevent: hello\ndata: {"after":3}\n\n')
    expect(await s.until(/: keep-alive\n\n/)).toBe(true)
    s.abort()
  })

  it('prefers Last-Event-ID to ?after=, and ignores one that is not a whole number', async () => {
    const header = await read({ 'Last-Event-ID': '12' }, '?after=3')
    await header.until(/data: /)
    expect(header.text()).toContain('data: {"after":12}')
    header.abort()
    const junk = await read({ 'Last-Event-ID': 'abc' })
    await junk.until(/data: /)
    expect(junk.text()).toContain('data: {"after":null}')
    junk.abort()
  })

  it('runs its close listeners when the client goes away', async () => {
    const s = await read()
    await s.until(/data: /)
    const n = streams.length
    s.abort()
    await expect.poll(() => closed.includes(n)).toBe(true)
    expect(streams[n - 1]!.closed).toBe(true)
  })

  it('ends every open stream when the server drains, so none holds the shutdown', async () => {
    const s = await read()
    await s.until(/data: /)
    expect(lifecycle.inFlight).toBe(1)
    expect(await lifecycle.drain(2000)).toBe(true)
    expect(await s.until(/never/)).toBe(false) // the server ended the body
    expect(lifecycle.inFlight).toBe(0)
  })
})
