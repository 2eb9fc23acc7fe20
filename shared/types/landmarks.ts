/**
 * The landmark document shared by the command line, the API, the database and the phantom
 * generator. Coordinates are image pixels: x to the right, y down, origin at the centre of the
 * top-left pixel.
 */
export type PixelPoint = [x: number, y: number]

/**
 * Millimetres per pixel: one number for square pixels, or `[row, column]` spacing
 * (DICOM PS3.3 §10.7.1.3 order: vertical first) when pixels are not square.
 */
export type PixelSpacingMm = number | [row: number, column: number]

export interface LandmarkDocument {
  mmPerPixel?: PixelSpacingMm | null
  points: Record<string, PixelPoint>
}
