// Public interface of the records (see README.md beside this file): pure builders from plain view
// models to PDF bytes, and the commissioning record's view model from an attempt.
export { buildCommissioningView, type CommissioningRecordInput } from './commissioningView'
export { commissioningRecordDocument, commissioningRecordPdf } from './commissioningRecord'
export { trainingRecordDocument, trainingRecordPdf } from './trainingRecord'
export { trendChartSvg } from './trendChart'
export { ASSISTANCE_LEVELS, formatDate, formatDateTime, type AssistanceLevel, type Clock } from './format'
export type * from './types'
