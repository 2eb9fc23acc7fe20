import type { PlannedTreatment, ReadingStatus } from '@shared/types/domain'
import type { PiLlBand, PlanCheckFlag, PlanCheckId } from '@shared/types/measurement'
import type {
  FrontalImplantPosition,
  ImplantPositionEvidence,
  MeasureSource,
} from '@shared/types/plans'
import { frontalSideWords } from '@shared/measurement/implant-centring'
import { TEMPLATE_LABELS } from '@shared/readings/templates'
import { READING_STATUS_LABELS } from '@shared/readings/reading-status'
import { VISIT_KIND_LABELS } from '@/utils/format'
import { SPACING_SOURCE_SHORT } from '@shared/format/spacing-source-labels'
import { numberText, numberWithUnit } from '@shared/format/number-text'

export const TREATMENT_LABELS: Record<PlannedTreatment, string> = {
  none: 'No treatment',
  decompression: 'Decompression',
  'disc-replacement': 'Disc replacement',
  'interbody-fusion': 'Interbody fusion',
  'posterior-fusion': 'Posterior fusion',
}

/** Short names for the table; the engine's full label and source go in the tooltip. */
export const CHECK_SHORT_LABELS: Record<PlanCheckId, string> = {
  'pars-defect': 'Pars defect',
  'slip-grade-ii-or-more': 'Slip grade II or more',
  'facet-degeneration': 'Facet degeneration',
  'dynamic-translation-over-5mm': 'Translation over 5 mm',
  osteoporosis: 'Osteoporosis',
  'residual-disc-height-under-3mm': 'Disc height under 3 mm',
}

export type CheckState = 'flagged' | 'clear' | 'unknown'

export function checkState(check: Pick<PlanCheckFlag, 'flagged'>): CheckState {
  if (check.flagged === null) return 'unknown'
  return check.flagged ? 'flagged' : 'clear'
}

export const CHECK_STATE_LABELS: Record<CheckState, string> = {
  flagged: 'Flagged',
  clear: 'Not flagged',
  unknown: 'Not recorded',
}

const statusText = (status: ReadingStatus) => READING_STATUS_LABELS[status].toLowerCase()

/** "Reading 12 · Slip grade · submitted · Pre-op" (plus the mm scale when it matters). */
export function sourceText(source: MeasureSource): string {
  const scale = source.calibrationSource
    ? ` · ${SPACING_SOURCE_SHORT[source.calibrationSource]}`
    : ''
  return `Reading ${source.readingId} · ${TEMPLATE_LABELS[source.template]} · ${statusText(source.status)} · ${VISIT_KIND_LABELS[source.visitKind]}${scale}`
}

export const BAND_LABELS: Record<PiLlBand, string> = {
  '0': 'band 0 (under 10°)',
  '+': 'band + (10–20°)',
  '++': 'band ++ (over 20°)',
}

/** The shared formatter (shared/format) with one digit by default; "—" for no value. */
export function formatNumber(value: number | null | undefined, digits = 1): string {
  return value === null || value === undefined || !Number.isFinite(value)
    ? '—'
    : numberText(value, digits)
}

/** "12.3°" or "4.0 mm"; a bare dash when there is no value (no unit on nothing). */
export function formatWithUnit(value: number | null | undefined, unit: '°' | ' mm' | ' %'): string {
  return numberWithUnit(value, 1, unit.trim()) ?? '—'
}

/** "2.6 mm toward patient left (5.3 % of the endplate width)", or with "image right" when the film does not say. */
export function frontalOffsetText(position: FrontalImplantPosition): string {
  const { lateralOffsetMm: mm, lateralOffsetPercent: percent } = position
  const signed = percent ?? mm
  if (signed === null) return '—'
  const side = frontalSideWords(position.imageRightSide, signed > 0 ? 'r' : 'l')
  const percentText = percent === null ? '' : `${formatNumber(Math.abs(percent))} % of the width`
  if (Number(formatNumber(Math.abs(signed))) === 0) return `centred (${percentText || '0.0 mm'})`
  if (mm === null) return `${percentText} toward ${side} (no mm: uncalibrated)`
  return `${formatNumber(Math.abs(mm))} mm toward ${side} (${percentText})`
}

/** "Implant 46.0 % from posterior (−1.5 mm)", the lateral film's position of the marker. */
export function lateralPositionText(evidence: ImplantPositionEvidence): string {
  const percent = evidence.lateralPositionPercent?.value
  if (percent === undefined || percent === null) return '—'
  const mm = evidence.lateralOffsetMm?.value
  const offset =
    mm === undefined || mm === null
      ? ''
      : ` (${mm < 0 ? '−' : '+'}${formatNumber(Math.abs(mm))} mm from the middle)`
  return `${formatNumber(percent)} % of depth from posterior${offset}`
}
