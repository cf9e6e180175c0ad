// `npm run admin:create -- --email you@example.org --name "Your Name"`: creates an admin account in the
// database the environment names (DATA_DIR / DATABASE_URL, as the server reads them), migrating it first.
// ADMIN_EMAIL and ADMIN_NAME stand in for a missing --email or --name.
// The password comes from ADMIN_PASSWORD, else is asked for twice on the terminal (not shown), else is the
// first line of standard input (`printf '%s\n' "$PW" | npm run admin:create -- …`). A thin entry: the work
// is createAdminAccount in users/first-admin.service.ts.
import { createInterface } from 'node:readline'
import { parseArgs } from 'node:util'
import { ConfigError, loadConfig } from '../config'
import { dataSourceOptionsFor, openDatabase } from '../infrastructure/database/data-source'
import { createPasswordHasher } from '../infrastructure/security/passwords'
import { AdminAccountError, createAdminAccount } from '../users/first-admin.service'

const USAGE = 'Usage: npm run admin:create -- --email you@example.org --name "Your Name"'

/** Reads a line from the terminal without echoing it. */
function askHidden(prompt: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const input = process.stdin
    process.stdout.write(prompt)
    input.setRawMode(true)
    input.resume()
    input.setEncoding('utf8')
    let value = ''
    const done = (error?: Error) => {
      input.setRawMode(false)
      input.pause()
      input.off('data', onData)
      process.stdout.write('\n')
      if (error) reject(error)
      else resolve(value)
    }
    const onData = (chunk: string) => {
      for (const char of chunk) {
        if (char === '\r' || char === '\n') return done()
        if (char === '\u0003') return done(new Error('Cancelled'))
        if (char === '\u007f' || char === '\b') value = value.slice(0, -1)
        else value += char
      }
    }
    input.on('data', onData)
  })
}

async function firstLineOfStdin(): Promise<string> {
  const lines = createInterface({ input: process.stdin })
  for await (const line of lines) {
    lines.close()
    return line
  }
  return ''
}

async function readPassword(): Promise<string> {
  if (process.env.ADMIN_PASSWORD) return process.env.ADMIN_PASSWORD
  if (!process.stdin.isTTY) return firstLineOfStdin()
  const first = await askHidden('Password (at least 12 characters): ')
  const again = await askHidden('The same password again: ')
  if (first !== again) throw new AdminAccountError('The two passwords differ; nothing was created')
  return first
}

async function main(): Promise<number> {
  let values: { email?: string; name?: string; help?: boolean }
  try {
    ;({ values } = parseArgs({
      options: { email: { type: 'string' }, name: { type: 'string' }, help: { type: 'boolean', short: 'h' } },
    }))
  } catch (error) {
    console.error(`${(error as Error).message}\n${USAGE}`)
    return 2
  }
  const email = values.email ?? process.env.ADMIN_EMAIL
  const name = values.name ?? process.env.ADMIN_NAME
  if (values.help || !email || !name) {
    console.error(USAGE)
    return values.help ? 0 : 2
  }
  // The ADMIN_ variables are this command's input here, not the server's start-up admin.
  const config = loadConfig({ ...process.env, ADMIN_EMAIL: '', ADMIN_NAME: '', ADMIN_PASSWORD: '' })
  const password = await readPassword()
  const dataSource = await openDatabase(dataSourceOptionsFor(config))
  try {
    const user = await createAdminAccount(
      dataSource,
      createPasswordHasher(config.passwordHashing),
      { email, name, password },
      'Admin account created with npm run admin:create',
    )
    console.log(`Admin account created for ${user.name} <${user.email}>. Sign in with it now.`)
    return 0
  } finally {
    await dataSource.destroy()
  }
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    if (error instanceof AdminAccountError || error instanceof ConfigError) {
      console.error(error.message)
      process.exit(1)
    }
    console.error(error)
    process.exit(1)
  },
)
