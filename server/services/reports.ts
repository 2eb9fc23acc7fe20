import type { Db } from '../db/knex'
import type { ImageRow } from '../db/images'
import type { PatientRecord } from '../db/patients'
import { ageInYears, deidentifiedAgeInYears } from '../db/rows'
import { listVisitsOfPatient, type VisitRecord } from '../db/visits'
import type { FileStore } from '../storage/file-store'
import { STATIC_LATERAL_VIEWS } from '../../shared/compare/comparison-kind'
import { REPORT_CAUTIONS } from '../../shared/reports/cautions'
import { comparisonTables } from '../../shared/reports/report-tables'
import { dateText, IMAGE_VIEW_WORDS, visitText } from '../../shared/reports/visit-text'
import type { ImageView } from '../../shared/types/domain'
import type {
  ReadingReport,
  Report,
  ReportComparison,
  ReportHeader,
  ReportReading,
  VisitReport,
} from '../../shared/types/reports'
import { composeReportFilm, type ComposedFilm } from '../reports/report-film-image'
import { renderReportPdf } from '../reports/pdf/report-pdf'
import { actorIdentifies, audit, type Actor } from './audit'
import { buildComparison, placeFilm, type PlacedFilm } from './comparisons'
import { siteSigmaMm } from './film-readings'
import { findServedImage, listServedImagesOfVisit, loadVisibleImage } from './images'
import { getPlan } from './plans'
import { dateTimeText, reportReading, visitFor } from './report-readings'
import { getClinicalReading } from './readings'
import { loadVisibleVisit } from './visits'

const PRODUCT = 'Endplate'

const SEX_WORDS: Record<PatientRecord['sex'], string> = {
  female: 'female',
  male: 'male',
  other: 'other',
  unknown: 'sex not recorded',
}

/** Identity lines: clinical roles get name, record number and birth date; researchers a pseudonym. */
function headerFor(
  actor: Actor,
  title: string,
  patient: PatientRecord,
  visit: VisitRecord,
  visits: readonly VisitRecord[],
): ReportHeader {
  const identified = actorIdentifies(actor)
  const patientLines = identified
    ? [
        `${patient.familyName}, ${patient.givenName}`,
        `Record no. ${patient.recordNumber} · born ${dateText(patient.birthDate)} · ${SEX_WORDS[patient.sex]} · age at visit ${ageInYears(patient.birthDate, visit.visitDate)} y`,
        `Study code ${patient.studyCode}`,
      ]
    : [
        `Study code ${patient.studyCode}`,
        `Age at visit ${
          deidentifiedAgeInYears(patient.birthDate, visit.visitDate) >= 90
            ? '90+'
            : deidentifiedAgeInYears(patient.birthDate, visit.visitDate)
        } y · ${SEX_WORDS[patient.sex]}`,
      ]
  return {
    product: PRODUCT,
    title,
    patient: patientLines,
    visit: visitText(visitFor(identified, visit, patient, visits)),
    generatedAt: identified ? dateTimeText(new Date().toISOString()) : null,
  }
}

/** What a report is made of: the content, and the films to compose for the PDF. */
interface ReportParts<R extends Report> {
  report: R
  films: Map<number, ImageRow>
}

async function readingPart(
  db: Db,
  actor: Actor,
  readingId: number,
  patient: PatientRecord,
  visits: readonly VisitRecord[],
  sigmaMm: number,
  films: Map<number, ImageRow>,
): Promise<ReportReading> {
  const reading = await getClinicalReading(db, actor, readingId)
  const image = await loadVisibleImage(db, actor, reading.imageId)
  const pairedImage = reading.pairedImageId
    ? // A held-back extension film is left out of a researcher's report, pixels and all.
      ((await findServedImage(db, actor, reading.pairedImageId)) ?? null)
    : null
  const visit = visits.find((candidate) => candidate.id === image.visitId) as VisitRecord
  films.set(image.id, image)
  if (pairedImage) films.set(pairedImage.id, pairedImage)
  return reportReading(db, {
    reading,
    image,
    pairedImage,
    visit: visitFor(actorIdentifies(actor), visit, patient, visits),
    plan: await getPlan(db, actor, patient.id),
    identified: actorIdentifies(actor),
    sigmaMm,
  })
}

