import { z } from 'zod'

const idList = (min: number, max: number) =>
  z
    .string({ error: 'must list ids separated by commas, like 12,15' })
    .regex(/^\d+(,\d+)*$/, 'must list ids separated by commas, like 12,15')
    .transform((text) => text.split(',').map(Number))
    .refine((ids) => ids.length >= min && ids.length <= max, {
      message: min === max ? `must name exactly ${min} ids` : `must name at most ${max} ids`,
    })
    .refine((ids) => ids.every((id) => Number.isSafeInteger(id) && id > 0), {
      message: 'must hold positive whole numbers',
    })

/** Query of GET /api/comparisons: the two films, and optionally the readings to show on them. */
export const comparisonQuery = z.object({
  images: idList(2, 2).refine(([a, b]) => a !== b, { message: 'must name two different films' }),
  readings: idList(1, 2).optional(),
})

export type ComparisonQuery = z.infer<typeof comparisonQuery>
