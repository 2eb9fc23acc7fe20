import { z } from 'zod'
import {
  MOTION_SEGMENTS,
  READING_STATUSES,
  READING_TEMPLATES,
  type ReadingTemplate,
} from '../../shared/types/domain'
import {
  READING_SORT_FIELDS,
  type AmendmentInput,
  type CommentInput,
  type CreateReadingInput,
  type PatchReadingInput,
  type ReadingQuery,
  type ReturnReadingInput,
} from '../../shared/types/readings'
import type { TemplateOptions } from '../../shared/readings/templates'
import { pagingQuery, pixelCoordinate, version } from './common'

const point = z.tuple([pixelCoordinate, pixelCoordinate], {
  error: 'must be [x, y] in image pixels',
})

/** Landmark name → [x, y]; names are checked against the template by the service. */
const points = z
  .record(
    z
      .string()
      .min(1, 'a landmark name cannot be empty')
      .max(40, 'a landmark name is at most 40 characters'),
    point,
    {
      error: 'must be an object of landmark name → [x, y]',
    },
  )
  .refine((value) => Object.keys(value).length <= 120, 'holds at most 120 landmarks')

const segment = z.enum(MOTION_SEGMENTS, { error: `must be one of ${MOTION_SEGMENTS.join(', ')}` })

const options = z.strictObject({
  segment: segment.optional(),
  construct: z
    .array(
      z.strictObject({
        segment,
        implant: z.enum(['cage', 'disc-replacement'], {
          error: 'must be cage or disc-replacement',
        }),
      }),
      { error: 'must be a list of { segment, implant }' },
    )
    .optional(),
  discReplacements: z
    .array(segment, { error: 'must be a list of segments with a disc replacement' })
    .optional(),
}) satisfies z.ZodType<TemplateOptions>

/** Which options each template takes; anything else is refused rather than silently ignored. */
function checkOptions(
  template: ReadingTemplate,
  value: TemplateOptions,
  ctx: z.RefinementCtx,
): void {
  const issue = (path: string[], message: string) =>
    ctx.addIssue({ code: 'custom', path: ['options', ...path], message })
  if (template === 'implant-centring') {
    if (value.segment !== undefined || value.construct !== undefined)
      issue(
        [value.segment !== undefined ? 'segment' : 'construct'],
        'does not apply to the implant-centring template; list the segments in discReplacements',
      )
    const listed = value.discReplacements ?? []
    if (listed.length === 0)
      issue(
        ['discReplacements'],
        'must list at least one segment with a disc replacement for the implant-centring template',
      )
    listed.forEach((entry, index) => {
      if (listed.indexOf(entry) !== index)
        issue(['discReplacements', String(index)], `lists ${entry} twice`)
    })
    return
  }
  if (value.discReplacements !== undefined)
    issue(['discReplacements'], `does not apply to the ${template} template`)
  if (template === 'slip-grade' || template === 'motion-pair') {
    if (value.segment === undefined)
      issue(
        ['segment'],
        `is required for the ${template} template (one of ${MOTION_SEGMENTS.join(', ')})`,
      )
    if (value.construct !== undefined)
      issue(['construct'], `does not apply to the ${template} template`)
  }
  if (template === 'construct-check') {
    if (value.segment !== undefined)
      issue(
        ['segment'],
        'does not apply to the construct-check template; list the treated segments in construct',
      )
    if (value.construct === undefined || value.construct.length === 0) {
      issue(
        ['construct'],
        'must list at least one treated segment and its implant for the construct-check template',
      )
    } else {
      const seen = new Set<string>()
      for (const [index, entry] of value.construct.entries()) {
        if (seen.has(entry.segment))
          issue(['construct', String(index), 'segment'], `lists ${entry.segment} twice`)
        seen.add(entry.segment)
      }
    }
  }
  if (template === 'lumbar-alignment') {
    if (value.segment !== undefined)
      issue(['segment'], 'does not apply to the lumbar-alignment template')
    if (value.construct !== undefined)
      issue(['construct'], 'does not apply to the lumbar-alignment template')
  }
}

export const createReadingBody = z
  .strictObject({
    template: z.enum(READING_TEMPLATES, {
      error: `must be one of ${READING_TEMPLATES.join(', ')}`,
    }),
    options: options.optional(),
    pairedImageId: z
      .number({ error: 'must be the id of the extension film' })
      .int()
      .positive()
      .optional(),
    points: points.optional(),
  })
  .superRefine((value, ctx) => {
    checkOptions(value.template, value.options ?? {}, ctx)
    if (value.template === 'motion-pair' && value.pairedImageId === undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['pairedImageId'],
        message: 'is required for a motion pair: the extension film of the same visit',
      })
    }
    if (value.template !== 'motion-pair' && value.pairedImageId !== undefined) {
      ctx.addIssue({
        code: 'custom',
        path: ['pairedImageId'],
        message: 'applies to the motion-pair template only',
      })
    }
  }) satisfies z.ZodType<CreateReadingInput>

/** Landmark name → whether its suggestion was accepted; names are checked by the service. */
const acceptance = z
  .record(
    z
      .string()
      .min(1, 'a landmark name cannot be empty')
      .max(40, 'a landmark name is at most 40 characters'),
    z.boolean({ error: 'must be true (suggestion accepted) or false (own point kept)' }),
    { error: 'must be an object of landmark name → true or false' },
  )
  .refine((value) => Object.keys(value).length <= 120, 'holds at most 120 landmarks')

const suggestionUse = z.strictObject(
  { points: acceptance, pairedPoints: acceptance.optional() },
  { error: 'must be { points, pairedPoints? } of landmark name → true or false' },
)

export const patchReadingBody = z.strictObject({
  points,
  pairedPoints: points.optional(),
  suggestionUse: suggestionUse.optional(),
  version,
}) satisfies z.ZodType<PatchReadingInput>

export const submitReadingBody = z.strictObject({ version })

const freeText = (max: number, what: string) =>
  z
    .string({ error: `${what} is required` })
    .trim()
    .min(1, `${what} is required`)
    .max(max, `${what} must be at most ${max} characters`)

export const returnReadingBody = z.strictObject({
  version,
  comment: freeText(2000, 'a comment saying what to change'),
}) satisfies z.ZodType<ReturnReadingInput>

export const amendmentBody = z.strictObject({
  reason: freeText(500, 'a reason for the amendment'),
}) satisfies z.ZodType<AmendmentInput>

export const commentBody = z.strictObject({
  text: freeText(2000, 'the comment'),
}) satisfies z.ZodType<CommentInput>

const me = z.literal('me', { error: 'can only be me' }).optional()

export const readingQuery = z.object({
  status: z
    .string()
    .transform((text) => text.split(',').filter(Boolean))
    .pipe(
      z.array(
        z.enum(READING_STATUSES, { error: `must list some of ${READING_STATUSES.join(', ')}` }),
      ),
    )
    .optional(),
  rater: me,
  awaiting: me,
  signedBy: me,
  returnedBy: me,
  patientId: z.coerce.number({ error: 'must be a patient id' }).int().positive().optional(),
  sort: z
    .enum(READING_SORT_FIELDS, { error: `must be one of ${READING_SORT_FIELDS.join(', ')}` })
    .optional(),
  order: z.enum(['asc', 'desc'], { error: 'must be asc or desc' }).optional(),
  ...pagingQuery,
}) satisfies z.ZodType<ReadingQuery, unknown>

/** The landmark points of a reading, also the points of a document sent to compute. */
export { points as landmarkPoints }
