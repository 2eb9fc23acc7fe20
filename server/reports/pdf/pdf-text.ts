import { textRuns, writableText, type FontWeight } from './report-fonts'

export interface TextStyle {
  size: number
  weight?: FontWeight
  color?: string
  width?: number
  align?: 'left' | 'right' | 'center'
  lineGap?: number
}

/**
 * Writes text at (x, y) in runs of the Inter subsets that hold its characters (pdfkit switches
 * fonts only between calls, so runs are chained with `continued`). Returns the height used, pt.
 */
export function writeText(
  doc: PDFKit.PDFDocument,
  text: string,
  x: number,
  y: number,
  style: TextStyle,
): number {
  const weight = style.weight ?? 400
  const runs = textRuns(text, weight)
  const options = {
    width: style.width,
    align: style.align ?? 'left',
    lineGap: style.lineGap ?? 1,
  }
  doc.fillColor(style.color ?? '#1e2226').fontSize(style.size)
  runs.forEach((run, index) => {
    doc.font(run.font)
    const continued = index < runs.length - 1
    if (index === 0) doc.text(run.text, x, y, { ...options, continued })
    else doc.text(run.text, { ...options, continued })
  })
  if (runs.length === 0) doc.text('', x, y, options)
  // pdfkit leaves the cursor under the text it wrote.
  return doc.y - y
}

// Measurements do not depend on the document: kept for the process (bounded) so that every
// report does not lay out the same labels and values again.
const heights = new Map<string, number>()
const HEIGHT_CACHE_LIMIT = 20_000

/** Height of text set in a width, pt (measured in the Latin subset's metrics). */
export function textHeight(doc: PDFKit.PDFDocument, text: string, style: TextStyle): number {
  const key = `${style.weight ?? 400}|${style.size}|${style.width}|${style.lineGap ?? 1}|${text}`
  const known = heights.get(key)
  if (known !== undefined) return known
  doc.font(`inter-latin-${style.weight ?? 400}`).fontSize(style.size)
  const height = doc.heightOfString(writableText(text) || ' ', {
    width: style.width,
    lineGap: style.lineGap ?? 1,
  })
  if (heights.size >= HEIGHT_CACHE_LIMIT) heights.clear()
  heights.set(key, height)
  return height
}

/** Width of one line of text, pt. */
export function textWidth(doc: PDFKit.PDFDocument, text: string, style: TextStyle): number {
  doc.font(`inter-latin-${style.weight ?? 400}`).fontSize(style.size)
  return doc.widthOfString(writableText(text))
}
