/**
 * A position [x, y] in a 2-D image-oriented space: x to the right, y DOWN. The unit is that of
 * the space the point lives in (image pixels, or millimetres after `pointPxToMm`); the name of
 * the function or variable that holds it says which.
 */
export type Point = readonly [x: number, y: number]

/**
 * A displacement [dx, dy] in the same image-oriented space as `Point` (x right, y down), in the
 * unit of that space.
 */
export type Vector = readonly [dx: number, dy: number]

/**
 * Physical size of one pixel in millimetres. DICOM stores row spacing (vertical, between rows)
 * first and column spacing (horizontal) second (PS3.3 §10.7.1.3) [V]; keeping both names
 * explicit avoids swapping them.
 */
export interface PixelSpacing {
  /** Vertical distance between pixel centres (along y), mm. */
  readonly rowMm: number
  /** Horizontal distance between pixel centres (along x), mm. */
  readonly columnMm: number
}

/** A circle in an image-oriented space (x right, y down); centre and radius in that space's unit. */
export interface Circle {
  readonly center: Point
  readonly radius: number
}
