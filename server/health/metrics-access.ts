// Who may read /api/metrics. With METRICS_TOKEN set: whoever sends `Authorization: Bearer <token>`. Without
// it: only a scraper on this machine talking to the server directly — a request that came through a reverse
// proxy carries X-Forwarded-For (or Forwarded) and is refused even though the proxy connects from loopback.
import { timingSafeEqual } from 'node:crypto'
import type { IncomingMessage } from 'node:http'

const LOOPBACK = /^(127\.\d+\.\d+\.\d+|::1|::ffff:127\.\d+\.\d+\.\d+)$/

function sameToken(given: string, expected: string): boolean {
  const a = Buffer.from(given)
  const b = Buffer.from(expected)
  return a.length === b.length && timingSafeEqual(a, b)
}

export function mayReadMetrics(req: IncomingMessage, token: string | undefined): boolean {
  if (token) {
    const header = req.headers.authorization ?? ''
    return header.startsWith('Bearer ') && sameToken(header.slice('Bearer '.length).trim(), token)
  }
  const proxied = req.headers['x-forwarded-for'] !== undefined || req.headers.forwarded !== undefined
  return !proxied && LOOPBACK.test(req.socket.remoteAddress ?? '')
}
