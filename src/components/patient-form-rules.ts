import type { PatientInput } from '@shared/types/api'

export type FieldErrors = Partial<Record<string, string>>

/**
 * The same rules the server enforces, checked before sending so the form answers at once.
 * The server remains the authority and its messages replace these when they differ.
 */
export function validatePatientForm(
  input: PatientInput,
  today = new Date().toISOString().slice(0, 10),
): FieldErrors {
  const errors: FieldErrors = {}
  if (!input.recordNumber) errors.recordNumber = 'is required'
  else if (!/^[A-Za-z0-9][A-Za-z0-9\-/.]*$/.test(input.recordNumber))
    errors.recordNumber = 'may hold letters, digits, - / and . only'
  else if (input.recordNumber.length > 40) errors.recordNumber = 'must be at most 40 characters'
  if (!input.familyName) errors.familyName = 'is required'
  if (!input.givenName) errors.givenName = 'is required'
  if (!input.birthDate) errors.birthDate = 'is required'
  else if (input.birthDate > today) errors.birthDate = 'cannot be in the future'
  else if (input.birthDate < '1900-01-01') errors.birthDate = 'must be after 1900'
  return errors
}
