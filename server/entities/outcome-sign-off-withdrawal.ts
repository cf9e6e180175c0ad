// A sign-off an instructor took back, with why: the sign-off as it was (who signed, when, the note) and
// who withdrew it, when and the reason. The sign-off's row is removed in the same transaction, so the
// outcome can be signed off again; the id is the withdrawn sign-off's. Also written to the audit trail.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { text, timestamp, uuidColumn, belongsTo } from './columns'
import { outcomeSignOffColumns, type OutcomeSignOffRow } from './outcome-sign-off'

export interface OutcomeSignOffWithdrawalRow extends OutcomeSignOffRow {
  withdrawnById: string
  withdrawnAt: string
  reason: string
}

export const OutcomeSignOffWithdrawalEntity = new EntitySchema<OutcomeSignOffWithdrawalRow>({
  name: 'OutcomeSignOffWithdrawal',
  tableName: 'outcome_sign_off_withdrawals',
  columns: {
    ...outcomeSignOffColumns,
    withdrawnById: uuidColumn,
    withdrawnAt: timestamp,
    reason: text,
  },
  indices: [{ name: 'idx_outcome_sign_off_withdrawals_apprentice', columns: ['apprenticeId'] }],
  relations: {
    apprentice: belongsTo('User', 'apprenticeId', 'CASCADE'),
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE'),
    signedBy: belongsTo('User', 'signedById', 'RESTRICT'),
    withdrawnBy: belongsTo('User', 'withdrawnById', 'RESTRICT'),
  } as EntitySchemaOptions<OutcomeSignOffWithdrawalRow>['relations'],
})
