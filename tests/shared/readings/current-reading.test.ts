import { describe, expect, it } from 'vitest'
import {
  currentReadingOf,
  currentReadingRank,
  type CurrentReadingCandidate,
} from '../../../shared/readings/current-reading'

const reading = (
  id: number,
  status: string,
  extra: Partial<CurrentReadingCandidate> = {},
): CurrentReadingCandidate => ({ id, status, blinded: false, supersedesId: null, ...extra })

// The order signed > submitted > draft is the sign-off workflow of the product (common practice
// for reports that are verified before they enter the record).
describe('currentReadingOf', () => {
  it('prefers a signed reading to a newer submitted one, and a submitted one to a newer draft', () => {
    expect(
      currentReadingOf([reading(1, 'signed'), reading(2, 'submitted'), reading(3, 'draft')])?.id,
    ).toBe(1)
    expect(currentReadingOf([reading(4, 'draft'), reading(2, 'submitted')])?.id).toBe(2)
  })

  it('takes the newest of the best status', () => {
    expect(
      currentReadingOf([reading(3, 'draft'), reading(7, 'draft'), reading(5, 'draft')])?.id,
    ).toBe(7)
    expect(currentReadingOf([reading(8, 'signed'), reading(9, 'signed')])?.id).toBe(9)
  })

  it('never takes a blinded re-reading, a superseded reading or a status it does not know', () => {
    expect(
      currentReadingOf([reading(1, 'draft'), reading(2, 'signed', { blinded: true })])?.id,
    ).toBe(1)
    // An amendment (id 6) replaces the reading it names once it is signed: until then the signed
    // original stands; afterwards the original is superseded and the amendment stands.
    expect(
      currentReadingOf([reading(5, 'signed'), reading(6, 'submitted', { supersedesId: 5 })])?.id,
    ).toBe(5)
    expect(
      currentReadingOf([reading(5, 'superseded'), reading(6, 'signed', { supersedesId: 5 })])?.id,
    ).toBe(6)
    expect(currentReadingOf([reading(1, 'draft'), reading(2, 'superseded')])?.id).toBe(1)
    expect(currentReadingOf([reading(3, 'archived')])).toBeNull()
    expect(currentReadingOf([])).toBeNull()
  })

  it('ranks signed over submitted over draft (a returned reading with the drafts), and nothing else', () => {
    expect(currentReadingRank('signed')).toBeGreaterThan(currentReadingRank('submitted')!)
    expect(currentReadingRank('submitted')).toBeGreaterThan(currentReadingRank('draft')!)
    expect(currentReadingRank('returned')).toBe(currentReadingRank('draft'))
    expect(currentReadingRank('superseded')).toBeNull()
    expect(currentReadingRank('toString')).toBeNull()
  })
})
