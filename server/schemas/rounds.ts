import { z } from 'zod'
import { MOTION_SEGMENTS } from '../../shared/types/domain'
import { ROUND_KINDS, ROUND_STATUSES, ROUND_TEMPLATES } from '../../shared/types/rounds'
import { pagingQuery, rowId, version } from './common'

/** A round's size: enough for a reliability study, small enough to create in one request. */
export const MAX_ROUND_IMAGES = 500
export const MAX_ROUND_RATERS = 30
export const MAX_ROUND_REPEATS = 5

const ids = (what: string, min: number, max: number) =>
  z
    .array(
      z
        .number({ error: `must list ${what} ids` })
        .int()
        .positive(),
      {
        error: `must be an array of ${what} ids`,
      },
    )
    .min(min, `must list at least ${min} ${what}${min === 1 ? '' : 's'}`)
    .max(max, `must list at most ${max} ${what}s`)
    .refine((list) => new Set(list).size === list.length, `must not list a ${what} twice`)

export const createRoundBody = z
  .strictObject({
    name: z
      .string({ error: 'is required' })
      .trim()
      .min(1, 'is required')
      .max(160, 'must be at most 160 characters'),
    kind: z.enum(ROUND_KINDS, { error: `must be one of ${ROUND_KINDS.join(', ')}` }),
    template: z.enum(ROUND_TEMPLATES, {
      error: `must be one of ${ROUND_TEMPLATES.join(', ')} (one lateral film, nothing paired)`,
    }),
    templateOptions: z
      .strictObject({
        segment: z
          .enum(MOTION_SEGMENTS, { error: `must be one of ${MOTION_SEGMENTS.join(', ')}` })
          .optional(),
      })
      .optional(),
    options: z.strictObject({
      showResultsBeforeSubmit: z.boolean({ error: 'must be true or false' }),
      gapDays: z
        .number({ error: 'must be a whole number of days' })
        .int('must be a whole number of days')
        .min(1, 'must be at least 1 day')
        .max(365, 'must be at most 365 days')
        .optional(),
    }),
    // Two films at least: an ICC needs two targets.
    imageIds: ids('film', 2, MAX_ROUND_IMAGES),
    raterIds: ids('rater', 1, MAX_ROUND_RATERS),
    repeats: z
      .number({ error: 'must be a whole number' })
      .int('must be a whole number')
      .min(1, 'must be at least 1')
      .max(MAX_ROUND_REPEATS, `must be at most ${MAX_ROUND_REPEATS}`)
      .optional(),
    seed: z
      .string({ error: 'must be text' })
      .trim()
      .min(1, 'must not be empty')
      .max(64, 'must be at most 64 characters')
      .optional(),
  })
  .superRefine((body, ctx) => {
    if (body.kind === 'inter') {
      if (body.raterIds.length < 2)
        ctx.addIssue({
          code: 'custom',
          path: ['raterIds'],
          message: 'an inter-rater round needs at least 2 raters',
        })
      if (body.repeats !== undefined && body.repeats !== 1)
        ctx.addIssue({
          code: 'custom',
          path: ['repeats'],
          message: 'an inter-rater round reads each film once per rater',
        })
      if (body.options.gapDays !== undefined)
        ctx.addIssue({
          code: 'custom',
          path: ['options', 'gapDays'],
          message: 'applies to intra-rater rounds only',
        })
    } else {
      if (body.repeats !== undefined && body.repeats < 2)
        ctx.addIssue({
          code: 'custom',
          path: ['repeats'],
          message: 'an intra-rater round reads each film at least twice',
        })
      if (body.options.gapDays === undefined)
        ctx.addIssue({
          code: 'custom',
          path: ['options', 'gapDays'],
          message: 'is required for an intra-rater round (days between passes)',
        })
    }
    if (body.template !== 'slip-grade' && body.templateOptions?.segment !== undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['templateOptions', 'segment'],
        message: 'applies to the slip-grade template only',
      })
  })

export const patchRoundBody = z.strictObject({
  version,
  status: z.enum(ROUND_STATUSES, { error: `must be one of ${ROUND_STATUSES.join(', ')}` }),
})

export const roundListQuery = z.object(pagingQuery)

export const assignmentQuery = z.object({
  status: z.enum(['due', 'done', 'all'], { error: 'must be one of due, done, all' }).optional(),
  ...pagingQuery,
})

export const filmRenditionParams = z.object({
  id: rowId,
  name: z.enum(['display', 'preview', 'thumbnail', 'full-depth'], {
    error: 'must be one of display, preview, thumbnail, full-depth',
  }),
})
