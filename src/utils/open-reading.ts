import type { ImageRecord } from '@shared/types/api'
import type { Reading } from '@shared/types/readings'
import { getReading } from '@/api/readings'
import { getImage } from '@/api/images'
import { getAssignmentFilm } from '@/api/assignments'
import { ApiError } from '@/api/http'
import { blindedFilmRecord } from '@/utils/blinded-film'

/** A reading opened from a re-reading assignment: what the blinded workspace shows instead. */
export interface BlindContext {
  assignmentId: number
  blindCode: string
  roundName: string
  /** False: no results, on the panel or the film, until the reading is submitted. */
  showResultsBeforeSubmit: boolean
}

export type OpenedReading =
  | {
      reading: Reading
      film: ImageRecord
      pairedFilm: ImageRecord | null
      /** Set for a blinded round's reading: no patient, visit or date belongs with it. */
      blind: BlindContext | null
    }
  | { error: string }

/**
 * Fetches a reading with the film(s) it is placed on: through the assignment for a blinded
 * round's reading (the clinical routes would date and name the film), else the image records.
 * Answers what went wrong in words for the workspace instead of throwing.
 */
export async function openReading(
  readingId: number,
  blindContext: BlindContext | null,
): Promise<OpenedReading> {
  try {
    const reading = await getReading(readingId)
    if (reading.blinded) {
      // Opened by its address rather than from the assignment: the film would come through
      // the clinical routes, so the reading is shown only from the worklist.
      if (!blindContext)
        return {
          error: 'This reading belongs to a blinded re-reading round: open it from your worklist.',
        }
      const blindFilm = await getAssignmentFilm(blindContext.assignmentId)
      const film = blindedFilmRecord(reading.imageId, blindFilm)
      return { reading, film, pairedFilm: null, blind: blindContext }
    }
    const [film, pairedFilm] = await Promise.all([
      getImage(reading.imageId),
      reading.pairedImageId === null ? Promise.resolve(null) : getImage(reading.pairedImageId),
    ])
    return { reading, film, pairedFilm, blind: null }
  } catch (caught) {
    return {
      error:
        caught instanceof ApiError && caught.status === 404
          ? 'This reading does not exist or is not in your studies.'
          : caught instanceof Error
            ? caught.message
            : String(caught),
    }
  }
}
