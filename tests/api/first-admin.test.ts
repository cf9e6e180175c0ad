// Demo data only for the demo, and the first admin of a production database: from ADMIN_EMAIL, ADMIN_NAME and
// ADMIN_PASSWORD at start, or from `npm run admin:create`.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { pino } from 'pino'
import supertest from 'supertest'
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { ConfigError, loadConfig } from '../../server/config'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { AuditEntryEntity, ScenarioEntity, UserEntity } from '../../server/entities'
import { prepareDatabase, startupNotices } from '../../server/prepare-database'
import { FIRST_ADMIN_HELP } from '../../server/users/first-admin.service'
import { createTestApi, TEST_JWT_SECRET, type TestApi } from '../support/api-harness'
import { runScript } from '../support/server-process'
import { createTestDatabase, type TestDatabase } from '../support/test-database'

const log = pino({ level: 'silent' })
const ADMIN = { ADMIN_EMAIL: 'Head.Of.Centre@Slipway.test', ADMIN_NAME: 'Wilhelmina Ashgrove' }
const PASSWORD = 'a long first admin phrase'

describe('configuration', () => {
  it('seeds no demo unless DEMO=true', () => {
    expect(loadConfig({ NODE_ENV: 'production' }).demo).toBe(false)
    expect(loadConfig({}).demo).toBe(false)
    expect(loadConfig({ DEMO: 'true' }).demo).toBe(true)
    expect(() => loadConfig({ DEMO: 'yes' })).toThrow(/DEMO must be true or false/)
  })

  it('reads the first admin from all three ADMIN_ variables, checked like the sign-up form', () => {
    expect(loadConfig({ ...ADMIN, ADMIN_PASSWORD: PASSWORD }).firstAdmin).toEqual({
      email: 'head.of.centre@slipway.test',
      name: 'Wilhelmina Ashgrove',
      password: PASSWORD,
    })
    expect(loadConfig({}).firstAdmin).toBeUndefined()
    expect(() => loadConfig({ ADMIN_EMAIL: ADMIN.ADMIN_EMAIL })).toThrow(
      /ADMIN_NAME: set ADMIN_EMAIL, ADMIN_NAME and ADMIN_PASSWORD together/,
    )
    expect(() => loadConfig({ ...ADMIN, ADMIN_PASSWORD: 'short' })).toThrow(ConfigError)
    expect(() => loadConfig({ ...ADMIN, ADMIN_PASSWORD: 'short' })).toThrow(/ADMIN_PASSWORD: Use at least 12/)
  })
})