/** The content of a reading's report (also the printable page's). */
async function readingReportParts(
  db: Db,
  actor: Actor,
  readingId: number,
): Promise<ReportParts<ReadingReport>> {
  const reading = await getClinicalReading(db, actor, readingId)
  const image = await loadVisibleImage(db, actor, reading.imageId)
  const { visit, patient } = await loadVisibleVisit(db, actor, image.visitId)
  const visits = await listVisitsOfPatient(db, patient.id)
  const films = new Map<number, ImageRow>()
  const part = await readingPart(
    db,
    actor,
    readingId,
    patient,
    visits,
    await siteSigmaMm(db),
    films,
  )
  return {
    report: {
      kind: 'reading',
      header: headerFor(actor, 'Reading report', patient, visit, visits),
      readings: [part],
      comparisons: [],
      stamp: part.stamp,
      cautions: [...REPORT_CAUTIONS],
    },
    films,
  }
}

/** Films that stand for each other across visits: neutral laterals together, flexion, extension. */
function viewGroup(view: ImageView): string {
  return STATIC_LATERAL_VIEWS.includes(view) ? 'static' : view
}

/**
 * Each film of this visit with a reading against the film of the previous visit in the same
 * view group that has one (the same view preferred).
 */
function previousVisitPairs(
  current: PlacedFilm[],
  previous: PlacedFilm[],
): Array<[PlacedFilm, PlacedFilm]> {
  const pairs: Array<[PlacedFilm, PlacedFilm]> = []
  for (const film of current) {
    if (!film.filmReading) continue
    const candidates = previous.filter(
      (other) => other.filmReading && viewGroup(other.image.view) === viewGroup(film.image.view),
    )
    const match = candidates.find((other) => other.image.view === film.image.view) ?? candidates[0]
    if (match) pairs.push([match, film])
  }
  return pairs
}

async function placedFilmsOf(
  db: Db,
  actor: Actor,
  visitId: number,
  visits: readonly VisitRecord[],
): Promise<PlacedFilm[]> {
  const images = await listServedImagesOfVisit(db, actor, visitId)
  return Promise.all(images.map((image) => placeFilm(db, image, visits)))
}

/** The content of a visit's report: every film's current reading, and the previous visit's changes. */
async function visitReportParts(
  db: Db,
  actor: Actor,
  visitId: number,
): Promise<ReportParts<VisitReport>> {
  const { visit, patient } = await loadVisibleVisit(db, actor, visitId)
  const visits = await listVisitsOfPatient(db, patient.id)
  const sigmaMm = await siteSigmaMm(db)
  const films = new Map<number, ImageRow>()
  const current = await placedFilmsOf(db, actor, visitId, visits)
  const readingIds = [
    ...new Set(
      current
        .map((film) => film.filmReading?.reading.id)
        .filter((id): id is number => id !== undefined),
    ),
  ]
  const readings: ReportReading[] = []
  for (const id of readingIds)
    readings.push(await readingPart(db, actor, id, patient, visits, sigmaMm, films))

  const index = visits.findIndex((candidate) => candidate.id === visit.id)
  const previousVisit = index > 0 ? visits[index - 1] : undefined
  const comparisons: ReportComparison[] = []
  if (previousVisit) {
    const previous = await placedFilmsOf(db, actor, previousVisit.id, visits)
    const plan = await getPlan(db, actor, patient.id)
    const identified = actorIdentifies(actor)
    for (const [before, after] of previousVisitPairs(current, previous)) {
      const comparison = await buildComparison(db, actor, patient, [before, after], plan)
      const earlier = visitText(visitFor(identified, before.visit, patient, visits))
      const later = visitText(visitFor(identified, after.visit, patient, visits))
      comparisons.push({
        title: `Against the previous visit: ${IMAGE_VIEW_WORDS[after.image.view]}, ${earlier} → ${later}`,
        tables: comparisonTables(
          comparison.table,
          earlier.split(' · ').slice(0, 2).join(' · '),
          later.split(' · ').slice(0, 2).join(' · '),
        ),
      })
    }
  }
  const unsigned = readings.some((reading) => reading.stamp !== null)
  return {
    report: {
      kind: 'visit',
      header: headerFor(actor, 'Visit report', patient, visit, visits),
      readings,
      comparisons,
      stamp: unsigned ? 'NOT ALL READINGS SIGNED' : null,
      cautions: [...REPORT_CAUTIONS],
    },
    films,
  }
}

