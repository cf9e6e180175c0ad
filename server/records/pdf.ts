// pdfmake set up once for the records: our shipped fonts, no fetching of URLs and no reading of any
// local file but the fonts, and the page furniture both records share.
import { createRequire } from 'node:module'
import type { Content, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces'
import { FONT_FAMILY, FONT_FILES } from './fonts'
import type { Clock } from './format'
import type { RecordCentre } from './types'

// pdfmake is CommonJS with a module.exports instance; createRequire reads it the same way under tsx,
// Vitest and compiled JavaScript.
const pdfmake = createRequire(import.meta.url)('pdfmake') as typeof import('pdfmake')
const allowedFiles = new Set<string>(Object.values(FONT_FILES))
pdfmake.setFonts({ [FONT_FAMILY]: { ...FONT_FILES } })
pdfmake.setUrlAccessPolicy(() => false)
pdfmake.setLocalAccessPolicy((path) => allowedFiles.has(path))

/** A4 in PDF points, and the margins every page keeps. */
export const PAGE = { width: 595.28, height: 841.89, margin: 40, top: 48, bottom: 52 } as const
export const CONTENT_WIDTH = PAGE.width - 2 * PAGE.margin
export const LANDSCAPE_CONTENT_WIDTH = PAGE.height - 2 * PAGE.margin
export const LANDSCAPE_CONTENT_HEIGHT = PAGE.width - PAGE.top - PAGE.bottom
/** SVG px to PDF points at 100 % (CSS: 96 px per inch, 72 pt per inch). */
export const PX_TO_PT = 0.75

export const STYLES: TDocumentDefinitions['styles'] = {
  title: { fontSize: 20, bold: true, margin: [0, 0, 0, 2] },
  subtitle: { fontSize: 11, color: '#444444', margin: [0, 0, 0, 12] },
  heading: { fontSize: 14, bold: true, margin: [0, 16, 0, 6] },
  tableHeader: { bold: true, fontSize: 9.5, fillColor: '#e9ecef' },
  small: { fontSize: 8.5, color: '#444444' },
  notice: { fontSize: 8.5, color: '#333333', margin: [0, 8, 0, 0] },
  met: { color: '#1b5e20', bold: true },
  missed: { color: '#b71c1c', bold: true },
}

export const SIMULATOR_NOTICE =
  'This record describes an exercise on Slipway, a training simulator. It is not a record of work on real ' +
  'equipment and does not show competence to work on it unsupervised. Local electrical codes, the ' +
  "equipment maker's instructions and licensed, qualified supervision take precedence."

/**
 * A section heading, moved to the next page rather than left alone at the bottom of one. Inside an
 * unbreakable block pass `keepWithNext: false`: the block already moves as a whole (and pdfmake drops
 * an unbreakable block whose heading asks for a page break).
 */
export function heading(
  text: string,
  extra: Partial<Record<string, unknown>> = {},
  keepWithNext = true,
): Content {
  return { text, style: 'heading', ...(keepWithNext ? { headlineLevel: 1 } : {}), ...extra } as Content
}

/** A heading in the last quarter of a page starts the next page instead of standing alone. */
const keepHeadingsWithContent: TDocumentDefinitions['pageBreakBefore'] = (node) =>
  node.headlineLevel === 1 && node.startPosition.verticalRatio > 0.75

/** Two signature lines side by side, kept on one page. */
export function signatureBlock(apprentice: string, instructor: string | null): Content {
  const block = (role: string, name: string): Content => ({
    stack: [
      { text: role, bold: true, margin: [0, 0, 0, 2] },
      { text: name || ' ', margin: [0, 0, 0, 26] },
      { canvas: [{ type: 'line', x1: 0, y1: 0, x2: 230, y2: 0, lineWidth: 0.8 }] },
      { text: 'Signature', style: 'small', margin: [0, 2, 0, 18] },
      { canvas: [{ type: 'line', x1: 0, y1: 0, x2: 230, y2: 0, lineWidth: 0.8 }] },
      { text: 'Date', style: 'small' },
    ],
  })
  return {
    unbreakable: true,
    stack: [
      heading('Signatures', {}, false),
      { columns: [block('Apprentice', apprentice), block('Instructor', instructor ?? '')], columnGap: 30 },
    ],
  }
}

export function footer(left: string): TDocumentDefinitions['footer'] {
  return (currentPage: number, pageCount: number) => ({
    margin: [PAGE.margin, 16, PAGE.margin, 0],
    columns: [
      { text: left, style: 'small' },
      { text: `Page ${currentPage} of ${pageCount}`, style: 'small', alignment: 'right', width: 80 },
    ],
  })
}

/** Thin grey rules between rows, header row shaded. */
export const TABLE_LAYOUT = {
  hLineWidth: (i: number) => (i === 0 ? 0 : 0.5),
  vLineWidth: () => 0,
  hLineColor: () => '#bbbbbb',
  paddingLeft: () => 4,
  paddingRight: () => 4,
  paddingTop: () => 3,
  paddingBottom: () => 3,
}

export function documentBase(
  title: string,
  subject: string,
  createdAt: string,
): Omit<TDocumentDefinitions, 'content'> {
  return {
    pageSize: 'A4',
    pageMargins: [PAGE.margin, PAGE.top, PAGE.margin, PAGE.bottom],
    defaultStyle: { font: FONT_FAMILY, fontSize: 10, lineHeight: 1.15 },
    styles: STYLES,
    pageBreakBefore: keepHeadingsWithContent,
    info: { title, subject, creator: 'Slipway', producer: 'Slipway', creationDate: new Date(createdAt) },
  }
}

export async function renderPdf(definition: TDocumentDefinitions): Promise<Buffer> {
  return pdfmake.createPdf(definition).getBuffer()
}

/** A table's header row. */
export function headerRow(cells: string[]): TableCell[] {
  return cells.map((text) => ({ text, style: 'tableHeader' }))
}

/** The centre's time zone and locale, in which every date of a record is printed. */
export function clockOf(view: { centre: RecordCentre }): Clock {
  return { timeZone: view.centre.timeZone, locale: view.centre.locale ?? 'en-GB' }
}
