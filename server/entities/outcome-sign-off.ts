// An instructor's word that an apprentice has shown a learning outcome of an exercise (scenario key + the
// outcome's text), given in one of the instructor's cohorts, with a note. One per apprentice, exercise,
// outcome and cohort; the act is also written to the audit trail.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { text, timestamp, uuidColumn, uuidPrimary, varchar, belongsTo } from './columns'

export interface OutcomeSignOffRow {
  id: string
  apprenticeId: string
  cohortId: string
  scenarioKey: string
  outcome: string
  note: string
  signedById: string
  signedAt: string
}

/** The sign-off's columns; a withdrawn sign-off keeps them all (outcome-sign-off-withdrawal.ts). */
export const outcomeSignOffColumns = {
  id: uuidPrimary,
  apprenticeId: uuidColumn,
  cohortId: uuidColumn,
  scenarioKey: varchar(80),
  outcome: varchar(500),
  note: text,
  signedById: uuidColumn,
  signedAt: timestamp,
}

export const OutcomeSignOffEntity = new EntitySchema<OutcomeSignOffRow>({
  name: 'OutcomeSignOff',
  tableName: 'outcome_sign_offs',
  columns: outcomeSignOffColumns,
  uniques: [
    {
      name: 'uq_outcome_sign_offs',
      columns: ['apprenticeId', 'cohortId', 'scenarioKey', 'outcome'],
    },
  ],
  indices: [{ name: 'idx_outcome_sign_offs_apprentice', columns: ['apprenticeId'] }],
  relations: {
    apprentice: belongsTo('User', 'apprenticeId', 'CASCADE'),
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE'),
    signedBy: belongsTo('User', 'signedById', 'RESTRICT'),
  } as EntitySchemaOptions<OutcomeSignOffRow>['relations'],
})