async function auditReport(
  db: Db,
  actor: Actor,
  entity: 'reading' | 'visit',
  id: number,
  format: 'PDF' | 'printable page',
  studyCode: string,
): Promise<void> {
  if (!actorIdentifies(actor)) return
  await audit(
    db,
    actor,
    'view',
    entity,
    id,
    `Viewed the ${format} report of ${entity} ${id} of patient ${studyCode}`,
  )
}

function studyCodeOf(report: Report): string {
  const line = report.header.patient.find((text) => text.startsWith('Study code '))
  return line?.slice('Study code '.length) ?? 'unknown'
}

/** GET /api/readings/:id/report: the report's content, for the printable page. Audited. */
export async function getReadingReport(
  db: Db,
  actor: Actor,
  readingId: number,
): Promise<ReadingReport> {
  const { report } = await readingReportParts(db, actor, readingId)
  await auditReport(db, actor, 'reading', readingId, 'printable page', studyCodeOf(report))
  return report
}

/** GET /api/visits/:id/report: a visit report's content, for the printable page. Audited. */
export async function getVisitReport(db: Db, actor: Actor, visitId: number): Promise<VisitReport> {
  const { report } = await visitReportParts(db, actor, visitId)
  await auditReport(db, actor, 'visit', visitId, 'printable page', studyCodeOf(report))
  return report
}

async function composeFilms(
  store: FileStore,
  report: Report,
  films: Map<number, ImageRow>,
): Promise<Map<number, ComposedFilm>> {
  const composed = new Map<number, ComposedFilm>()
  const wanted = report.readings.flatMap((reading) => reading.films)
  await Promise.all(
    wanted.map(async (film) => {
      const image = films.get(film.imageId)
      if (image) composed.set(film.imageId, await composeReportFilm(store, image.displayPath, film))
    }),
  )
  return composed
}

async function pdfOf<R extends Report>(store: FileStore, parts: ReportParts<R>): Promise<Buffer> {
  return renderReportPdf(parts.report, await composeFilms(store, parts.report, parts.films))
}

/** GET /api/readings/:id/report.pdf. Audited like any read of identified data. */
export async function readingReportPdf(
  db: Db,
  store: FileStore,
  actor: Actor,
  readingId: number,
): Promise<Buffer> {
  const parts = await readingReportParts(db, actor, readingId)
  const pdf = await pdfOf(store, parts)
  await auditReport(db, actor, 'reading', readingId, 'PDF', studyCodeOf(parts.report))
  return pdf
}

/** GET /api/visits/:id/report.pdf. Audited like any read of identified data. */
export async function visitReportPdf(
  db: Db,
  store: FileStore,
  actor: Actor,
  visitId: number,
): Promise<Buffer> {
  const parts = await visitReportParts(db, actor, visitId)
  const pdf = await pdfOf(store, parts)
  await auditReport(db, actor, 'visit', visitId, 'PDF', studyCodeOf(parts.report))
  return pdf
}
