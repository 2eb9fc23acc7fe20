import type { PixelReview } from '@shared/types/pixel-review'
import { formatDateTime } from './format'

/** One line on a film's pixel state, as clinicians see it on the film card. */
export function pixelReviewLine(review: PixelReview): { text: string; heldBack: boolean } {
  if (review.cleared) {
    const by = review.clearedByName ? ` by ${review.clearedByName}` : ''
    const at = review.clearedAt ? `, ${formatDateTime(review.clearedAt)}` : ''
    return { text: `No identity in the pixels: confirmed${by}${at}`, heldBack: false }
  }
  if (review.burnedInAnnotation === 'no')
    return { text: 'Header: no burned-in text', heldBack: false }
  if (review.burnedInAnnotation === 'yes')
    return { text: 'Header: burned-in text · held back from researchers', heldBack: true }
  return { text: 'Pixels not yet checked · held back from researchers', heldBack: true }
}

/** The header's claim in words, for the review dialog. */
export const HEADER_CLAIM_WORDS: Record<PixelReview['burnedInAnnotation'], string> = {
  no: 'The DICOM header says the pixels carry no burned-in annotation (Burned In Annotation = NO).',
  yes: 'The DICOM header says the pixels carry burned-in annotation (Burned In Annotation = YES): text such as a name or record number may be part of the image.',
  unknown:
    'The file makes no claim about burned-in text: it is an ordinary image file, or its DICOM header leaves Burned In Annotation out.',
}
