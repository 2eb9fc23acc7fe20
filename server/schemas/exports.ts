import { z } from 'zod'
import { READING_STATUSES, READING_TEMPLATES, VISIT_KINDS } from '../../shared/types/domain'

/** A query value given once, repeated (?a=x&a=y) or comma-separated, as a list of one enum. */
const enumList = <T extends readonly [string, ...string[]]>(values: T, name: string) =>
  z
    .union([z.string(), z.array(z.string())])
    .transform((value) => (Array.isArray(value) ? value : [value]).flatMap((v) => v.split(',')))
    .pipe(z.array(z.enum(values, { error: `${name} must be one of ${values.join(', ')}` })).max(10))
    .optional()

export const measurementExportQuery = z.strictObject({
  studyId: z.coerce.number({ error: 'must be a number' }).int().positive().optional(),
  visitKind: enumList(VISIT_KINDS, 'visitKind'),
  template: enumList(READING_TEMPLATES, 'template'),
  status: enumList(READING_STATUSES, 'status'),
  identified: z
    .enum(['true', 'false'], { error: 'must be true or false' })
    .transform((value) => value === 'true')
    .optional(),
})

export type MeasurementExportQuery = z.infer<typeof measurementExportQuery>
