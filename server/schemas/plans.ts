import { z } from 'zod'
import { MOTION_SEGMENTS, PLANNED_TREATMENTS } from '../../shared/types/domain'
import { IMPLANT_TREATMENTS, type PlanSegmentInput } from '../../shared/types/plans'
import { idParam, trimmed } from './common'

export const planSegmentParams = idParam.extend({
  segment: z.enum(MOTION_SEGMENTS, { error: `must be one of ${MOTION_SEGMENTS.join(', ')}` }),
})

const finding = z.boolean({ error: 'must be true or false' })

const inRange = (min: number, max: number, unit: string) =>
  z
    .number({ error: `must be a number of ${unit} or null` })
    .min(min, `must be at least ${min} ${unit}`)
    .max(max, `must be at most ${max} ${unit}`)
    .nullable()

/** Implant values only where an implant is placed or a segment angle is set. */
function checkImplant(value: PlanSegmentInput, ctx: z.RefinementCtx): void {
  if (IMPLANT_TREATMENTS.includes(value.treatment)) return
  for (const field of ['implantLordosisDeg', 'implantHeightMm'] as const) {
    if (value[field] !== null) {
      ctx.addIssue({
        code: 'custom',
        path: [field],
        message: `applies only to ${IMPLANT_TREATMENTS.join(', ')}; send null for ${value.treatment}`,
      })
    }
  }
}

export const planSegmentBody = z
  .strictObject({
    parsDefectLeft: finding,
    parsDefectRight: finding,
    facetDegeneration: finding,
    dynamicInstability: finding,
    treatment: z.enum(PLANNED_TREATMENTS, {
      error: `must be one of ${PLANNED_TREATMENTS.join(', ')}`,
    }),
    implantLordosisDeg: inRange(0, 30, 'degrees'),
    implantHeightMm: inRange(4, 20, 'mm'),
    notes: trimmed(1000)
      .nullable()
      .transform((text) => (text ? text : null)),
    version: z
      .number({ error: 'must be the version you last read, or null for a new segment' })
      .int()
      .positive()
      .nullable(),
  })
  .superRefine(checkImplant) satisfies z.ZodType<PlanSegmentInput, unknown>
