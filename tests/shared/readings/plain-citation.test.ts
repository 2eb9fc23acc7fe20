import { describe, expect, it } from 'vitest'
import { plainCitation } from '../../../shared/readings/plain-citation'
import { SOURCES } from '../../../shared/measurement'

describe('plainCitation', () => {
  it('drops the checked tag and says the others in words', () => {
    expect(plainCitation('Polly et al. 1996, Spine 21:1530 [V]')).toBe(
      'Polly et al. 1996, Spine 21:1530',
    )
    expect(plainCitation('Boxall et al. 1979 [M]; values in Hanson 2002 via review [V-sec]')).toBe(
      'Boxall et al. 1979 (from memory, verify); values in Hanson 2002 via review (via a secondary source)',
    )
    expect(plainCitation('Dupuis et al. 1985 [V for the paper; M for the thresholds]')).toBe(
      'Dupuis et al. 1985 (the thresholds from memory, verify)',
    )
    expect(plainCitation('percent of endplate depth [D]; a target is common practice')).toBe(
      'percent of endplate depth (derived); a target is common practice',
    )
  })

  it('leaves no bracketed tag in any source the engine cites', () => {
    for (const source of Object.values(SOURCES)) expect(plainCitation(source)).not.toMatch(/\[|\]/)
  })
})
