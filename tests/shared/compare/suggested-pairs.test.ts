import { describe, expect, it } from 'vitest'
import { suggestComparePairs } from '../../../shared/compare/suggested-pairs'
import type { CompareCandidateVisit } from '../../../shared/types/compare'

// The usual pairs (pre-op against post-op and follow-up, follow-ups against each other, flexion
// against extension) are common practice in reporting spinal fusion and disc replacement.
const visits: CompareCandidateVisit[] = [
  {
    visitId: 1,
    visitKind: 'pre-op',
    films: [
      { imageId: 10, view: 'lateral-flexion' },
      { imageId: 11, view: 'lateral-neutral' },
      { imageId: 12, view: 'lateral-extension' },
    ],
  },
  { visitId: 2, visitKind: 'post-op', films: [{ imageId: 20, view: 'lateral-standing-long' }] },
  { visitId: 3, visitKind: 'follow-up', films: [{ imageId: 30, view: 'lateral-neutral' }] },
  {
    visitId: 4,
    visitKind: 'follow-up',
    films: [
      { imageId: 40, view: 'ap' },
      { imageId: 41, view: 'lateral-neutral' },
    ],
  },
]

describe('suggestComparePairs', () => {
  it('offers the usual pairs in a fixed order, each once', () => {
    expect(
      suggestComparePairs(visits).map((pair) => [
        pair.label,
        pair.beforeImageId,
        pair.afterImageId,
      ]),
    ).toEqual([
      ['Pre-op against post-op', 11, 20],
      ['Pre-op against latest follow-up', 11, 41],
      ['Post-op against latest follow-up', 20, 41],
      ['Last two follow-ups', 30, 41],
      ['Flexion against extension', 10, 12],
    ])
  })

  it('pairs the frontal films after surgery: first post-op AP against the latest follow-up AP', () => {
    const withAp: CompareCandidateVisit[] = [
      { visitId: 1, visitKind: 'pre-op', films: [{ imageId: 10, view: 'ap' }] },
      { visitId: 2, visitKind: 'post-op', films: [{ imageId: 20, view: 'ap' }] },
      { visitId: 3, visitKind: 'follow-up', films: [{ imageId: 30, view: 'ap' }] },
      { visitId: 4, visitKind: 'follow-up', films: [{ imageId: 40, view: 'ap' }] },
    ]
    // A pre-op AP has no implant to centre, so it is never offered.
    expect(
      suggestComparePairs(withAp).map((pair) => [
        pair.label,
        pair.beforeImageId,
        pair.afterImageId,
      ]),
    ).toEqual([
      ['Post-op AP against latest follow-up AP', 20, 40],
      ['Last two follow-up APs', 30, 40],
    ])
  })

  it('offers nothing without two comparable films, and never a film against itself', () => {
    expect(suggestComparePairs([visits[0]!])).toHaveLength(1)
    expect(suggestComparePairs([{ visitId: 9, visitKind: 'pre-op', films: [] }])).toEqual([])
    expect(suggestComparePairs([visits[1]!, { ...visits[1]!, visitId: 5 }])).toEqual([])
  })
})
