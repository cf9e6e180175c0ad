// `npm run scenarios:check`: every problem of every file with its JSON path, and a non-zero exit.
import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { checkScenarioFiles } from '../../../server/scripts/check-scenarios'

const root = resolve(import.meta.dirname, '../../..')
const shipped = (name: string) => join(root, 'scenarios', name)

function tempScenario(edit: (s: Record<string, unknown>) => void, name = 'bad.json'): string {
  const scenario = JSON.parse(readFileSync(shipped('two-wire-run-stop.json'), 'utf8')) as Record<
    string,
    unknown
  >
  edit(scenario)
  const file = join(mkdtempSync(join(tmpdir(), 'slipway-scenario-')), name)
  writeFileSync(file, JSON.stringify(scenario))
  return file
}

describe('scenarios:check', () => {
  it('reports every problem of a bad file with its path', () => {
    const bad = tempScenario((s) => {
      ;(s.start as { settings: Record<string, unknown> }).settings['speed.maximum'] = 60
      s.passMark = 500
    })
    const [report] = checkScenarioFiles([bad])
    expect(report.problems.map((p) => p.path)).toEqual(['$.start.settings["speed.maximum"]', '$.passMark'])
  })

  it('reports a file that is not JSON', () => {
    const file = join(mkdtempSync(join(tmpdir(), 'slipway-scenario-')), 'broken.json')
    writeFileSync(file, '{ "id": ')
    expect(checkScenarioFiles([file])[0].problems[0].message).toMatch(/^not readable as JSON/)
  })

  it('reports two files that share an id', () => {
    const copy = tempScenario(() => {}, 'copy.json')
    const reports = checkScenarioFiles([shipped('two-wire-run-stop.json'), copy])
    expect(reports[1].problems).toMatchObject([
      { path: '$.id', message: 'the id "two-wire-run-stop" is also used by two-wire-run-stop.json' },
    ])
  })

  it('exits non-zero and prints file, path and message', () => {
    const bad = tempScenario((s) => {
      s.version = 0
    })
    const run = spawnSync(
      process.execPath,
      [
        join(root, 'node_modules/tsx/dist/cli.mjs'),
        '--tsconfig',
        'tsconfig.node.json',
        'server/scripts/check-scenarios.ts',
        bad,
      ],
      { cwd: root, encoding: 'utf8' },
    )
    expect(run.status).toBe(1)
    expect(run.stderr).toMatch(/^bad\.json: \$\.version: /m)
  }, 30_000)

  it('exits zero on the shipped scenarios', () => {
    const run = spawnSync(
      process.execPath,
      [
        join(root, 'node_modules/tsx/dist/cli.mjs'),
        '--tsconfig',
        'tsconfig.node.json',
        'server/scripts/check-scenarios.ts',
      ],
      { cwd: root, encoding: 'utf8' },
    )
    expect(run.status).toBe(0)
    expect(run.stdout).toMatch(/^(\d+) of \1 scenario files valid; 0 problem\(s\)\./m)
  }, 30_000)
})
