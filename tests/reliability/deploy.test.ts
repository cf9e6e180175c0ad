// The deploy path the README gives, from a clean copy of the repository: build (with every dependency),
// `npm ci --omit=dev`, `npm run admin:create`, `npm start` — then the server must serve the client, be ready,
// let the first admin sign in (and no demo account) and grade an attempt, with production dependencies only
// and no TypeScript loader.
import { execFileSync, spawnSync } from 'node:child_process'
import {
  cpSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  symlinkSync,
} from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { fixtureLog } from '../bench/bulk-seed'
import { freePort, launch, ROOT, type ServerProcess } from '../support/server-process'

/** Devdependencies nothing at run time may need (and which no production dependency pulls in). */
const DEV_ONLY = ['@vitejs/plugin-vue', 'vitest', 'vue-tsc', 'eslint', 'supertest', 'autocannon']

/** The files of the repository, as a fresh clone would have them (tracked and new, nothing ignored). */
function repositoryFiles(): string[] {
  try {
    return execFileSync('git', ['ls-files', '-co', '--exclude-standard', '-z'], {
      cwd: ROOT,
      encoding: 'utf8',
    })
      .split('\0')
      .filter((f) => f && existsSync(join(ROOT, f)))
  } catch {
    // Not a git checkout: everything but what a build or an install makes.
    const skip = new Set(['node_modules', 'dist', 'data', '.git', 'coverage', 'test-results'])
    const walk = (dir: string): string[] =>
      readdirSync(join(ROOT, dir), { withFileTypes: true }).flatMap((e) =>
        skip.has(e.name) ? [] : e.isDirectory() ? walk(join(dir, e.name)) : [join(dir, e.name)],
      )
    return walk('')
  }
}

function run(command: string, args: string[], cwd: string, env: NodeJS.ProcessEnv = process.env) {
  const started = performance.now()
  const result = spawnSync(command, args, { cwd, env, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 })
  if (result.status !== 0) {
    throw new Error(
      `${command} ${args.join(' ')} failed (${result.status}):\n${result.stdout}\n${result.stderr}`,
    )
  }
  return (performance.now() - started) / 1000
}

/** The first admin, created with `npm run admin:create` in the deployed copy. */
const ADMIN = {
  email: 'head.of.training@deploy-check.example',
  name: 'Deploy Check',
  password: 'a-long-deploy-check-password',
}

