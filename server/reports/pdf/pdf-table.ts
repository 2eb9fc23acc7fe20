import type { ReportTable } from '../../../shared/types/reports'
import { COLOURS, CONTENT_WIDTH, ensureSpace, PAGE } from './pdf-layout'
import { textHeight, writeText } from './pdf-text'

const BODY = 7.4
const HEAD = 6.6
const PAD_X = 3.5
const PAD_Y = 2.6

function columnWidths(table: ReportTable, width: number): number[] {
  const total = table.widths.reduce((sum, w) => sum + w, 0) || 1
  return table.widths.map((w) => (w / total) * width)
}

function rowHeight(
  doc: PDFKit.PDFDocument,
  cells: string[],
  widths: number[],
  size: number,
  weight: 400 | 600,
): number {
  let height = 0
  cells.forEach((cell, i) => {
    const w = (widths[i] ?? 40) - 2 * PAD_X
    height = Math.max(height, textHeight(doc, cell, { size, weight, width: w }))
  })
  return height + 2 * PAD_Y
}

function drawRow(
  doc: PDFKit.PDFDocument,
  cells: string[],
  widths: number[],
  y: number,
  height: number,
  style: { size: number; weight: 400 | 600; color: string; fill?: string; mutedColumn?: number },
): void {
  if (style.fill) doc.rect(PAGE.left, y, CONTENT_WIDTH, height).fill(style.fill)
  let x = PAGE.left
  cells.forEach((cell, i) => {
    const w = widths[i] ?? 40
    writeText(doc, cell, x + PAD_X, y + PAD_Y, {
      size: style.size,
      weight: i === style.mutedColumn ? 400 : style.weight,
      color: i === style.mutedColumn ? COLOURS.muted : style.color,
      width: w - 2 * PAD_X,
    })
    x += w
  })
  doc
    .moveTo(PAGE.left, y + height)
    .lineTo(PAGE.left + CONTENT_WIDTH, y + height)
    .lineWidth(0.4)
    .strokeColor(COLOURS.rule)
    .stroke()
}

/**
 * A report table across the text column: its title, a shaded header row (repeated after a page
 * break), the rows (emphasised rows in the heavier weight) and its notes.
 */
export function drawTable(doc: PDFKit.PDFDocument, table: ReportTable): void {
  const widths = columnWidths(table, CONTENT_WIDTH)
  const headHeight = rowHeight(doc, table.columns, widths, HEAD, 600)
  const first = table.rows[0]
  const firstHeight = first ? rowHeight(doc, first.cells, widths, BODY, 400) : 0
  let y = ensureSpace(doc, 16 + headHeight + firstHeight)
  const title = (text: string) => {
    y += writeText(doc, text, PAGE.left, y, { size: 9, weight: 600, color: COLOURS.accent }) + 3
    drawRow(doc, table.columns, widths, y, headHeight, {
      size: HEAD,
      weight: 600,
      color: COLOURS.muted,
      fill: COLOURS.headFill,
    })
    y += headHeight
  }
  title(table.title)
  for (const row of table.rows) {
    const weight = row.emphasis ? 600 : 400
    const height = rowHeight(doc, row.cells, widths, BODY, weight)
    if (y + height > PAGE.height - PAGE.bottom) {
      doc.addPage()
      y = PAGE.top + 18
      title(`${table.title} (continued)`)
    }
    drawRow(doc, row.cells, widths, y, height, {
      size: BODY,
      weight,
      color: COLOURS.text,
      mutedColumn: table.columns.indexOf('Source'),
    })
    y += height
  }
  y += 3
  for (const note of table.notes) {
    const style = { size: 6.8, color: COLOURS.muted, width: CONTENT_WIDTH }
    doc.y = y
    y = ensureSpace(doc, textHeight(doc, note, style) + 1)
    y += writeText(doc, note, PAGE.left, y, style) + 1
  }
  doc.y = y + 10
}
