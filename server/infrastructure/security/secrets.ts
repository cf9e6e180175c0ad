// The JWT signing secret: from JWT_SECRET, else generated once and kept in DATA_DIR/secrets.
import { randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'

export function loadOrCreateJwtSecret(dataDir: string, fromEnv?: string): string {
  if (fromEnv) return fromEnv
  const dir = join(dataDir, 'secrets')
  const file = join(dir, 'jwt-secret')
  if (existsSync(file)) return readFileSync(file, 'utf8').trim()
  mkdirSync(dir, { recursive: true, mode: 0o700 })
  const secret = randomBytes(48).toString('base64url')
  writeFileSync(file, secret + '\n', { mode: 0o600, flag: 'wx' })
  return secret
}
