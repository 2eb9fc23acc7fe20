import type { OverlayShape } from '../overlays/overlay-shapes'
import type { FilmCrop } from '../reports/film-crop'
import type { PixelPoint } from './landmarks'

/**
 * A report as content, shared by the PDF the server writes and the printable page the browser
 * shows, so both carry the same words and numbers. All text is final (units, intervals and
 * sources already written out); renderers only lay it out.
 */

/** A table of text: the first column names the row. `widths` are relative column widths. */
export interface ReportTable {
  id: string
  title: string
  columns: string[]
  widths: number[]
  rows: Array<{ cells: string[]; emphasis?: boolean }>
  /** Flags, rules and remarks printed under the table. */
  notes: string[]
}

/** A film with the overlays of its reading, image px (x right, y down). */
export interface ReportFilm {
  imageId: number
  /** The film's preview rendition, for the printable page. */
  imageUrl: string
  widthPx: number
  heightPx: number
  caption: string
  /** Where the mm scale comes from, in words. */
  calibration: string
  shapes: OverlayShape[]
  points: Record<string, PixelPoint>
  /** The part of the film shown: round the overlays (reportFilmCrop), whole pixels. */
  crop: FilmCrop
}

/** Who made, submitted and signed a reading. Times are null for researchers. */
export interface ReportSignOff {
  rater: string
  status: string
  submittedAt: string | null
  signer: string | null
  signedAt: string | null
}

/** One reading in a report: its films, results, plan checks and sign-off. */
export interface ReportReading {
  readingId: number
  title: string
  films: ReportFilm[]
  tables: ReportTable[]
  signOff: ReportSignOff
  /** Set when the reading is not signed: printed on every page it appears on. */
  stamp: string | null
}

/** One comparison in a visit report: this visit's film against the previous visit's. */
export interface ReportComparison {
  title: string
  tables: ReportTable[]
}

export interface ReportHeader {
  product: string
  title: string
  /** Identity lines: name, record number and birth date for clinical roles; study code and age
   * for researchers. */
  patient: string[]
  visit: string
  /** When the report was made; null for researchers (no dates). */
  generatedAt: string | null
}

export interface ReadingReport {
  kind: 'reading'
  header: ReportHeader
  readings: [ReportReading]
  comparisons: []
  /** Printed on every page when the reading is not signed. */
  stamp: string | null
  cautions: string[]
}

export interface VisitReport {
  kind: 'visit'
  header: ReportHeader
  readings: ReportReading[]
  /** Against the previous visit, when there is one. */
  comparisons: ReportComparison[]
  stamp: string | null
  cautions: string[]
}

export type Report = ReadingReport | VisitReport
