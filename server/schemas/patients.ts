import { z } from 'zod'
import { SEXES } from '../../shared/types/domain'
import { PATIENT_SORT_FIELDS, type PatientInput, type PatientQuery } from '../../shared/types/api'
import { isoDate, notInFuture, trimmed, version } from './common'

const recordNumber = z
  .string({ error: 'is required' })
  .trim()
  .min(1, 'is required')
  .max(40, 'must be at most 40 characters')
  .regex(/^[A-Za-z0-9][A-Za-z0-9\-/.]*$/, 'may hold letters, digits, - / and . only')

const personName = z
  .string({ error: 'is required' })
  .trim()
  .min(1, 'is required')
  .max(100, 'must be at most 100 characters')

const patientFields = {
  recordNumber,
  familyName: personName,
  givenName: personName,
  birthDate: isoDate
    .refine(notInFuture, 'cannot be in the future')
    .refine((text) => text >= '1900-01-01', 'must be after 1900'),
  sex: z.enum(SEXES, { error: `must be one of ${SEXES.join(', ')}` }),
  osteoporosis: z.boolean({ error: 'must be true or false' }).optional(),
  notes: trimmed(4000).nullable().optional(),
  responsibleSurgeonId: z
    .number({ error: 'must be the id of a surgeon, or null' })
    .int()
    .positive()
    .nullable()
    .optional(),
}

export const createPatientBody = z.strictObject(patientFields) satisfies z.ZodType<PatientInput>

export const patchPatientBody = z
  .strictObject({
    ...Object.fromEntries(
      Object.entries(patientFields).map(([key, schema]) => [key, schema.optional()]),
    ),
    version,
  })
  .transform((value) => value as Partial<PatientInput> & { version: number })

export const patientQuery = z.object({
  q: z.string().trim().max(100, 'must be at most 100 characters').optional(),
  sort: z
    .enum(PATIENT_SORT_FIELDS, { error: `must be one of ${PATIENT_SORT_FIELDS.join(', ')}` })
    .optional(),
  order: z.enum(['asc', 'desc'], { error: 'must be asc or desc' }).optional(),
  offset: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(0, 'cannot be negative')
    .optional(),
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(1, 'must be at least 1')
    .max(100, 'must be at most 100')
    .optional(),
}) satisfies z.ZodType<PatientQuery>
