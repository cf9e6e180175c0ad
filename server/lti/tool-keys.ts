// Slipway's own signing keys (RSA, RS256): the newest unretired key signs service-token assertions and
// deep-linking answers; the key set URL publishes it together with keys retired less than a week ago, so a
// platform that cached the old key set still verifies what was signed just before a rotation.
import { generateKeyPair, randomUUID } from 'node:crypto'
import { promisify } from 'node:util'
import { exportJWK, importPKCS8, SignJWT, type JWK, type JWTPayload } from 'jose'
import { IsNull, MoreThan, type DataSource } from 'typeorm'
import type { ToolKey } from '@shared/api/lti'
import { LtiToolKeyEntity, type LtiToolKeyRow } from '../entities'
import { DAY, nowIso } from '../infrastructure/clock'

export const ALGORITHM = 'RS256'
/** How long a retired key stays in the published key set. */
export const RETIRED_KEY_PUBLISHED_MS = 7 * DAY

async function newKeyRow(): Promise<LtiToolKeyRow> {
  // 2048-bit RSA: the minimum the 1EdTech Security Framework (§6.1) asks of RS256 keys.
  const { publicKey, privateKey } = await promisify(generateKeyPair)('rsa', { modulusLength: 2048 })
  const kid = randomUUID()
  const jwk: JWK = { ...(await exportJWK(publicKey)), kid, alg: ALGORITHM, use: 'sig' }
  return {
    id: kid,
    algorithm: ALGORITHM,
    publicJwk: JSON.stringify(jwk),
    privateKeyPem: privateKey.export({ type: 'pkcs8', format: 'pem' }).toString(),
    createdAt: nowIso(),
    retiredAt: null,
  }
}

const publishedSince = () => new Date(Date.now() - RETIRED_KEY_PUBLISHED_MS).toISOString()

async function publishedRows(ds: DataSource): Promise<LtiToolKeyRow[]> {
  return ds.getRepository(LtiToolKeyEntity).find({
    where: [{ retiredAt: IsNull() }, { retiredAt: MoreThan(publishedSince()) }],
    order: { createdAt: 'DESC' },
  })
}

/** The signing key, made on first use (so a centre without platforms never has one). */
export async function currentKey(ds: DataSource): Promise<LtiToolKeyRow> {
  const repo = ds.getRepository(LtiToolKeyEntity)
  const current = await repo.findOne({ where: { retiredAt: IsNull() }, order: { createdAt: 'DESC' } })
  if (current) return current
  const row = await newKeyRow()
  await repo.insert(row)
  return row
}

/** A new signing key; the old ones stay published for RETIRED_KEY_PUBLISHED_MS. */
export async function rotateKey(ds: DataSource): Promise<void> {
  const row = await newKeyRow()
  await ds.transaction(async (manager) => {
    const repo = manager.getRepository(LtiToolKeyEntity)
    await repo.update({ retiredAt: IsNull() }, { retiredAt: row.createdAt })
    await repo.insert(row)
  })
}

/** The public key set (RFC 7517) platforms fetch from the key set URL. */
export async function publicKeySet(ds: DataSource): Promise<{ keys: JWK[] }> {
  await currentKey(ds)
  return { keys: (await publishedRows(ds)).map((row) => JSON.parse(row.publicJwk) as JWK) }
}

/** The published keys as the admin page lists them (public parts only). */
export async function listToolKeys(ds: DataSource): Promise<ToolKey[]> {
  await currentKey(ds)
  return (await publishedRows(ds)).map((row) => ({
    kid: row.id,
    algorithm: row.algorithm,
    state: row.retiredAt ? ('previous' as const) : ('current' as const),
    createdAt: row.createdAt,
    publishedUntil: row.retiredAt
      ? new Date(Date.parse(row.retiredAt) + RETIRED_KEY_PUBLISHED_MS).toISOString()
      : null,
  }))
}

const imported = new Map<string, Promise<CryptoKey>>()

/** A JWT signed with the current key, its kid in the header (so the platform picks it from the key set). */
export async function signWithToolKey(ds: DataSource, claims: JWTPayload, expiresInSeconds: number) {
  const row = await currentKey(ds)
  let key = imported.get(row.id)
  if (!key) imported.set(row.id, (key = importPKCS8(row.privateKeyPem, ALGORITHM)))
  const now = Math.floor(Date.now() / 1000)
  return new SignJWT(claims)
    .setProtectedHeader({ alg: ALGORITHM, kid: row.id, typ: 'JWT' })
    .setIssuedAt(now)
    .setExpirationTime(now + expiresInSeconds)
    .setJti(randomUUID())
    .sign(await key)
}
