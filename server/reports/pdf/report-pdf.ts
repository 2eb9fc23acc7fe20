import PDFDocument from 'pdfkit'
import { OVERLAY_COLOURS } from '../../../shared/overlays/overlay-shapes'
import { signOffTable } from '../../../shared/reports/report-tables'
import type { Report, ReportFilm, ReportReading } from '../../../shared/types/reports'
import type { ComposedFilm } from '../report-film-image'
import { COLOURS, CONTENT_WIDTH, ensureSpace, PAGE } from './pdf-layout'
import { drawTable } from './pdf-table'
import { registerReportFonts } from './report-fonts'
import { textHeight, textWidth, writeText } from './pdf-text'

/** Tallest a film may be drawn, pt, so a film and the start of its results share a page. */
const FILM_MAX_HEIGHT = 360
const LABEL_SIZE = 6.2

function drawHeader(doc: PDFKit.PDFDocument, report: Report): void {
  const { header } = report
  let y = PAGE.top
  writeText(doc, header.product, PAGE.left, y, { size: 15, weight: 600, color: COLOURS.accent })
  writeText(doc, header.title, PAGE.left, y + 3, {
    size: 11,
    weight: 600,
    width: CONTENT_WIDTH,
    align: 'right',
  })
  y += 24
  for (const [index, line] of header.patient.entries()) {
    y += writeText(doc, line, PAGE.left, y, {
      size: index === 0 ? 10.5 : 8.5,
      weight: index === 0 ? 600 : 400,
      width: CONTENT_WIDTH,
    })
  }
  y += writeText(doc, header.visit, PAGE.left, y + 1, { size: 8.5, width: CONTENT_WIDTH }) + 1
  if (header.generatedAt)
    y += writeText(doc, `Report made ${header.generatedAt}`, PAGE.left, y, {
      size: 7,
      color: COLOURS.muted,
    })
  y += 5
  doc
    .moveTo(PAGE.left, y)
    .lineTo(PAGE.left + CONTENT_WIDTH, y)
    .lineWidth(0.8)
    .strokeColor(COLOURS.accent)
    .stroke()
  doc.y = y + 10
}

/** The film with its burnt-in strokes, and the labels set over it in Inter. */
function drawFilm(doc: PDFKit.PDFDocument, film: ReportFilm, composed: ComposedFilm): void {
  const aspect = composed.heightPx / composed.widthPx
  const width = Math.min(CONTENT_WIDTH, FILM_MAX_HEIGHT / aspect)
  const height = width * aspect
  const y = ensureSpace(doc, height + 30)
  const x = PAGE.left + (CONTENT_WIDTH - width) / 2
  doc.image(composed.jpeg, x, y, { width, height })
  // Image px → pt: the picture spans the crop's pixel edges (landmarks sit on pixel centres).
  const pt = width / film.crop.width
  for (const shape of film.shapes) {
    if (shape.kind !== 'label') continue
    const textW = textWidth(doc, shape.text, { size: LABEL_SIZE, weight: 600 })
    const boxW = textW + 4
    const boxH = LABEL_SIZE + 3.5
    const ax = x + (shape.at[0] - film.crop.x + 0.5) * pt
    const ay = y + (shape.at[1] - film.crop.y + 0.5) * pt
    let left = shape.anchor === 'end' ? ax - boxW : shape.anchor === 'middle' ? ax - boxW / 2 : ax
    left = Math.min(Math.max(left, x), x + width - boxW)
    const top = Math.min(Math.max(ay - boxH / 2, y), y + height - boxH)
    doc.roundedRect(left, top, boxW, boxH, 1.5).fillOpacity(0.82).fill('#0a0c0e').fillOpacity(1)
    writeText(doc, shape.text, left + 2, top + 1.6, {
      size: LABEL_SIZE,
      weight: 600,
      color: OVERLAY_COLOURS[shape.category],
      width: boxW,
      lineGap: 0,
    })
  }
  let below = y + height + 3
  below += writeText(doc, film.caption, PAGE.left, below, {
    size: 7.6,
    weight: 600,
    width: CONTENT_WIDTH,
    align: 'center',
  })
  below += writeText(doc, film.calibration, PAGE.left, below, {
    size: 7,
    color: COLOURS.muted,
    width: CONTENT_WIDTH,
    align: 'center',
  })
  doc.y = below + 10
}

function drawReading(
  doc: PDFKit.PDFDocument,
  reading: ReportReading,
  films: ReadonlyMap<number, ComposedFilm>,
): void {
  const y = ensureSpace(doc, 40)
  const titleWidth = CONTENT_WIDTH - (reading.stamp ? 120 : 0)
  const titleHeight = writeText(doc, reading.title, PAGE.left, y, {
    size: 11,
    weight: 600,
    width: titleWidth,
  })
  if (reading.stamp) {
    // The reading's own state beside its title (a visit report may mix signed and unsigned).
    writeText(doc, reading.stamp, PAGE.left, y + 2, {
      size: 8,
      weight: 600,
      color: COLOURS.stamp,
      width: CONTENT_WIDTH,
      align: 'right',
    })
  }
  doc.y = y + titleHeight + 6
  for (const film of reading.films) {
    const composed = films.get(film.imageId)
    if (composed) drawFilm(doc, film, composed)
  }
  for (const table of reading.tables) drawTable(doc, table)
  drawTable(doc, signOffTable(reading.signOff))
}

