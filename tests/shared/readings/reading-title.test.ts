import { describe, expect, it } from 'vitest'
import { readingTitle } from '../../../shared/readings/reading-title'

describe('readingTitle', () => {
  it('names the template with the segments it reads', () => {
    expect(readingTitle('slip-grade', { segment: 'L5-S1' })).toBe('Slip grade L5-S1')
    expect(
      readingTitle('construct-check', {
        construct: [
          { segment: 'L4-L5', implant: 'disc-replacement' },
          { segment: 'L5-S1', implant: 'cage' },
        ],
      }),
    ).toBe('Construct check L4-L5, L5-S1')
    expect(readingTitle('implant-centring', { discReplacements: ['L3-L4', 'L4-L5'] })).toMatch(
      / L3-L4, L4-L5$/,
    )
    expect(readingTitle('lumbar-alignment', {})).toBe('Lumbar alignment')
  })
})
