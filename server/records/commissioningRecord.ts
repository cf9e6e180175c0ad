// The commissioning record of one attempt, as a pdfmake document and as PDF bytes: who, what and when;
// the result with every objective's evidence; unsafe acts; the settings left in the drive; the trend;
// the as-wired schematic and wire list; the instructor's review; signature lines.
import type { Content, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces'
import {
  ASSISTANCE_LEVELS,
  formatAttemptTime,
  formatDateTime,
  formatDuration,
  formatScore,
  type Clock,
} from './format'
import {
  CONTENT_WIDTH,
  LANDSCAPE_CONTENT_HEIGHT,
  LANDSCAPE_CONTENT_WIDTH,
  PX_TO_PT,
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
import { TREND_HEIGHT, TREND_WIDTH, trendChartSvg } from './trendChart'
import type { CommissioningRecordView } from './types'

function verdict(passed: boolean): string {
  return passed ? 'passed' : 'not passed'
}

function factsTable(rows: [string, string | Content][]): Content {
  return {
    table: {
      widths: [120, '*'],
      body: rows.map(([label, value]) => [{ text: label, bold: true }, value] as TableCell[]),
    },
    layout: TABLE_LAYOUT,
  }
}

function resultText(view: CommissioningRecordView): string {
  const { result } = view
  const main = `${formatScore(result.score)}, ${verdict(result.passed)}`
  return view.review.override
    ? `${main} (changed by the instructor; the grader gave ${formatScore(result.autoScore)}, ${verdict(result.autoPassed)})`
    : main
}

function objectivesSection(view: CommissioningRecordView): Content[] {
  const { points } = view.result
  const rows: TableCell[][] = view.objectives.map((o) => [
    {
      stack: [
        { text: o.title },
        ...(o.required || o.safety
          ? [
              {
                text: [
                  o.required ? 'Required' : '',
                  o.required && o.safety ? ', ' : '',
                  o.safety ? 'safe practice' : '',
                ].join(''),
                style: 'small',
              },
            ]
          : []),
      ],
    },
    { text: o.met ? 'Met' : 'Missed', style: o.met ? 'met' : 'missed' },
    { text: `${o.pointsEarned} / ${o.pointsPossible}`, alignment: 'right' },
    { text: o.evidence, fontSize: 9 },
  ])
  const hintLine = points.hintCost > 0 ? `, hints used −${points.hintCost}` : ''
  const content: Content[] = [
    heading('Objectives and evidence'),
    {
      table: {
        headerRows: 1,
        dontBreakRows: true,
        widths: [150, 42, 42, '*'],
        body: [
          headerRow(['Objective', 'Result', 'Points', 'Evidence (time into the attempt and values)']),
          ...rows,
        ],
      },
      layout: TABLE_LAYOUT,
    },
    {
      text: `Points: ${points.earned} earned of ${points.possible}${hintLine}, ${points.net} counted; pass mark ${points.passMark}. Score ${formatScore(view.result.autoScore)}, ${verdict(view.result.autoPassed)}.`,
      margin: [0, 6, 0, 0],
    },
  ]
  if (view.hintsUsed.length > 0) {
    content.push({
      margin: [0, 6, 0, 0],
      stack: [
        { text: 'Hints revealed', bold: true },
        { ul: view.hintsUsed.map((h) => `${formatAttemptTime(h.atMs)}: ${h.text} (−${h.cost} points)`) },
      ],
    })
  }
  return content
}

function safetySection(view: CommissioningRecordView): Content[] {
  if (view.safetyViolations.length === 0) {
    return [
      heading('Safety'),
      { text: 'No unsafe acts recorded: every terminal was worked on isolated, locked off and proved dead.' },
    ]
  }
  return [
    heading('Safety'),
    {
      text: `${view.safetyViolations.length} unsafe ${view.safetyViolations.length === 1 ? 'act' : 'acts'} recorded:`,
      style: 'missed',
      margin: [0, 0, 0, 4],
    },
    {
      table: {
        headerRows: 1,
        dontBreakRows: true,
        widths: [60, '*'],
        body: [
          headerRow(['Time', 'What happened']),
          ...view.safetyViolations.map((v) => [formatAttemptTime(v.atMs), v.text]),
        ],
      },
      layout: TABLE_LAYOUT,
    },
  ]
}

function settingsSection(view: CommissioningRecordView): Content[] {
  const body: TableCell[][] = [headerRow(['Setting', 'Value', 'Default', 'Changed'])]
  let group = ''
  for (const s of view.settings) {
    if (s.group !== group) {
      group = s.group
      body.push([{ text: group, colSpan: 4, bold: true, fillColor: '#f4f5f7' }, {}, {}, {}])
    }
    const changed = s.changedInAttempt ? 'Yes, in this attempt' : s.changedFromDefault ? 'Yes' : ''
    body.push([s.label, { text: s.value, bold: s.changedFromDefault }, s.defaultValue, changed])
  }
  const content: Content[] = [
    heading('Settings left in the drive'),
    {
      text: 'Every setting as saved in the drive when the attempt was submitted, with the catalogue default.',
      style: 'small',
      margin: [0, 0, 0, 6],
    },
    {
      table: { headerRows: 1, dontBreakRows: true, widths: [150, '*', '*', 80], body },
      layout: TABLE_LAYOUT,
    },
  ]
  if (view.unsavedSettings.length > 0) {
    content.push({
      margin: [0, 6, 0, 0],
      stack: [
        { text: 'Edited on the keypad but never saved (so not in the drive):', bold: true },
        { ul: view.unsavedSettings.map((s) => `${s.label}: ${s.value}`) },
      ],
    })
  }
  return content
}

function trendSection(view: CommissioningRecordView): Content {
  return {
    unbreakable: true,
    stack: [
      heading('Commissioning trend', {}, false),
      {
        svg: trendChartSvg(view.trend),
        width: Math.min(CONTENT_WIDTH, TREND_WIDTH * PX_TO_PT),
        height:
          TREND_HEIGHT *
          PX_TO_PT *
          (Math.min(CONTENT_WIDTH, TREND_WIDTH * PX_TO_PT) / (TREND_WIDTH * PX_TO_PT)),
      },
    ],
  }
}

/** The schematic at print size; a landscape page of its own when it is too wide for portrait. */
function schematicSection(view: CommissioningRecordView): { content: Content[]; landscape: boolean } {
  const { svg, width, height } = view.schematic
  const natural = { w: width * PX_TO_PT, h: height * PX_TO_PT }
  const landscape = natural.w > CONTENT_WIDTH
  const maxW = landscape ? LANDSCAPE_CONTENT_WIDTH : CONTENT_WIDTH
  const maxH = landscape ? LANDSCAPE_CONTENT_HEIGHT - 40 : 600
  // Up to a quarter larger than 100 % where the page has room: easier to read on paper.
  const scale = Math.min(1.25, maxW / natural.w, maxH / natural.h)
  const wires: TableCell[][] = view.wires.map((w) => [w.number, w.colour, w.from, w.to])
  return {
    landscape,
    content: [
      heading(
        'As-wired schematic',
        landscape ? { pageBreak: 'before', pageOrientation: 'landscape' } : { pageBreak: 'before' },
      ),
      { svg, width: natural.w * scale, height: natural.h * scale },
      heading('Wire list', landscape ? { pageBreak: 'before', pageOrientation: 'portrait' } : {}),
      wires.length === 0
        ? { text: 'No wires were fitted.' }
        : {
            table: {
              headerRows: 1,
              dontBreakRows: true,
              widths: [44, 90, '*', '*'],
              body: [headerRow(['Wire', 'Colour', 'From', 'To']), ...wires],
            },
            layout: TABLE_LAYOUT,
          },
    ],
  }
}

function reviewSection(view: CommissioningRecordView, clock: Clock): Content[] {
  const { feedback, override } = view.review
  const content: Content[] = [heading('Instructor review')]
  if (feedback.length === 0) content.push({ text: 'No feedback written yet.' })
  for (const f of feedback) {
    content.push({
      unbreakable: true,
      margin: [0, 0, 0, 6],
      stack: [{ text: `${f.author}, ${formatDateTime(f.at, clock)}`, bold: true }, { text: f.body }],
    })
  }
  content.push(
    override
      ? {
          margin: [0, 6, 0, 0],
          text: [
            { text: 'Grade changed', bold: true },
            ` by ${override.by} on ${formatDateTime(override.at, clock)}: from ${formatScore(override.from.score)}, ${verdict(override.from.passed)}, to ${formatScore(override.to.score)}, ${verdict(override.to.passed)}. Reason: ${override.reason}`,
          ],
        }
      : { margin: [0, 6, 0, 0], text: 'The grade has not been changed by an instructor.' },
  )
  return content
}

export function commissioningRecordDocument(view: CommissioningRecordView): TDocumentDefinitions {
  const clock = clockOf(view)
  const { attempt } = view
  const schematic = schematicSection(view)
  const content: Content[] = [
    { text: 'Commissioning record', style: 'title' },
    { text: view.centre.name, style: 'subtitle' },
    factsTable([
      ['Exercise', `${view.scenario.title} (version ${view.scenario.version})`],
      ['Site', view.scenario.site],
      ['Machine', view.scenario.machine],
      ['Apprentice', view.apprentice.name],
      ['Instructor', view.instructor?.name ?? 'Not assigned'],
      ['Attempt', attempt.label],
      ['Started', formatDateTime(attempt.startedAt, clock)],
      ['Submitted', attempt.submittedAt ? formatDateTime(attempt.submittedAt, clock) : 'Not submitted'],
      ['Time on the bench', `${formatDuration(attempt.simulatedMs)} (simulated)`],
      ['Assistance level', ASSISTANCE_LEVELS[attempt.assistance]],
      ['Result', { text: resultText(view), style: view.result.passed ? 'met' : 'missed' }],
      ['Record made', formatDateTime(view.generatedAt, clock)],
    ]),
    { text: SIMULATOR_NOTICE, style: 'notice' },
    ...objectivesSection(view),
    ...safetySection(view),
    ...settingsSection(view),
    trendSection(view),
    ...schematic.content,
    ...reviewSection(view, clock),
    signatureBlock(view.apprentice.name, view.instructor?.name ?? null),
  ]
  return {
    ...documentBase(
      `Commissioning record: ${view.scenario.title}`,
      `${view.apprentice.name}, ${attempt.label}`,
      view.generatedAt,
    ),
    footer: footer(`Commissioning record · ${view.apprentice.name} · ${view.scenario.title}`),
    content,
  }
}

export function commissioningRecordPdf(view: CommissioningRecordView): Promise<Buffer> {
  return renderPdf(commissioningRecordDocument(view))
}
