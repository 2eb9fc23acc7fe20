import { describe, expect, it } from 'vitest'
import { formatDate, formatInterval } from '@/utils/format'
import { validatePatientForm } from '@/components/patient-form-rules'

describe('formatDate', () => {
  it('writes day, abbreviated month and year without shifting the day across time zones', () => {
    expect(formatDate('1968-03-14')).toBe('14 Mar 1968')
    expect(formatDate('2026-09-01')).toBe('01 Sep 2026')
    expect(formatDate(null)).toBe('—')
  })
})

describe('formatInterval', () => {
  it('reads whole years as years and other intervals as months', () => {
    expect(formatInterval(12)).toBe('1 year')
    expect(formatInterval(24)).toBe('2 years')
    expect(formatInterval(6)).toBe('6 months')
    expect(formatInterval(1)).toBe('1 month')
  })
})

describe('validatePatientForm', () => {
  const valid = {
    recordNumber: 'A-1',
    familyName: 'F',
    givenName: 'G',
    birthDate: '1970-01-01',
    sex: 'female' as const,
  }
  it('accepts a complete patient', () => {
    expect(validatePatientForm(valid, '2026-12-01')).toEqual({})
  })
  it('names each missing or malformed field as the server would', () => {
    expect(
      validatePatientForm(
        { ...valid, recordNumber: 'a b', familyName: '', birthDate: '2027-01-01' },
        '2026-12-01',
      ),
    ).toEqual({
      recordNumber: 'may hold letters, digits, - / and . only',
      familyName: 'is required',
      birthDate: 'cannot be in the future',
    })
  })
})

describe('fieldErrorsFrom', () => {
  it('keeps one message per field without the field prefix the API adds', async () => {
    const { ApiError } = await import('@/api/http')
    const { fieldErrorsFrom, formErrorFrom } = await import('@/utils/form-errors')
    const error = new ApiError(400, 'validation_failed', 'birthDate: cannot be in the future', {
      birthDate: ['birthDate: cannot be in the future', 'birthDate: must be after 1900'],
    })
    expect(fieldErrorsFrom(error)).toEqual({ birthDate: 'cannot be in the future' })
    expect(fieldErrorsFrom(new Error('x'))).toEqual({})
    expect(formErrorFrom(error)).toBe('birthDate: cannot be in the future')
  })
})

describe('formatAgeYears', () => {
  it('groups de-identified ages of 90 and over as 90+', async () => {
    const { formatAgeYears } = await import('@/utils/format')
    expect(formatAgeYears(64)).toBe('64 y')
    expect(formatAgeYears(90, true)).toBe('90+ y')
    expect(formatAgeYears(93)).toBe('93 y')
    expect(formatAgeYears(null)).toBe('—')
  })
})
