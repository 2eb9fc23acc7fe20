import { describe, expect, it } from 'vitest'
import { ageInYears, deidentifiedAgeInYears } from '../../../server/db/rows'

describe('ageInYears', () => {
  it('counts the birthday on its day and not before', () => {
    expect(ageInYears('1970-05-17', '2026-05-16')).toBe(55)
    expect(ageInYears('1970-05-17', '2026-05-17')).toBe(56)
  })
  it('groups de-identified ages above 89 as 90 (Safe Harbor grouping, from memory)', () => {
    expect(deidentifiedAgeInYears('1930-01-01', '2026-06-01')).toBe(90)
    expect(deidentifiedAgeInYears('1940-01-01', '2026-06-01')).toBe(86)
  })
})
