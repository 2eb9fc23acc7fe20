import { z } from 'zod'
import type {
  StudyInput,
  StudyMembersInput,
  StudyPatientQuery,
  StudyPatientsInput,
  StudyQuery,
} from '../../shared/types/studies'
import { trimmed, version } from './common'

const studyName = z
  .string({ error: 'is required' })
  .trim()
  .min(1, 'is required')
  .max(160, 'must be at most 160 characters')

const studyFields = {
  name: studyName,
  description: trimmed(500).nullable().optional(),
  note: trimmed(4000).nullable().optional(),
}

export const createStudyBody = z.strictObject(studyFields) satisfies z.ZodType<StudyInput>

export const patchStudyBody = z.strictObject({
  name: studyName.optional(),
  description: studyFields.description,
  note: studyFields.note,
  version,
})

/** At most this many ids in one replacement (a cohort larger than this is built in steps). */
export const MAX_IDS_PER_WRITE = 5000

const idList = (what: string) =>
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
    .max(MAX_IDS_PER_WRITE, `must list at most ${MAX_IDS_PER_WRITE} ids`)
    .transform((ids) => [...new Set(ids)])

export const studyPatientsBody = z.strictObject({
  patientIds: idList('patient'),
  version,
}) satisfies z.ZodType<StudyPatientsInput, unknown>

export const studyMembersBody = z.strictObject({
  userIds: idList('user'),
  version,
}) satisfies z.ZodType<StudyMembersInput, unknown>

const paging = {
  q: z.string().trim().max(100, 'must be at most 100 characters').optional(),
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
}

export const studyQuery = z.object(paging) satisfies z.ZodType<StudyQuery>
export const studyPatientQuery = z.object(paging) satisfies z.ZodType<StudyPatientQuery>
