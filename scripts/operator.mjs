// An operator command run from its bundle with plain node, so it works in a production install
// (`npm ci --omit=dev`) where tsx is absent: `node scripts/operator.mjs admin-create --email …` runs
// dist/server/admin-create.js with the arguments after the command's name. package.json's admin:create and
// db:reset are this.
import { pathToFileURL } from 'node:url'
import { at, requireBuild } from './built.mjs'

/** The operator commands: scripts/build.ts bundles each from server/scripts/<name>.ts. */
const COMMANDS = ['admin-create', 'db-reset']

const [name] = process.argv.splice(2, 1)
if (!COMMANDS.includes(name)) {
  console.error(`Usage: node scripts/operator.mjs <${COMMANDS.join('|')}> [arguments]`)
  process.exit(2)
}
const bundle = `dist/server/${name}.js`
requireBuild(['server'], [bundle])
// The command reads its own arguments from process.argv, which now holds only those meant for it.
await import(pathToFileURL(at(bundle)).href)
