// The durable job queue (mail first), and the Message-ID the embedded relay keeps each message once by.
// Table API, so the same migration runs on SQLite and PostgreSQL.
import { randomUUID } from 'node:crypto'
import { Table, TableColumn, TableIndex, type MigrationInterface, type QueryRunner } from 'typeorm'

const varchar = (name: string, length: number, isNullable = false) => ({
  name,
  type: 'varchar',
  length: String(length),
  isNullable,
})
const timestamp = (name: string, isNullable = false) => varchar(name, 32, isNullable)

export class JobQueue1765000000000 implements MigrationInterface {
  name = 'JobQueue1765000000000'

  async up(q: QueryRunner): Promise<void> {
    await q.createTable(
      new Table({
        name: 'jobs',
        columns: [
          { name: 'id', type: 'varchar', length: '36', isPrimary: true },
          varchar('kind', 64),
          { name: 'payload', type: 'text', isNullable: false },
          varchar('status', 16),
          timestamp('runAt'),
          { name: 'attempts', type: 'integer', isNullable: false },
          { name: 'maxAttempts', type: 'integer', isNullable: false },
          varchar('lockedBy', 64, true),
          timestamp('lockedUntil', true),
          { name: 'lastError', type: 'text', isNullable: true },
          varchar('dedupeKey', 200, true),
          varchar('label', 320),
          timestamp('createdAt'),
          timestamp('updatedAt'),
          timestamp('finishedAt', true),
        ],
        indices: [
          new TableIndex({ name: 'idx_jobs_status_run_at', columnNames: ['status', 'runAt'] }),
          new TableIndex({ name: 'idx_jobs_kind_created', columnNames: ['kind', 'createdAt'] }),
          new TableIndex({ name: 'uq_jobs_dedupe_key', columnNames: ['dedupeKey'], isUnique: true }),
        ],
      }),
      false,
      true,
      true,
    )
    await q.addColumn('mail_messages', new TableColumn(varchar('messageId', 255, true)))
    await q.createIndex(
      'mail_messages',
      new TableIndex({ name: 'uq_mail_messages_message_id', columnNames: ['messageId'], isUnique: true }),
    )
    await listEarlierMail(q)
  }

  async down(q: QueryRunner): Promise<void> {
    await q.dropIndex('mail_messages', 'uq_mail_messages_message_id')
    await q.dropColumn('mail_messages', 'messageId')
    await q.dropTable('jobs')
  }
}

/** Mail the embedded relay received before the queue existed, listed in the outbox as sent. */
async function listEarlierMail(q: QueryRunner) {
  const rows = (await q.query(
    'SELECT "toAddress", "subject", "text", "html", "receivedAt" FROM "mail_messages"',
  )) as { toAddress: string; subject: string; text: string; html: string; receivedAt: string }[]
  const postgres = q.connection.driver.options.type === 'postgres'
  const columns = ['id', 'kind', 'payload', 'status', 'runAt', 'attempts', 'maxAttempts', 'label']
  const stamps = ['createdAt', 'updatedAt', 'finishedAt']
  const placeholders = [...columns, ...stamps].map((_, i) => (postgres ? `$${i + 1}` : '?')).join(', ')
  const sql = `INSERT INTO "jobs" (${[...columns, ...stamps].map((c) => `"${c}"`).join(', ')}) VALUES (${placeholders})`
  for (const row of rows) {
    const payload = JSON.stringify({
      to: row.toAddress,
      subject: row.subject,
      text: row.text,
      html: row.html,
    })
    const at = row.receivedAt
    await q.query(sql, [
      randomUUID(),
      'mail',
      payload,
      'done',
      at,
      1,
      1,
      row.toAddress.slice(0, 320),
      at,
      at,
      at,
    ])
  }
}
