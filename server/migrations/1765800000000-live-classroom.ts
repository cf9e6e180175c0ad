// Live classroom (issue 18; entities/live.ts): live sessions, their events, the instructors' commands and the
// open watch streams. Table API: SQLite and PostgreSQL.
import {
  Table,
  TableForeignKey,
  TableIndex,
  TableUnique,
  type MigrationInterface,
  type QueryRunner,
} from 'typeorm'

const fk = (column: string, table: string, referenced = 'id') =>
  new TableForeignKey({
    columnNames: [column],
    referencedTableName: table,
    referencedColumnNames: [referenced],
    onDelete: 'CASCADE',
  })
const uuid = (name: string, isNullable = false) => ({ name, type: 'varchar', length: '36', isNullable })
const time = (name: string, isNullable = false) => ({ name, type: 'varchar', length: '32', isNullable })

export class LiveClassroom1765800000000 implements MigrationInterface {
  name = 'LiveClassroom1765800000000'

  async up(q: QueryRunner): Promise<void> {
    await q.createTable(
      new Table({
        name: 'live_sessions',
        columns: [
          { ...uuid('attemptId'), isPrimary: true },
          uuid('apprenticeId'),
          uuid('scenarioId'),
          uuid('assignmentId', true),
          { name: 'assistance', type: 'varchar', length: '16', isNullable: false },
          time('openedAt'),
          time('lastSeenAt'),
          time('lastActionAt', true),
          time('endedAt', true),
          { name: 'eventCount', type: 'integer', isNullable: false },
          { name: 'status', type: 'text', isNullable: true },
        ],
        indices: [
          new TableIndex({ name: 'idx_live_sessions_apprentice', columnNames: ['apprenticeId'] }),
          new TableIndex({ name: 'idx_live_sessions_assignment', columnNames: ['assignmentId'] }),
        ],
        foreignKeys: [
          fk('apprenticeId', 'users'),
          fk('scenarioId', 'scenarios'),
          fk('assignmentId', 'assignments'),
        ],
      }),
      false,
      true,
      true,
    )
    await q.createTable(
      new Table({
        name: 'live_events',
        columns: [
          { ...uuid('attemptId'), isPrimary: true },
          { name: 'eventIndex', type: 'integer', isPrimary: true, isNullable: false },
          { name: 'event', type: 'text', isNullable: false },
        ],
        foreignKeys: [fk('attemptId', 'live_sessions', 'attemptId')],
      }),
      false,
      true,
      true,
    )
    await q.createTable(
      new Table({
        name: 'live_commands',
        columns: [
          { ...uuid('id'), isPrimary: true },
          uuid('attemptId'),
          { name: 'kind', type: 'varchar', length: '16', isNullable: false },
          { name: 'payload', type: 'text', isNullable: false },
          uuid('byId'),
          time('at'),
          { name: 'sequence', type: 'integer', isNullable: false },
        ],
        uniques: [
          new TableUnique({
            name: 'uq_live_commands_attempt_sequence',
            columnNames: ['attemptId', 'sequence'],
          }),
        ],
        foreignKeys: [fk('attemptId', 'live_sessions', 'attemptId'), fk('byId', 'users')],
      }),
      false,
      true,
      true,
    )
    await q.createTable(
      new Table({
        name: 'live_watchers',
        columns: [{ ...uuid('id'), isPrimary: true }, uuid('attemptId'), uuid('userId'), time('seenAt')],
        indices: [new TableIndex({ name: 'idx_live_watchers_attempt', columnNames: ['attemptId'] })],
        foreignKeys: [fk('attemptId', 'live_sessions', 'attemptId'), fk('userId', 'users')],
      }),
      false,
      true,
      true,
    )
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of ['live_watchers', 'live_commands', 'live_events', 'live_sessions'])
      await q.dropTable(table)
  }
}
