import type { Point } from '../geometry/types'
import type { FrontalImageRightSide } from '../types/measurement'

/**
 * What a line shows; overlay colours encode this, never the vertebra. `endplate`: endplate lines
 * and the angle protractors built on them; `wall`: posterior walls and the slip offset; `pelvic`:
 * sacral plate, its perpendicular and the hip axis; `implant`: cage surfaces and implant markers;
 * `disc`: disc height markers.
 */
export type OverlayCategory = 'endplate' | 'wall' | 'pelvic' | 'implant' | 'disc'

/** One colour per kind of line (sRGB hex), shared by the canvas, the printed page and the PDF. */
export const OVERLAY_COLOURS: Record<OverlayCategory, string> = {
  endplate: '#5cc6ee',
  wall: '#f0b54a',
  pelvic: '#c39bf0',
  implant: '#78dd8c',
  disc: '#c9d1d8',
}

/**
 * One overlay primitive. Every coordinate and radius is in image pixels of the film the
 * landmarks were placed on (x right, y DOWN, origin at the centre of the top-left pixel).
 * Stroke widths, dash lengths, ring sizes and font sizes are not part of the geometry: each
 * renderer sets them in its own output units so they read the same at any film size or zoom.
 */
export type OverlayShape =
  | {
      kind: 'line'
      id: string
      category: OverlayCategory
      /** [x1, y1, x2, y2], image px. */
      points: number[]
      dashed?: boolean
    }
  | {
      kind: 'arc'
      id: string
      category: OverlayCategory
      /** Centre, image px. */
      center: Point
      /** Radius, image px. */
      radiusPx: number
      /** Where the arc starts: degrees clockwise from +x (y is down), as Konva's `rotation`. */
      rotationDeg: number
      /** Sweep, degrees clockwise from the start, > 0. */
      angleDeg: number
    }
  | {
      /** A marked point (femoral head centre, implant marker): the renderer draws a ring and cross. */
      kind: 'ring'
      id: string
      category: OverlayCategory
      /** Centre, image px. */
      center: Point
      /** 0: a ring of the renderer's own on-screen size. */
      radiusPx: number
    }
  | {
      kind: 'label'
      id: string
      category: OverlayCategory
      /** Anchor point, image px. */
      at: Point
      text: string
      /** Which edge of the label sits at `at` (text is vertically centred on it). */
      anchor: 'start' | 'end' | 'middle'
    }

/** A film's landmarks by name, image px (the landmark document's `points`). */
export type OverlayPoints = Readonly<Record<string, readonly [x: number, y: number]>>

/** What a film says about itself that changes the overlay words (never the geometry). */
export interface OverlayFilmContext {
  /** Frontal film: which patient side the image's right edge shows (DICOM Patient Orientation). */
  imageRightSide?: FrontalImageRightSide
}
