import type { Patient, Visit } from '@shared/types/api'
import type { ComparisonFilm } from '@shared/types/compare'
import { TEMPLATE_LABELS } from '@shared/readings/templates'
import { SPACING_SOURCE_LABELS } from '@shared/format/spacing-source-labels'
import { numberWithUnit } from '@shared/format/number-text'
import { IMAGE_VIEW_WORDS, visitText } from '@shared/reports/visit-text'

const STATUS_WORDS: Record<string, string> = {
  draft: 'draft',
  submitted: 'awaiting sign-off',
  signed: 'signed',
}

/** "Vantongeren, Maelis · CMP-77120" for clinical roles; the study code for researchers. */
export function patientText(patient: Patient | null): string {
  if (!patient) return 'Patient'
  return patient.kind === 'identified'
    ? `${patient.familyName}, ${patient.givenName} · ${patient.recordNumber}`
    : patient.studyCode
}

/** A film in a picker: its visit and its view. */
export function filmChoiceText(visit: Visit, view: keyof typeof IMAGE_VIEW_WORDS): string {
  return `${visitText(visit)} — ${IMAGE_VIEW_WORDS[view]}`
}

/** The caption over one side: visit, view, and the reading shown with its status and rater. */
export function filmCaption(side: ComparisonFilm): string {
  const film = `${visitText(side.visit)} · ${IMAGE_VIEW_WORDS[side.image.view]}`
  const reading = side.reading
  if (!reading) return `${film} · no reading yet`
  const segment = reading.options.segment ? ` ${reading.options.segment}` : ''
  return `${film} · ${TEMPLATE_LABELS[reading.template]}${segment}, ${STATUS_WORDS[reading.status] ?? reading.status} (${reading.raterName})`
}

/** Where the side's mm values get their scale: the reading's calibration, else the film's. */
export function calibrationText(side: ComparisonFilm): string {
  const reading = side.reading
  const calibration =
    reading && side.side === 'paired' ? reading.pairedCalibration : reading?.calibration
  const mmPerPixel = calibration?.mmPerPixel ?? side.image.mmPerPixel
  const source = calibration?.source ?? side.image.spacingSource
  const spacing = (mmPerPixel && numberWithUnit(mmPerPixel[1], 4, 'mm/px')) || 'no mm scale'
  return `Scale: ${spacing} · ${SPACING_SOURCE_LABELS[source]}`
}

/** Column heading of one side: the view within one visit, else the visit. */
export function columnText(side: ComparisonFilm, other: ComparisonFilm): string {
  if (side.visit.id === other.visit.id) return IMAGE_VIEW_WORDS[side.image.view]
  return visitText(side.visit).split(' · ').slice(0, 2).join(' · ')
}
