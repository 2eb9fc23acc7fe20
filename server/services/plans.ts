import type { Db } from '../db/knex'
import {
  findPlanSegment,
  insertPlanSegment,
  listPatientReadings,
  listPlanSegments,
  updatePlanSegment,
  type PatientReadingSummary,
  type PlanSegmentRecord,
} from '../db/plans'
import type { PatientRecord } from '../db/patients'
import { conflict } from '../errors'
import { checkSegmentPlan, estimatePlannedLordosis } from '../../shared/measurement/plan-checks'
import { piLlBandFromMismatchDeg } from '../../shared/measurement/alignment'
import { MOTION_SEGMENTS, type MotionSegment } from '../../shared/types/domain'
import { roleCan } from '../../shared/types/permissions'
import type {
  PatientPlan,
  PlanLordosis,
  PlanSegment,
  PlanSegmentInput,
} from '../../shared/types/plans'
import { audit, type Actor } from './audit'
import { loadVisiblePatient } from './patients'
import { engineTreatment } from './plans-treatment'
import {
  EVIDENCE_NOTE,
  firstMeasured,
  implantPositionEvidence,
  postOpEvidenceReadings,
  preOpEvidenceReadings,
  segmentEvidence,
} from './plans-evidence'

const RECORDED_INSTABILITY_SOURCE =
  'common practice: a disc replacement needs a stable segment; the measured criterion is the translation check'

const either = (left: boolean | null, right: boolean | null): boolean | null =>
  left === null || right === null ? null : left || right

function toPlanSegment(
  segment: MotionSegment,
  record: PlanSegmentRecord | undefined,
  preOp: readonly PatientReadingSummary[],
  postOp: readonly PatientReadingSummary[],
  patient: PatientRecord,
): PlanSegment {
  const evidence = segmentEvidence(preOp, segment)
  // A segment never saved has no findings recorded: unknown, never "absent".
  const finding = (value: boolean | undefined) => value ?? null
  const parsDefectLeft = finding(record?.parsDefectLeft)
  const parsDefectRight = finding(record?.parsDefectRight)
  const facetDegeneration = finding(record?.facetDegeneration)
  const treatment = record?.treatment ?? 'none'
  const dynamicInstability = finding(record?.dynamicInstability)
  return {
    segment,
    parsDefectLeft,
    parsDefectRight,
    facetDegeneration,
    dynamicInstability,
    treatment,
    implantLordosisDeg: record?.implantLordosisDeg ?? null,
    implantHeightMm: record?.implantHeightMm ?? null,
    notes: record?.notes ?? null,
    version: record?.version ?? null,
    updatedAt: record?.updatedAt ?? null,
    evidence,
    checks: checkSegmentPlan({
      treatment: engineTreatment(treatment),
      parsDefect: either(parsDefectLeft, parsDefectRight),
      slipPercent: evidence.slipPercent?.value ?? null,
      facetDegeneration,
      dynamicTranslationMm: evidence.dynamicTranslationMm?.value ?? null,
      osteoporosis: patient.osteoporosis,
      residualDiscHeightMm: evidence.residualDiscHeightMm?.value ?? null,
    }),
    implantPosition:
      treatment === 'disc-replacement' ? implantPositionEvidence(postOp, segment) : null,
    recordedInstability:
      treatment === 'disc-replacement'
        ? {
            label: 'instability on dynamic films recorded at a disc replacement level',
            flagged: dynamicInstability,
            source: RECORDED_INSTABILITY_SOURCE,
          }
        : null,
  }
}

function planLordosis(
  segments: readonly PlanSegment[],
  preOp: readonly PatientReadingSummary[],
): PlanLordosis {
  const alignment = preOp.filter((r) => r.template === 'lumbar-alignment')
  const current = firstMeasured(alignment, (r) => r.results?.measurements?.lumbarLordosisDeg)
  const pi = firstMeasured(alignment, (r) => r.results?.measurements?.pelvis?.incidenceDeg)
  const estimate = estimatePlannedLordosis({
    currentLordosisDeg: current?.value ?? null,
    pelvicIncidenceDeg: pi?.value ?? null,
    segments: segments.map((s) => ({
      segment: s.segment,
      treatment: engineTreatment(s.treatment),
      plannedImplantAngleDeg: s.implantLordosisDeg,
      currentSegmentalLordosisDeg: s.evidence.currentSegmentalLordosisDeg?.value ?? null,
    })),
  })
  const mismatch = (lordosis: number | null | undefined) =>
    pi && lordosis !== null && lordosis !== undefined ? pi.value - lordosis : null
  const currentMismatchDeg = mismatch(current?.value)
  const plannedMismatchDeg = mismatch(estimate.expectedLordosisDeg)
  return {
    ...estimate,
    currentLordosisDeg: current,
    pelvicIncidenceDeg: pi,
    currentMismatchDeg,
    currentBand: currentMismatchDeg === null ? null : piLlBandFromMismatchDeg(currentMismatchDeg),
    plannedMismatchDeg,
    plannedBand: plannedMismatchDeg === null ? null : piLlBandFromMismatchDeg(plannedMismatchDeg),
  }
}

