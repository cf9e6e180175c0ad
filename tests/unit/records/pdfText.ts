// Reads a PDF back for the tests: its text per page (pdfjs-dist, the PDF reader of a major browser)
// and whether any page paints a raster image.
import { OPS, getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs'

export interface PdfContent {
  pages: string[]
  /** All pages' text, whitespace collapsed. */
  text: string
  rasterImages: number
  pageSizes: { width: number; height: number }[]
}

export async function readPdf(bytes: Uint8Array): Promise<PdfContent> {
  const doc = await getDocument({
    data: new Uint8Array(bytes),
    useSystemFonts: false,
    isEvalSupported: false,
  }).promise
  const pages: string[] = []
  const pageSizes: PdfContent['pageSizes'] = []
  let rasterImages = 0
  for (let n = 1; n <= doc.numPages; n++) {
    const page = await doc.getPage(n)
    const { width, height } = page.getViewport({ scale: 1 })
    pageSizes.push({ width, height })
    const content = await page.getTextContent()
    pages.push(
      content.items
        .map((item) => ('str' in item ? item.str : ''))
        .join(' ')
        .replace(/\s+/g, ' ')
        .trim(),
    )
    const ops = await page.getOperatorList()
    rasterImages += ops.fnArray.filter(
      (fn) => fn === OPS.paintImageXObject || fn === OPS.paintInlineImageXObject,
    ).length
  }
  await doc.destroy()
  return { pages, text: pages.join(' '), rasterImages, pageSizes }
}
