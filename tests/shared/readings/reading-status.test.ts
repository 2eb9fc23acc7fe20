import { describe, expect, it } from 'vitest'
import { readingActionRefusal } from '../../../shared/readings/reading-status'

const fellow = { id: 1, role: 'fellow' as const }
const surgeon = { id: 2, role: 'surgeon' as const }

// The rules a sign-off follows (common practice: a second pair of eyes signs a reading, and a
// signed record is corrected by an amendment, never edited).
describe('readingActionRefusal', () => {
  it("lets the rater edit and submit while the reading is in the rater's hands", () => {
    for (const status of ['draft', 'returned'] as const) {
      expect(readingActionRefusal('edit', { status, raterId: 1 }, fellow)).toBeNull()
      expect(readingActionRefusal('submit', { status, raterId: 1 }, fellow)).toBeNull()
      expect(readingActionRefusal('edit', { status, raterId: 1 }, surgeon)?.status).toBe(403)
    }
  })

  it('lets a surgeon other than the rater sign or return a submitted reading', () => {
    const submitted = { status: 'submitted' as const, raterId: 1 }
    expect(readingActionRefusal('sign', submitted, surgeon)).toBeNull()
    expect(readingActionRefusal('return', submitted, surgeon)).toBeNull()
    expect(readingActionRefusal('sign', submitted, fellow)?.status).toBe(403)
    expect(readingActionRefusal('sign', { status: 'submitted', raterId: 2 }, surgeon)).toEqual({
      status: 403,
      code: 'forbidden',
      message: 'You made this reading; another surgeon signs it off or returns it.',
    })
  })

  it('refuses every change of a signed reading with 409, pointing to an amendment', () => {
    const signed = { status: 'signed' as const, raterId: 1 }
    for (const action of ['edit', 'submit'] as const)
      expect(readingActionRefusal(action, signed, fellow)?.message).toMatch(/start an amendment/)
    for (const action of ['sign', 'return'] as const)
      expect(readingActionRefusal(action, signed, surgeon)?.status).toBe(409)
    expect(readingActionRefusal('amend', signed, fellow)).toBeNull()
    expect(readingActionRefusal('amend', signed, surgeon)).toBeNull()
  })
})
