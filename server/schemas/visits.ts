import { z } from 'zod'
import { VISIT_KINDS } from '../../shared/types/domain'
import type { VisitInput } from '../../shared/types/api'
import { isoDate, notInFuture, trimmed, version } from './common'

const visitFields = {
  visitDate: isoDate.refine(notInFuture, 'cannot be in the future'),
  visitKind: z.enum(VISIT_KINDS, { error: `must be one of ${VISIT_KINDS.join(', ')}` }),
  monthsSinceSurgery: z
    .number({ error: 'must be a number of months' })
    .int('must be whole months')
    .min(0, 'cannot be negative')
    .max(600, 'must be at most 600')
    .nullable()
    .optional(),
  indication: trimmed(500).nullable().optional(),
}

/** A follow-up needs its interval since surgery; the other kinds must not carry one. */
function checkInterval(value: Partial<VisitInput>, ctx: z.RefinementCtx): void {
  if (
    value.visitKind === 'follow-up' &&
    (value.monthsSinceSurgery === undefined || value.monthsSinceSurgery === null)
  ) {
    ctx.addIssue({
      code: 'custom',
      path: ['monthsSinceSurgery'],
      message: 'is required for a follow-up visit',
    })
  }
  if (
    value.visitKind &&
    value.visitKind !== 'follow-up' &&
    value.monthsSinceSurgery !== undefined &&
    value.monthsSinceSurgery !== null
  ) {
    ctx.addIssue({
      code: 'custom',
      path: ['monthsSinceSurgery'],
      message: 'applies to follow-up visits only',
    })
  }
}

export const createVisitBody = z
  .strictObject(visitFields)
  .superRefine(checkInterval) satisfies z.ZodType<VisitInput>

export const patchVisitBody = z
  .strictObject({
    visitDate: visitFields.visitDate.optional(),
    visitKind: visitFields.visitKind.optional(),
    monthsSinceSurgery: visitFields.monthsSinceSurgery,
    indication: visitFields.indication,
    version,
  })
  .superRefine(checkInterval)
