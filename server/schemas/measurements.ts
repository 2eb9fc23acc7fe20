import { z } from 'zod'
import { PLAUSIBLE_SPACING_MM } from '../images/dicom/pixel-spacing'
import { landmarkPoints } from './readings'

/** Query of POST /api/measurements/compute: intervals on request, with σ overrides. */
export const computeQuery = z.object({
  uncertainty: z.enum(['true', 'false'], { error: 'must be true or false' }).optional(),
  sigmaMm: z.coerce
    .number({ error: 'must be a number' })
    .positive('must be positive')
    .max(20)
    .optional(),
  sigmaPx: z.coerce
    .number({ error: 'must be a number' })
    .positive('must be positive')
    .max(100)
    .optional(),
})

const { min, max } = PLAUSIBLE_SPACING_MM
const spacingMm = z
  .number({ error: 'must be a number of mm per pixel' })
  .finite('must be a finite number of mm per pixel')
  .min(min, `must be ${min}–${max} mm per pixel, the range of radiographs`)
  .max(max, `must be ${min}–${max} mm per pixel, the range of radiographs`)

/**
 * Body of POST /api/measurements/compute: a landmark document whose points obey the same rules
 * as a reading's, and whose spacing the same range as a film header's. The engine then checks
 * the geometry (names, endplates, rims).
 */
export const computeBody = z.strictObject({
  mmPerPixel: z
    .union([spacingMm, z.tuple([spacingMm, spacingMm])], {
      error: 'must be one number of mm per pixel or [row, column]',
    })
    .nullable()
    .optional(),
  points: landmarkPoints,
})
