// The training record of one apprentice, as a pdfmake document and as PDF bytes: each learning outcome
// with the attempt and date that showed it and the instructor's sign-off, every submitted attempt's
// score, the safety record, signature lines.
import type { Content, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces'
import { formatAttemptTime, formatDate, formatDateTime, formatScore } from './format'
import {
  SIMULATOR_NOTICE,
  TABLE_LAYOUT,
  clockOf,
  documentBase,
  footer,
  headerRow,
  heading,
  renderPdf,
  signatureBlock,
} from './pdf'
import type { OutcomeLine, TrainingRecordView } from './types'

export function trainingRecordDocument(view: TrainingRecordView): TDocumentDefinitions {
  const clock = clockOf(view)
  const shown = view.outcomes.filter((o) => o.shownBy).length
  const signed = view.outcomes.filter((o) => o.signOff).length
  const withdrawnCount = view.outcomes.reduce((n, o) => n + o.withdrawn.length, 0)
  // A withdrawn sign-off stays on the record, struck through in words: who signed, who withdrew it and why.
  const withdrawals = (o: OutcomeLine): Content[] =>
    o.withdrawn.map((w) => ({
      text: `Sign-off by ${w.by} (${formatDate(w.at, clock)}) withdrawn by ${w.withdrawnBy}, ${formatDate(w.withdrawnAt, clock)}: ${w.reason}`,
      fontSize: 8,
      color: '#8a1c1c',
      margin: [0, 2, 0, 0],
    }))
  const outcomes: TableCell[][] = view.outcomes.map((o) => [
    { stack: [{ text: o.outcome }, { text: o.scenarioTitle, style: 'small' }] },
    o.shownBy
      ? { text: `${o.shownBy.attemptLabel}, ${formatDate(o.shownBy.at, clock)}` }
      : { text: 'Not yet shown', color: '#666666' },
    { text: o.shownBy ? formatScore(o.shownBy.score) : '—', alignment: 'right' },
    o.signOff
      ? {
          stack: [
            { text: `${o.signOff.by}, ${formatDate(o.signOff.at, clock)}`, bold: true },
            ...(o.signOff.note ? [{ text: o.signOff.note, fontSize: 9 }] : []),
            ...withdrawals(o),
          ],
        }
      : { stack: [{ text: 'Not signed off', color: '#666666' }, ...withdrawals(o)] },
  ])
  const attempts: TableCell[][] = view.attempts.map((a) => [
    a.scenarioTitle,
    a.attemptLabel,
    formatDate(a.submittedAt, clock),
    { text: `${formatScore(a.score)}${a.overridden ? ' *' : ''}`, alignment: 'right' },
    { text: a.passed ? 'Passed' : 'Not passed', style: a.passed ? 'met' : 'missed' },
    { text: String(a.safetyViolations), alignment: 'right' },
  ])
  const unsafe = view.safety.length
  const content: Content[] = [
    { text: 'Training record', style: 'title' },
    { text: view.centre.name, style: 'subtitle' },
    {
      table: {
        widths: [120, '*'],
        body: [
          [{ text: 'Apprentice', bold: true }, view.apprentice.name],
          [{ text: 'Cohort', bold: true }, view.cohorts.length > 0 ? view.cohorts.join(', ') : 'None'],
          [{ text: 'Instructor', bold: true }, view.instructor?.name ?? 'Not assigned'],
          [
            { text: 'Outcomes', bold: true },
            `${shown} of ${view.outcomes.length} shown, ${signed} signed off` +
              (withdrawnCount
                ? `, ${withdrawnCount} ${withdrawnCount === 1 ? 'sign-off' : 'sign-offs'} withdrawn`
                : ''),
          ],
          [{ text: 'Record made', bold: true }, formatDateTime(view.generatedAt, clock)],
        ],
      },
      layout: TABLE_LAYOUT,
    },
    { text: SIMULATOR_NOTICE, style: 'notice' },
    heading('Learning outcomes'),
    view.outcomes.length === 0
      ? { text: 'No learning outcomes yet: no exercises have been assigned.' }
      : {
          table: {
            headerRows: 1,
            dontBreakRows: true,
            widths: ['*', 100, 40, 140],
            body: [
              headerRow(['Outcome (exercise)', 'Shown by', 'Score', 'Instructor sign-off']),
              ...outcomes,
            ],
          },
          layout: TABLE_LAYOUT,
        },
    heading('Attempts and scores'),
    view.attempts.length === 0
      ? { text: 'No attempts submitted yet.' }
      : {
          stack: [
            {
              table: {
                headerRows: 1,
                dontBreakRows: true,
                widths: ['*', 60, 70, 40, 60, 44],
                body: [
                  headerRow(['Exercise', 'Attempt', 'Submitted', 'Score', 'Result', 'Unsafe acts']),
                  ...attempts,
                ],
              },
              layout: TABLE_LAYOUT,
            },
            ...(view.attempts.some((a) => a.overridden)
              ? [
                  {
                    text: '* Score changed by an instructor, with a recorded reason.',
                    style: 'small',
                    margin: [0, 4, 0, 0],
                  } as Content,
                ]
              : []),
          ],
        },
    heading('Safety record'),
    unsafe === 0
      ? {
          text: `No unsafe acts recorded in ${view.attempts.length} submitted ${view.attempts.length === 1 ? 'attempt' : 'attempts'}.`,
        }
      : {
          stack: [
            {
              text: `${unsafe} unsafe ${unsafe === 1 ? 'act' : 'acts'} recorded:`,
              style: 'missed',
              margin: [0, 0, 0, 4],
            },
            {
              table: {
                headerRows: 1,
                dontBreakRows: true,
                widths: [130, 60, 50, '*'],
                body: [
                  headerRow(['Exercise, attempt', 'Date', 'Time', 'What happened']),
                  ...view.safety.map((s) => [
                    `${s.scenarioTitle}, ${s.attemptLabel}`,
                    formatDate(s.at, clock),
                    formatAttemptTime(s.atMs),
                    s.text,
                  ]),
                ],
              },
              layout: TABLE_LAYOUT,
            },
          ],
        },
    signatureBlock(view.apprentice.name, view.instructor?.name ?? null),
  ]
  return {
    ...documentBase(`Training record: ${view.apprentice.name}`, view.centre.name, view.generatedAt),
    footer: footer(`Training record · ${view.apprentice.name}`),
    content,
  }
}

export function trainingRecordPdf(view: TrainingRecordView): Promise<Buffer> {
  return renderPdf(trainingRecordDocument(view))
}