describe('deploying the build with production dependencies only', () => {
  const copy = mkdtempSync(join(tmpdir(), 'slipway-deploy-'))
  const timings: Record<string, number> = {}
  let server: ServerProcess | undefined
  let adminCreateOutput = ''

  beforeAll(async () => {
    let started = performance.now()
    for (const file of repositoryFiles()) {
      mkdirSync(dirname(join(copy, file)), { recursive: true })
      cpSync(join(ROOT, file), join(copy, file))
    }
    timings.copy = (performance.now() - started) / 1000

    // 1. Build, with every dependency (this checkout's, linked in place of an `npm ci`).
    symlinkSync(join(ROOT, 'node_modules'), join(copy, 'node_modules'))
    timings.build = run(process.execPath, ['--import', 'tsx', 'scripts/build.ts', 'client', 'server'], copy, {
      ...process.env,
      TSX_TSCONFIG_PATH: 'tsconfig.node.json',
    })
    rmSync(join(copy, 'node_modules'))

    // 2. Production dependencies only, from the npm cache where it has them. Install scripts are skipped
    // and the natively built modules copied from this checkout instead: better-sqlite3 compiles from source
    // here (its prebuilt download is unreachable), about 75 s for the same binary.
    timings.install = run(
      'npm',
      ['ci', '--omit=dev', '--prefer-offline', '--ignore-scripts', '--no-audit', '--no-fund'],
      copy,
    )
    for (const name of readdirSync(join(copy, 'node_modules'))) {
      const release = join(ROOT, 'node_modules', name, 'build/Release')
      if (!existsSync(release)) continue
      for (const file of readdirSync(release).filter((f) => f.endsWith('.node'))) {
        mkdirSync(join(copy, 'node_modules', name, 'build/Release'), { recursive: true })
        cpSync(join(release, file), join(copy, 'node_modules', name, 'build/Release', file))
      }
    }

    // A minimal environment, as an operator's would be.
    const port = await freePort()
    const env = {
      PATH: process.env.PATH ?? '/usr/bin:/bin',
      HOME: process.env.HOME ?? '/tmp',
      NODE_ENV: 'production',
      PORT: String(port),
      HOST: '127.0.0.1',
      DATA_DIR: join(copy, 'data'),
      PUBLIC_BASE_URL: `http://127.0.0.1:${port}`,
      LOG_LEVEL: 'warn',
    }

    // 3. The first admin, through the npm command the README gives, the password on standard input.
    started = performance.now()
    const adminCreate = spawnSync(
      'npm',
      ['run', '--silent', 'admin:create', '--', '--email', ADMIN.email, '--name', ADMIN.name],
      { cwd: copy, env, input: `${ADMIN.password}\n`, encoding: 'utf8' },
    )
    adminCreateOutput = `${adminCreate.stdout}${adminCreate.stderr}`
    if (adminCreate.status !== 0) {
      throw new Error(`npm run admin:create failed (${adminCreate.status}):\n${adminCreateOutput}`)
    }
    timings.adminCreate = (performance.now() - started) / 1000

    // 4. Start, as an operator would: `npm start` is `node scripts/start.mjs`.
    started = performance.now()
    server = await launch({
      script: join(copy, 'scripts/start.mjs'),
      cwd: copy,
      env,
      port,
      healthPath: '/api/health',
      timeoutMs: 180_000,
    })
    timings.start = (performance.now() - started) / 1000
  })

  afterAll(async () => {
    await server?.stop('SIGKILL')
    rmSync(copy, { recursive: true, force: true })
    console.log(
      `deploy: ${Object.entries(timings)
        .map(([step, s]) => `${step} ${s.toFixed(1)} s`)
        .join(', ')}`,
    )
  })

  it('installed no development-only package and built the server to plain JavaScript', () => {
    for (const name of DEV_ONLY) expect(existsSync(join(copy, 'node_modules', name)), name).toBe(false)
    const pkg = JSON.parse(readFileSync(join(copy, 'package.json'), 'utf8')) as {
      scripts: Record<string, string>
    }
    expect(pkg.scripts.start).toBe('node scripts/start.mjs')
    // No npm command an operator runs goes through a TypeScript loader.
    for (const command of ['start', 'admin:create', 'db:reset']) {
      expect(pkg.scripts[command], command).toMatch(/^node scripts\/[\w-]+\.mjs\b/)
    }
    for (const entry of ['start', 'index', 'grading-worker', 'sqlite-checkpointer', 'admin-create', 'db-reset']) {
      expect(existsSync(join(copy, 'dist/server', `${entry}.js`)), entry).toBe(true)
    }
    // Neither the start script nor admin:create tried to build: there are no build tools.
    expect(server!.output()).not.toMatch(/server built|Building the client/)
    expect(adminCreateOutput).not.toMatch(/server built|no build to run/)
    expect(adminCreateOutput).toContain(`Admin account created for ${ADMIN.name} <${ADMIN.email}>`)
  })

  it('serves the built client and is ready', async () => {
    const page = await fetch(server!.url + '/')
    expect(page.status).toBe(200)
    expect(await page.text()).toContain('<div id="app"')
    const ready = await fetch(server!.url + '/api/ready')
    expect(ready.status).toBe(200)
  })

  const signIn = (email: string, password: string) =>
    fetch(`${server!.url}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email, password }),
    })

  it('seeded no demo account: a production start never does (README, Demo sign-ins)', async () => {
    for (const account of DEMO_ACCOUNTS.filter((a) => a.role === 'admin' || a.role === 'apprentice')) {
      expect((await signIn(account.email, account.password)).status, account.email).toBe(401)
    }
  })

  it('lets the admin from admin:create sign in, and grades an attempt in its grading threads', async () => {
    const signedIn = await signIn(ADMIN.email, ADMIN.password)
    expect(signedIn.status).toBe(200)
    const { accessToken } = (await signedIn.json()) as { accessToken: string }
    const me = (await (
      await fetch(`${server!.url}/api/auth/me`, { headers: { authorization: `Bearer ${accessToken}` } })
    ).json()) as { user: { role: string } }
    expect(me.user.role).toBe('admin')
    const auth = { authorization: `Bearer ${accessToken}` }
    const scenarios = (await (await fetch(`${server!.url}/api/scenarios`, { headers: auth })).json()) as {
      items: { id: string; key: string }[]
    }
    const scenarioId = scenarios.items.find((s) => s.key === 'two-wire-run-stop')!.id
    const submitted = await fetch(`${server!.url}/api/attempts`, {
      method: 'POST',
      headers: { ...auth, 'content-type': 'application/json' },
      body: JSON.stringify({
        id: randomUUID(),
        scenarioId,
        status: 'submitted',
        events: fixtureLog('two-wire-run-stop'),
      }),
    })
    expect(submitted.status).toBe(201)
    expect(((await submitted.json()) as { grade: { passed: boolean } }).grade.passed).toBe(true)
  })

  it('stops cleanly on SIGTERM', async () => {
    const exited = new Promise<number | null>((resolve) =>
      server!.child.once('exit', (code) => resolve(code)),
    )
    server!.child.kill('SIGTERM')
    expect(await exited).toBe(0)
    server = undefined
  })
})
