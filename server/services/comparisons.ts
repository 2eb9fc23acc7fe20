import type { Db } from '../db/knex'
import type { ImageRow } from '../db/images'
import type { PatientRecord } from '../db/patients'
import { listVisitsOfPatient, type VisitRecord } from '../db/visits'
import { badRequest } from '../errors'
import { compareTable } from '../../shared/compare/index'
import type { Comparison, ComparisonFilm } from '../../shared/types/compare'
import type { PatientPlan } from '../../shared/types/plans'
import { actorIdentifies, audit, type Actor } from './audit'
import {
  filmMeasuresOf,
  pointsOnFilm,
  readingForFilm,
  siteSigmaMm,
  type FilmReading,
} from './film-readings'
import { toImageRecord } from './image-dto'
import { loadVisibleImage } from './images'
import { getPlan } from './plans'
import { getClinicalReading } from './readings'
import { loadVisibleVisit, toDeidentifiedVisit, toIdentifiedVisit } from './visits'

/** One film of a patient, placed in the patient's visit order, with the reading to show on it. */
export interface PlacedFilm {
  image: ImageRow
  visit: VisitRecord
  /** Position of the visit in the patient's time order (0 = first). */
  visitIndex: number
  filmReading: FilmReading | null
}

/** The flexion film before the extension film of one visit; otherwise visit order, then id. */
function isBefore(a: PlacedFilm, b: PlacedFilm): boolean {
  if (a.visitIndex !== b.visitIndex) return a.visitIndex < b.visitIndex
  if (a.image.view === 'lateral-flexion' && b.image.view === 'lateral-extension') return true
  if (a.image.view === 'lateral-extension' && b.image.view === 'lateral-flexion') return false
  return a.image.id < b.image.id
}

async function comparisonFilm(
  db: Db,
  actor: Actor,
  film: PlacedFilm,
  patient: PatientRecord,
  sigmaMm: number,
): Promise<ComparisonFilm> {
  const identified = actorIdentifies(actor)
  return {
    image: toImageRecord(film.image, identified),
    visit: identified
      ? toIdentifiedVisit(film.visit, patient)
      : toDeidentifiedVisit(film.visit, patient, film.visitIndex + 1),
    // Through the readings service, so a researcher's copy carries no timestamps.
    reading: film.filmReading
      ? await getClinicalReading(db, actor, film.filmReading.reading.id)
      : null,
    side: film.filmReading?.side ?? null,
    points: pointsOnFilm(film.filmReading),
    measures: filmMeasuresOf(film.filmReading, sigmaMm),
  }
}

/**
 * The comparison of two placed films of one patient (earlier first), with the differences table
 * and, after surgery, the plan beside what was achieved. Writes no audit event: callers do.
 */
export async function buildComparison(
  db: Db,
  actor: Actor,
  patient: PatientRecord,
  films: [PlacedFilm, PlacedFilm],
  plan?: PatientPlan | null,
): Promise<Comparison> {
  const [before, after] = isBefore(films[0], films[1]) ? films : [films[1], films[0]]
  const sigmaMm = await siteSigmaMm(db)
  const [beforeFilm, afterFilm] = [
    await comparisonFilm(db, actor, before, patient, sigmaMm),
    await comparisonFilm(db, actor, after, patient, sigmaMm),
  ]
  const side = (film: PlacedFilm, dto: ComparisonFilm) => ({
    visitId: film.visit.id,
    visitKind: film.visit.kind,
    view: film.image.view,
    measures: dto.measures,
    reading: film.filmReading
      ? { id: film.filmReading.reading.id, results: film.filmReading.reading.results }
      : null,
  })
  return {
    patientId: patient.id,
    before: beforeFilm,
    after: afterFilm,
    table: compareTable({
      before: side(before, beforeFilm),
      after: side(after, afterFilm),
      plan: plan === undefined ? await getPlan(db, actor, patient.id) : plan,
    }),
  }
}

/** Loads a visible film of the patient's visits with the reading to show on it. */
export async function placeFilm(
  db: Db,
  image: ImageRow,
  visits: readonly VisitRecord[],
  wantedReadingId?: number,
): Promise<PlacedFilm> {
  const visitIndex = visits.findIndex((visit) => visit.id === image.visitId)
  return {
    image,
    visit: visits[visitIndex] as VisitRecord,
    visitIndex,
    filmReading: await readingForFilm(db, image, wantedReadingId),
  }
}

/**
 * GET /api/comparisons: two films of one patient side by side with their current readings (or
 * the readings asked for, each on its own film), earlier film first. Audited for roles that see
 * identified data, like any other read of it.
 */
export async function compareImages(
  db: Db,
  actor: Actor,
  imageIds: [number, number],
  readingIds: number[] = [],
): Promise<Comparison> {
  const first = await loadVisibleImage(db, actor, imageIds[0])
  const second = await loadVisibleImage(db, actor, imageIds[1])
  const { visit: firstVisit, patient } = await loadVisibleVisit(db, actor, first.visitId)
  const { visit: secondVisit } = await loadVisibleVisit(db, actor, second.visitId)
  if (firstVisit.patientId !== secondVisit.patientId) {
    throw badRequest('images: the two films belong to different patients', {
      images: ['images: both films must belong to one patient'],
    })
  }
  const visits = await listVisitsOfPatient(db, patient.id)
  const placed = [await placeFilm(db, first, visits), await placeFilm(db, second, visits)] as [
    PlacedFilm,
    PlacedFilm,
  ]
  // A reading asked for stands on every film it was made on (both films of a motion pair).
  for (const readingId of readingIds) {
    let found = false
    for (const film of placed) {
      const match = await readingForFilm(db, film.image, readingId).catch(() => null)
      if (match) {
        film.filmReading = match
        found = true
      }
    }
    if (!found) {
      throw badRequest(`readings: reading ${readingId} is not a reading of either film`, {
        readings: [`readings: reading ${readingId} is not a reading of these films`],
      })
    }
  }
  const comparison = await buildComparison(db, actor, patient, placed)
  if (actorIdentifies(actor)) {
    await audit(
      db,
      actor,
      'view',
      'patient',
      patient.id,
      `Compared films ${comparison.before.image.id} and ${comparison.after.image.id} of patient ${patient.studyCode}`,
    )
  }
  return comparison
}
