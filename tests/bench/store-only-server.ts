// The submission benchmark's baseline: the least a server must do to accept an attempt — parse the same
// JSON body and commit it to the same database file with the same durability (openDatabase: WAL,
// synchronous FULL, the same TypeORM entities, indexes and triggers) — and nothing else: no sign-in,
// validation, grading, mail or response shape. Bundled and run with plain node like the server.
import express from 'express'
import { AttemptEntity } from '../../server/entities'
import { openDatabase } from '../../server/infrastructure/database/data-source'

const env = (name: string) => {
  const value = process.env[name]
  if (!value) throw new Error(`${name} is not set`)
  return value
}
const userId = env('STORE_USER_ID')
const scenarioId = env('STORE_SCENARIO_ID')
const dataSource = await openDatabase({ databasePath: env('STORE_DATABASE_PATH') })

const app = express()
app.get('/', (_req, res) => {
  res.json({})
})
app.post('/attempts', express.json({ limit: '2mb' }), async (req, res) => {
  const body = req.body as { id: string; assignmentId: string; events: unknown[] }
  const now = new Date().toISOString()
  await dataSource.transaction((manager) =>
    manager.getRepository(AttemptEntity).insert({
      id: body.id,
      userId,
      assignmentId: body.assignmentId,
      scenarioId,
      status: 'submitted',
      events: JSON.stringify(body.events),
      eventCount: body.events.length,
      late: false,
      startedAt: now,
      updatedAt: now,
      submittedAt: now,
      autoScore: null,
      autoPassed: null,
      score: null,
      passed: null,
      evidence: null,
      gradedAt: null,
    }),
  )
  res.status(201).json({ id: body.id })
})
app.listen(Number(env('PORT')), '127.0.0.1')
