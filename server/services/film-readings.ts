import type { Db } from '../db/knex'
import type { ImageRow } from '../db/images'
import { listReadingsOfImage, type ReadingRecord } from '../db/readings'
import { loadSiteSettings } from './site-settings'
import { badRequest } from '../errors'
import {
  computeMeasurements,
  computeUncertainty,
  DEFAULT_SIGMA_PX,
} from '../../shared/measurement/index'
import { currentReadingOf } from '../../shared/readings/current-reading'
import type { FilmMeasures, ReadingFilmSide } from '../../shared/types/compare'
import type { PixelPoint } from '../../shared/types/landmarks'

/** A film's reading and which of the reading's films it is. */
export interface FilmReading {
  reading: ReadingRecord
  side: ReadingFilmSide
}

/**
 * The reading to show on a film: `wantedReadingId` when it is one of the film's readings (as the
 * image or as a motion pair's paired image), else the film's current reading; null when the film
 * has none. A wanted reading that is not on this film is a 400.
 */
export async function readingForFilm(
  db: Db,
  image: ImageRow,
  wantedReadingId?: number,
): Promise<FilmReading | null> {
  // A reading of a re-reading round never stands for the film in a clinical view.
  const readings = (await listReadingsOfImage(db, image.id)).filter((reading) => !reading.blinded)
  const chosen =
    wantedReadingId === undefined
      ? currentReadingOf(readings)
      : readings.find((reading) => reading.id === wantedReadingId)
  if (wantedReadingId !== undefined && !chosen) {
    throw badRequest(`readings: reading ${wantedReadingId} is not a reading of film ${image.id}`, {
      readings: [`readings: reading ${wantedReadingId} is not on film ${image.id}`],
    })
  }
  if (!chosen) return null
  return { reading: chosen, side: chosen.imageId === image.id ? 'primary' : 'paired' }
}

/** The landmarks a reading placed on one of its films, image px. */
export function pointsOnFilm(filmReading: FilmReading | null): Record<string, PixelPoint> {
  if (!filmReading) return {}
  const { reading, side } = filmReading
  return side === 'primary' ? reading.landmarks.points : (reading.pairedLandmarks?.points ?? {})
}

/** The site's landmark placement SD (mm), as the readings are computed with. */
export async function siteSigmaMm(db: Db): Promise<number> {
  return (await loadSiteSettings(db)).landmarkSigmaMm
}

/**
 * What a reading measured on one of its films: the stored results on its image; on the paired
 * (extension) film of a motion pair, whose measures are not stored one by one, the engine run on
 * the stored paired landmarks with the site's σ. Null when the engine refuses them.
 */
export function filmMeasuresOf(
  filmReading: FilmReading | null,
  sigmaMm: number,
): FilmMeasures | null {
  if (!filmReading) return null
  const { reading, side } = filmReading
  if (side === 'primary') {
    return {
      measurements: reading.results.measurements,
      uncertainty: reading.results.uncertainty,
      calibrationSource: reading.calibration.source,
    }
  }
  const document = reading.pairedLandmarks
  if (!document) return null
  try {
    return {
      measurements: computeMeasurements(document),
      // The σ the reading's results were computed with, where they record it.
      uncertainty: computeUncertainty(document, {
        sigmaMm: reading.results.computedWith?.landmarkSigmaMm ?? sigmaMm,
        sigmaPx: DEFAULT_SIGMA_PX,
      }),
      calibrationSource: reading.pairedCalibration?.source ?? 'none',
    }
  } catch {
    return null
  }
}