function drawCautions(doc: PDFKit.PDFDocument, cautions: readonly string[]): void {
  const text = cautions.join('\n')
  const height = textHeight(doc, text, { size: 8, width: CONTENT_WIDTH - 16 }) + 22
  const y = ensureSpace(doc, height)
  doc.rect(PAGE.left, y, CONTENT_WIDTH, height).fill(COLOURS.cautionFill)
  writeText(doc, 'Cautions', PAGE.left + 8, y + 6, {
    size: 8,
    weight: 600,
    color: COLOURS.cautionText,
  })
  writeText(doc, text, PAGE.left + 8, y + 17, {
    size: 8,
    color: COLOURS.cautionText,
    width: CONTENT_WIDTH - 16,
  })
  doc.y = y + height + 6
}

/** Page numbers, the running caution and (when a reading is not signed) the stamp, on every page. */
function finishPages(doc: PDFKit.PDFDocument, report: Report): void {
  const range = doc.bufferedPageRange()
  for (let index = range.start; index < range.start + range.count; index++) {
    doc.switchToPage(index)
    // Writing in the margin must not open a new page.
    const bottom = doc.page.margins.bottom
    doc.page.margins.bottom = 0
    const footY = PAGE.height - PAGE.bottom + 18
    doc
      .moveTo(PAGE.left, footY - 5)
      .lineTo(PAGE.left + CONTENT_WIDTH, footY - 5)
      .lineWidth(0.4)
      .strokeColor(COLOURS.rule)
      .stroke()
    writeText(
      doc,
      `${report.header.product} · ${report.header.title} · Decision support only: verify landmarks and calibration.`,
      PAGE.left,
      footY,
      { size: 6.8, color: COLOURS.muted, width: CONTENT_WIDTH - 70 },
    )
    writeText(doc, `Page ${index - range.start + 1} of ${range.count}`, PAGE.left, footY, {
      size: 6.8,
      color: COLOURS.muted,
      width: CONTENT_WIDTH,
      align: 'right',
    })
    if (report.stamp) {
      const stampW = textWidth(doc, report.stamp, { size: 8, weight: 600 }) + 14
      const stampX = PAGE.left + CONTENT_WIDTH - stampW
      const stampY = index === range.start ? PAGE.top - 26 : PAGE.top - 26
      doc.rect(stampX, stampY, stampW, 15).lineWidth(1).strokeColor(COLOURS.stamp).stroke()
      writeText(doc, report.stamp, stampX + 7, stampY + 3.6, {
        size: 8,
        weight: 600,
        color: COLOURS.stamp,
      })
      writeText(doc, report.stamp, PAGE.left, footY + 10, {
        size: 6.8,
        weight: 600,
        color: COLOURS.stamp,
      })
    }
    if (index !== range.start) {
      writeText(
        doc,
        `${report.header.product} · ${report.header.patient[0] ?? ''} · ${report.header.title}`,
        PAGE.left,
        PAGE.top - 22,
        {
          size: 7,
          color: COLOURS.muted,
          width: CONTENT_WIDTH - 160,
        },
      )
    }
    doc.page.margins.bottom = bottom
  }
}

/** Writes a report as an A4 PDF in Inter: header, films, tables, sign-off, cautions, page numbers. */
export async function renderReportPdf(
  report: Report,
  films: ReadonlyMap<number, ComposedFilm>,
): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: PAGE.top, left: PAGE.left, right: PAGE.right, bottom: PAGE.bottom },
    bufferPages: true,
    autoFirstPage: true,
    info: {
      Title: `${report.header.product} ${report.header.title.toLowerCase()}`,
      Creator: report.header.product,
      Producer: report.header.product,
    },
  })
  const chunks: Buffer[] = []
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk))
    doc.on('end', () => resolve(Buffer.concat(chunks)))
    doc.on('error', reject)
  })
  registerReportFonts(doc)
  drawHeader(doc, report)
  if (report.readings.length === 0)
    doc.y +=
      writeText(doc, "No reading of this visit's films yet.", PAGE.left, doc.y, {
        size: 9,
        color: COLOURS.muted,
      }) + 8
  for (const reading of report.readings) drawReading(doc, reading, films)
  if (report.kind === 'visit') {
    for (const comparison of report.comparisons) {
      const y = ensureSpace(doc, 40)
      doc.y =
        y +
        writeText(doc, comparison.title, PAGE.left, y, {
          size: 11,
          weight: 600,
          width: CONTENT_WIDTH,
        }) +
        6
      for (const table of comparison.tables) drawTable(doc, table)
    }
  }
  drawCautions(doc, report.cautions)
  finishPages(doc, report)
  doc.end()
  return done
}
