import { describe, expect, it } from 'vitest'
import { dateText, visitText } from '../../../shared/reports/visit-text'

describe('visitText', () => {
  it('dates a visit for clinical roles and numbers it for researchers', () => {
    expect(dateText('2026-03-04')).toBe('4 Mar 2026')
    expect(
      visitText({
        kind: 'identified',
        id: 1,
        patientId: 1,
        visitDate: '2026-08-20',
        visitKind: 'follow-up',
        monthsSinceSurgery: 6,
        indication: null,
        ageAtVisitYears: 64,
        version: 1,
        createdAt: '2026-08-20T10:00:00.000Z',
      }),
    ).toBe('Follow-up · 20 Aug 2026 · 6 months after surgery')
    const deidentified = visitText({
      kind: 'deidentified',
      id: 1,
      patientId: 1,
      sequence: 3,
      visitKind: 'follow-up',
      monthsSinceSurgery: 12,
      ageAtVisitYears: 64,
    })
    expect(deidentified).toBe('Follow-up · visit 3 · 1 year after surgery')
    expect(deidentified).not.toMatch(/\d{4}/)
  })
})
