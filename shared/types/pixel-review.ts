/**
 * Whether a film's pixels may show the patient's identity. The DICOM header's Burned In
 * Annotation (0028,0301; DICOM PS3.3 C.7.6.1 General Image Module, values YES and NO) says so
 * for DICOM films; ordinary image files carry no such claim.
 */
export const BURNED_IN_ANNOTATION_STATES = ['yes', 'no', 'unknown'] as const
export type BurnedInAnnotation = (typeof BURNED_IN_ANNOTATION_STATES)[number]

/** A film's pixel state as the API answers it. */
export interface PixelReview {
  /** What the header claims: 'unknown' when absent, not YES or NO, or not a DICOM file. */
  burnedInAnnotation: BurnedInAnnotation
  /** Whether a clinician has confirmed, after looking, that the pixels show no identity. */
  cleared: boolean
  /** The clinician and when; null for researchers and while not cleared. */
  clearedBy: number | null
  clearedByName: string | null
  clearedAt: string | null
}

/**
 * Researchers are served a film only when its header says NO or a clinician has cleared it;
 * everything else is held back as if it were absent.
 */
export function isReleasedToResearchers(film: {
  burnedInAnnotation: BurnedInAnnotation
  pixelsClearedAt: string | null
}): boolean {
  return film.burnedInAnnotation === 'no' || film.pixelsClearedAt !== null
}

export interface PixelReviewInput {
  cleared: boolean
  /** Required true to clear a film whose header says YES (it declares burned-in text). */
  confirmHeaderSaysYes?: boolean
}