async function buildPlan(db: Db, patient: PatientRecord): Promise<PatientPlan> {
  const [records, readings] = await Promise.all([
    listPlanSegments(db, patient.id),
    listPatientReadings(db, patient.id),
  ])
  const preOp = preOpEvidenceReadings(readings)
  const postOp = postOpEvidenceReadings(readings)
  const segments = MOTION_SEGMENTS.map((segment) =>
    toPlanSegment(
      segment,
      records.find((r) => r.segment === segment),
      preOp,
      postOp,
      patient,
    ),
  )
  return {
    patientId: patient.id,
    segments,
    lordosis: planLordosis(segments, preOp),
    evidenceNote: EVIDENCE_NOTE,
  }
}

/**
 * Segments, findings and measures carry no identity, so researchers may read the plan too. They
 * get no free-text notes (a note can hold a name, a record number or a date, like a visit's
 * indication) and no save times, which could date the surgery.
 */
export function deidentifiedPlan(plan: PatientPlan): PatientPlan {
  return {
    ...plan,
    segments: plan.segments.map((segment) => ({ ...segment, notes: null, updatedAt: null })),
  }
}

export async function getPlan(db: Db, actor: Actor, patientId: number): Promise<PatientPlan> {
  const patient = await loadVisiblePatient(db, actor, patientId)
  const plan = await buildPlan(db, patient)
  const identifies = roleCan(actor.user.role, 'patient:identify')
  await audit(
    db,
    actor,
    'view',
    'plan',
    patientId,
    `Opened the plan of patient ${patient.studyCode}${identifies ? '' : ' (de-identified)'}`,
  )
  return identifies ? plan : deidentifiedPlan(plan)
}

function describe(input: PlanSegmentInput): string {
  const findings = [
    input.parsDefectLeft && 'pars defect left',
    input.parsDefectRight && 'pars defect right',
    input.facetDegeneration && 'facet degeneration',
    input.dynamicInstability && 'dynamic instability',
  ].filter(Boolean)
  const implant =
    input.implantLordosisDeg !== null || input.implantHeightMm !== null
      ? `, implant ${input.implantLordosisDeg ?? '–'}° / ${input.implantHeightMm ?? '–'} mm`
      : ''
  return `${input.treatment}${implant}; findings: ${findings.join(', ') || 'none'}`
}

const staleMessage =
  'Someone else saved this segment since you opened the plan. Nothing was overwritten: reload to see their changes.'

/**
 * Creates the segment's row (version null) or updates it from the version the surgeon last
 * read; a row that appeared meanwhile, or a stale version, is a 409 and writes nothing.
 */
export async function savePlanSegment(
  db: Db,
  actor: Actor,
  patientId: number,
  segment: MotionSegment,
  input: PlanSegmentInput,
): Promise<PatientPlan> {
  return db.transaction(async (trx) => {
    const patient = await loadVisiblePatient(trx, actor, patientId)
    const { version, ...fields } = input
    const current = await findPlanSegment(trx, patientId, segment)
    if (version === null) {
      if (current) {
        throw conflict(staleMessage, {
          version: [`version: current version is ${current.version}`],
        })
      }
      await insertPlanSegment(trx, patientId, segment, fields, actor.user.id)
    } else if (
      !(await updatePlanSegment(trx, patientId, segment, version, fields, actor.user.id))
    ) {
      throw conflict(staleMessage, {
        version: [
          current
            ? `version: current version is ${current.version}`
            : 'version: this segment has not been saved yet',
        ],
      })
    }
    const action = version === null ? 'create' : 'update'
    await audit(
      trx,
      actor,
      action,
      'plan-segment',
      `${patientId}:${segment}`,
      `${action === 'create' ? 'Planned' : 'Changed plan at'} ${segment} for patient ${patient.studyCode}: ${describe(input)}`,
    )
    return buildPlan(trx, patient)
  })
}