describe('preparing the database at start', () => {
  let api: TestApi
  beforeEach(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterEach(() => api.close())

  const users = () => api.dataSource.getRepository(UserEntity).find({ order: { email: 'ASC' } })

  it('imports the shipped scenarios but no demo accounts in a production start, and says how to make an admin', async () => {
    await prepareDatabase(api.dataSource, { config: { demo: false }, passwords: api.passwords, log })
    expect(await users()).toEqual([])
    expect(await api.dataSource.getRepository(ScenarioEntity).count()).toBeGreaterThan(0)
    expect(await startupNotices(api.dataSource, { demo: false })).toEqual([FIRST_ADMIN_HELP])
    expect(FIRST_ADMIN_HELP).toMatch(/npm run admin:create -- --email/)
    expect(FIRST_ADMIN_HELP).toMatch(/ADMIN_EMAIL, ADMIN_NAME and ADMIN_PASSWORD/)
  })

  it('seeds the demo centre into an empty database when asked for', async () => {
    await prepareDatabase(api.dataSource, { config: { demo: true }, passwords: api.passwords, log })
    expect((await users()).map((u) => u.email)).toEqual(DEMO_ACCOUNTS.map((a) => a.email).sort())
    const notices = await startupNotices(api.dataSource, { demo: true })
    expect(notices).toHaveLength(1)
    expect(notices[0]).toContain(DEMO_ACCOUNTS[0]!.email)
  })

  it('creates the admin from the environment once, when the database has none, and the admin can sign in', async () => {
    const firstAdmin = loadConfig({ ...ADMIN, ADMIN_PASSWORD: PASSWORD }).firstAdmin
    await prepareDatabase(api.dataSource, {
      config: { demo: false, firstAdmin },
      passwords: api.passwords,
      log,
    })
    // A restart with other values changes nothing: an admin exists.
    const other = loadConfig({ ADMIN_EMAIL: 'x@slipway.test', ADMIN_NAME: 'X', ADMIN_PASSWORD: PASSWORD })
    await prepareDatabase(api.dataSource, {
      config: { demo: false, firstAdmin: other.firstAdmin },
      passwords: api.passwords,
      log,
    })
    expect((await users()).map((u) => [u.email, u.role, u.active])).toEqual([
      ['head.of.centre@slipway.test', 'admin', true],
    ])
    expect(await startupNotices(api.dataSource, { demo: false })).toEqual([])
    expect(await api.dataSource.getRepository(AuditEntryEntity).countBy({ action: 'account.created' })).toBe(
      1,
    )
    const signIn = await supertest(api.app)
      .post('/api/auth/sign-in')
      .send({ email: 'head.of.centre@slipway.test', password: PASSWORD })
    expect(signIn.status).toBe(200)
  })

  it('starts anyway when ADMIN_EMAIL names an existing account, creating nothing', async () => {
    const person = await api.createUser('instructor', { email: 'taken@slipway.test' })
    const firstAdmin = loadConfig({
      ...ADMIN,
      ADMIN_EMAIL: person.email,
      ADMIN_PASSWORD: PASSWORD,
    }).firstAdmin
    await prepareDatabase(api.dataSource, {
      config: { demo: false, firstAdmin },
      passwords: api.passwords,
      log,
    })
    expect((await users()).map((u) => [u.email, u.role])).toEqual([['taken@slipway.test', 'instructor']])
    expect(await startupNotices(api.dataSource, { demo: false })).toEqual([FIRST_ADMIN_HELP])
  })

  it('warns when a production start finds the demo accounts, whose password is published', async () => {
    await prepareDatabase(api.dataSource, { config: { demo: true }, passwords: api.passwords, log })
    const notices = await startupNotices(api.dataSource, { demo: false })
    expect(notices.at(-1)).toMatch(/demo accounts, whose password is published/)
  })
})

describe('npm run admin:create', () => {
  let dataDir: string
  let db: TestDatabase
  beforeAll(async () => {
    dataDir = mkdtempSync(join(tmpdir(), 'slipway-admin-create-'))
    db = await createTestDatabase(dataDir)
  })
  afterAll(async () => {
    await db.drop()
    rmSync(dataDir, { recursive: true, force: true })
  })

  /** The command against the test database. */
  const run = (args: string[], options: { env?: Record<string, string>; input?: string } = {}) =>
    runScript('server/scripts/admin-create.ts', args, {
      input: options.input,
      env: { DATA_DIR: dataDir, DATABASE_URL: db.url, JWT_SECRET: TEST_JWT_SECRET, ...options.env },
    })

  it('creates an admin with the password from standard input, and refuses the same address twice', async () => {
    const args = ['--email', 'Founding.Admin@Slipway.test', '--name', 'Tamsin Oakridge']
    const created = await run(args, { input: `${PASSWORD}\n` })
    expect(created.out).toContain('Admin account created for Tamsin Oakridge <founding.admin@slipway.test>')
    expect(created.code).toBe(0)
    const again = await run(args, { env: { ADMIN_PASSWORD: PASSWORD } })
    expect(again.code).toBe(1)
    expect(again.out).toContain('founding.admin@slipway.test already has an account')
  }, 60_000)

  it('refuses a short password and explains the usage when an argument is missing', async () => {
    const weak = await run(['--email', 'weak@slipway.test', '--name', 'Weak'], { input: 'short\n' })
    expect(weak.code).toBe(1)
    expect(weak.out).toMatch(/password: Use at least 12 characters/)
    const missing = await run(['--email', 'nobody@slipway.test'])
    expect(missing.code).toBe(2)
    expect(missing.out).toContain('Usage: npm run admin:create -- --email')
  }, 60_000)
})
