// npm run scenarios:check [files…]: validates scenario files (default: every scenarios/*.json),
// prints every problem with its file and JSON path, and exits non-zero when there is any.
import { readdirSync, readFileSync } from 'node:fs'
import { basename, join, resolve } from 'node:path'
import { checkScenario, methodProblems, type ScenarioProblem } from '../../shared/scenario'

interface FileReport {
  file: string
  id?: string
  problems: ScenarioProblem[]
}

export function checkScenarioFile(file: string): FileReport {
  let json: unknown
  try {
    json = JSON.parse(readFileSync(file, 'utf8'))
  } catch (error) {
    return { file, problems: [{ path: '$', place: '', message: `not readable as JSON: ${(error as Error).message}` }] }
  }
  const result = checkScenario(json)
  if (!result.ok) return { file, problems: result.problems }
  return { file, id: result.scenario.id, problems: methodProblems(result.scenario) }
}

export function checkScenarioFiles(files: string[]): FileReport[] {
  const reports = files.map(checkScenarioFile)
  const seen = new Map<string, string>()
  for (const report of reports) {
    if (!report.id) continue
    const other = seen.get(report.id)
    if (other)
      report.problems.push({
        path: '$.id',
        place: 'Key',
        message: `the id "${report.id}" is also used by ${basename(other)}`,
      })
    else seen.set(report.id, report.file)
  }
  return reports
}

function main(): void {
  const args = process.argv.slice(2)
  const dir = resolve(import.meta.dirname, '../..', 'scenarios')
  const files =
    args.length > 0
      ? args.map((f) => resolve(f))
      : readdirSync(dir)
          .filter((f) => f.endsWith('.json'))
          .sort()
          .map((f) => join(dir, f))
  if (files.length === 0) {
    console.error('No scenario files found.')
    process.exit(1)
  }
  const reports = checkScenarioFiles(files)
  let count = 0
  for (const report of reports) {
    for (const problem of report.problems) {
      console.error(`${basename(report.file)}: ${problem.path}: ${problem.message}`)
      count++
    }
  }
  const good = reports.filter((r) => r.problems.length === 0).length
  console.log(`${good} of ${reports.length} scenario files valid; ${count} problem(s).`)
  process.exit(count > 0 ? 1 : 0)
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) main()
