import type { Db } from '../db/knex'
import { listPatientReadings, listPlanSegments, type PatientReadingSummary } from '../db/plans'
import { listVisitsOfPatient } from '../db/visits'
import { roleCan } from '../../shared/types/permissions'
import { MOTION_SEGMENTS, type MotionSegment } from '../../shared/types/domain'
import type { SegmentMeasurement } from '../../shared/types/measurement'
import type { PatientTrends, TrendPoint, TrendSeries, TrendVisit } from '../../shared/types/plans'
import { audit, type Actor } from './audit'
import { loadVisiblePatient } from './patients'
import { sourceOf } from './plans-evidence'
import { COUNTED_STATUSES } from '../../shared/readings/reading-status'

/** Templates measured on one neutral film; a motion pair's values mix two positions. */
const STATIC_TEMPLATES = new Set(['slip-grade', 'lumbar-alignment', 'construct-check'])

type Pick = (reading: PatientReadingSummary) => number | null | undefined

function segmentOf(
  reading: PatientReadingSummary,
  segment: MotionSegment,
): SegmentMeasurement | undefined {
  if (!STATIC_TEMPLATES.has(reading.template)) return undefined
  return reading.results?.measurements?.segments?.[segment]
}

/**
 * One visit's value: from its latest submitted or signed reading that measured it, else from its
 * latest draft or returned reading (marked provisional), else none. `readings` are one visit's,
 * newest first.
 */
function visitPoint(
  readings: readonly PatientReadingSummary[],
  pick: Pick,
  withCalibration: boolean,
): TrendPoint | null {
  for (const drafts of [false, true]) {
    for (const reading of readings) {
      if (!COUNTED_STATUSES.includes(reading.status) !== drafts) continue
      const value = pick(reading)
      if (value !== null && value !== undefined) {
        return { ...sourceOf(reading, withCalibration), value, isDraft: drafts }
      }
    }
  }
  return null
}

function series(
  byVisit: ReadonlyMap<number, PatientReadingSummary[]>,
  base: Omit<TrendSeries, 'points'>,
  pick: Pick,
  withCalibration = false,
): TrendSeries {
  const points: TrendPoint[] = []
  for (const readings of byVisit.values()) {
    const point = visitPoint(readings, pick, withCalibration)
    if (point) points.push(point)
  }
  return { ...base, points }
}

/**
 * Trend charts of the main measures across visits: slip % of each measured segment, L1–S1
 * lordosis, and each planned-treated segment's lordosis and mean disc height. Researchers get a
 * sequence number and the interval since surgery instead of dates.
 */
export async function getTrends(db: Db, actor: Actor, patientId: number): Promise<PatientTrends> {
  const patient = await loadVisiblePatient(db, actor, patientId)
  const identified = roleCan(actor.user.role, 'patient:identify')
  const [visitRecords, readings, plan] = await Promise.all([
    listVisitsOfPatient(db, patientId),
    listPatientReadings(db, patientId),
    listPlanSegments(db, patientId),
  ])
  const visits: TrendVisit[] = visitRecords.map((visit, index) => ({
    visitId: visit.id,
    visitKind: visit.kind,
    monthsSinceSurgery: visit.monthsSinceSurgery,
    visitDate: identified ? visit.visitDate : null,
    sequence: index + 1,
  }))
  const byVisit = new Map<number, PatientReadingSummary[]>(visits.map((v) => [v.visitId, []]))
  for (const reading of readings) byVisit.get(reading.visitId)?.push(reading)

  const slipSeries = MOTION_SEGMENTS.map((segment) =>
    series(
      byVisit,
      {
        key: `slip-percent:${segment}`,
        measure: 'slip-percent',
        segment,
        label: `Slip at ${segment}`,
        unit: '%',
      },
      (r) => segmentOf(r, segment)?.slipPercent,
    ),
  ).filter((s) => s.points.length > 0)
  const lordosis = series(
    byVisit,
    {
      key: 'lumbar-lordosis',
      measure: 'lumbar-lordosis',
      segment: null,
      label: 'L1–S1 lordosis',
      unit: '°',
    },
    (r) => (STATIC_TEMPLATES.has(r.template) ? r.results?.measurements?.lumbarLordosisDeg : null),
  )
  const treated = MOTION_SEGMENTS.filter((segment) =>
    plan.some((row) => row.segment === segment && row.treatment !== 'none'),
  )
  const treatedSeries = treated.flatMap((segment) => [
    series(
      byVisit,
      {
        key: `segmental-lordosis:${segment}`,
        measure: 'segmental-lordosis',
        segment,
        label: `${segment} segmental lordosis`,
        unit: '°',
      },
      (r) => segmentOf(r, segment)?.segmentalLordosisDeg,
    ),
    series(
      byVisit,
      {
        key: `disc-height:${segment}`,
        measure: 'disc-height',
        segment,
        label: `${segment} mean disc height`,
        unit: 'mm',
      },
      (r) => segmentOf(r, segment)?.discHeightMm?.mean,
      true,
    ),
  ])
  if (identified) {
    await audit(
      db,
      actor,
      'view',
      'patient',
      patientId,
      `Viewed measurement trends of patient ${patient.studyCode}`,
    )
  }
  return { patientId, visits, series: [lordosis, ...slipSeries, ...treatedSeries] }
}
