import sharp from 'sharp'
import type { FileStore } from '../storage/file-store'
import { overlaySvg } from '../../shared/overlays/overlay-svg'
import type { ReportFilm } from '../../shared/types/reports'
import { HttpError } from '../errors'

/** Long side of the film in a report, px: about 200 dpi across an A4 text column. */
export const REPORT_FILM_LONG_SIDE_PX = 1400
/** A small crop is enlarged at most this much (beyond it only blur is added). */
const MAX_ENLARGEMENT = 4
/**
 * Strokes are this many times their on-screen size in output px: at 1400 px across about 360 pt
 * a 2 px line would print at half a point; doubled it prints at about 1 pt.
 */
const PRINT_STROKE_FACTOR = 2

export interface ComposedFilm {
  /** JPEG of the windowed film with the overlay strokes burnt in. */
  jpeg: Buffer
  widthPx: number
  heightPx: number
  /** Output px per image px. */
  scale: number
}

/**
 * The stored display rendition, or the same 404 the rendition route gives when the file is gone
 * from storage: a report cannot be drawn without its film, and that is no crash of the server.
 */
async function readDisplayRendition(store: FileStore, displayKey: string): Promise<Buffer> {
  try {
    return await store.read(displayKey)
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error
    throw new HttpError(
      404,
      'not_found',
      'The display rendition of a film in this report is missing from storage.',
    )
  }
}

/**
 * The report's picture of a film: the part `film.crop` of its stored full-size display rendition
 * (already windowed, 8-bit), scaled so its long side is `longSidePx` (enlarged at most 4×),
 * with the overlay strokes and landmark dots of `film` composited from an SVG of the shared
 * geometry (labels are left to the PDF, which sets them in Inter). Strokes are sized in output
 * px, twice their screen size for print. JPEG with full-resolution colour (4:4:4) so thin coloured lines keep their
 * hue.
 */
export async function composeReportFilm(
  store: FileStore,
  displayKey: string,
  film: ReportFilm,
  longSidePx = REPORT_FILM_LONG_SIDE_PX,
): Promise<ComposedFilm> {
  const { crop } = film
  // Enlarged when small, so strokes of a few output px stay thin on paper.
  const scale = Math.min(MAX_ENLARGEMENT, longSidePx / Math.max(crop.width, crop.height))
  const widthPx = Math.max(1, Math.round(crop.width * scale))
  const heightPx = Math.max(1, Math.round(crop.height * scale))
  const svg = overlaySvg(film.shapes, {
    widthPx: film.widthPx,
    heightPx: film.heightPx,
    outputWidthPx: widthPx,
    outputHeightPx: heightPx,
    unitPx: (crop.width / widthPx) * PRINT_STROKE_FACTOR,
    labels: false,
    points: film.points,
    crop,
  })
  const jpeg = await sharp(await readDisplayRendition(store, displayKey))
    .extract({ left: crop.x, top: crop.y, width: crop.width, height: crop.height })
    .resize(widthPx, heightPx, { fit: 'fill' })
    .toColourspace('srgb')
    .composite([{ input: Buffer.from(svg), top: 0, left: 0 }])
    .jpeg({ quality: 90, chromaSubsampling: '4:4:4' })
    .toBuffer()
  return { jpeg, widthPx, heightPx, scale: widthPx / crop.width }
}
