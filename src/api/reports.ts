import type { ReadingReport, VisitReport } from '@shared/types/reports'
import { http } from './http'

const BASE = import.meta.env.VITE_API_BASE ?? '/api'

export const getReadingReport = (readingId: number) =>
  http.get<ReadingReport>(`/readings/${readingId}/report`)
export const getVisitReport = (visitId: number) =>
  http.get<VisitReport>(`/visits/${visitId}/report`)

/** Where the browser opens a reading's PDF report (a plain link: the browser shows the PDF). */
export const readingReportPdfUrl = (readingId: number) => `${BASE}/readings/${readingId}/report.pdf`
/** Where the browser opens a visit's PDF report. */
export const visitReportPdfUrl = (visitId: number) => `${BASE}/visits/${visitId}/report.pdf`
