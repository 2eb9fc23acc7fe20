import { z } from 'zod'
import { IMAGE_VIEWS } from '../../shared/types/domain'
import type { CalibrationInput } from '../../shared/types/api'
import type { PixelReviewInput } from '../../shared/types/pixel-review'
import { pixelCoordinate, rowId, version } from './common'

const viewValue = z.union([z.enum(IMAGE_VIEWS), z.literal('')], {
  error: `must be one of ${IMAGE_VIEWS.join(', ')}`,
})

/** Multipart text fields arrive as strings, or arrays of strings when repeated. */
export const uploadFields = z.object({
  view: z
    .union([viewValue, z.array(viewValue)])
    .optional()
    .transform((value) => (value === undefined ? [] : Array.isArray(value) ? value : [value])),
  confirmPatientMismatch: z
    .enum(['true', 'false'], { error: 'must be true or false' })
    .optional()
    .transform((value) => value === 'true'),
})

const point = z.tuple([pixelCoordinate, pixelCoordinate], { error: 'must be [x, y]' })

export const calibrationBody = z.strictObject({
  line: z.tuple([point, point], { error: 'must be two points [[x1, y1], [x2, y2]]' }),
  lengthMm: z
    .number({ error: 'must be a number of millimetres' })
    .positive('must be positive')
    .max(1000, 'must be at most 1000 mm')
    .optional(),
  version,
}) satisfies z.ZodType<CalibrationInput>

export const renditionParams = z.object({
  id: rowId,
  name: z.enum(['display', 'preview', 'thumbnail', 'full-depth'], {
    error: 'must be display, preview, thumbnail or full-depth',
  }),
})

export const pixelReviewBody = z.strictObject({
  cleared: z.boolean({ error: 'must be true or false' }),
  confirmHeaderSaysYes: z.boolean({ error: 'must be true or false' }).optional(),
}) satisfies z.ZodType<PixelReviewInput>
