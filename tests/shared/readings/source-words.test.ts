import { describe, expect, it } from 'vitest'
import { SOURCES } from '../../../shared/measurement/sources'
import { sourceWords } from '../../../shared/readings/source-words'

// The tags are for code and tests only; a clinician reads the citation, or "derived", or
// "from memory, verify" (the project's rule for results and reports).
describe('sourceWords', () => {
  it('drops the checked tags and keeps the citation', () => {
    expect(sourceWords(SOURCES.lumbarLordosis)).toBe('Polly et al. 1996, Spine 21:1530')
    expect(sourceWords(SOURCES.piLlBand)).toBe('Schwab et al. 2012, Spine 37:1077')
  })
  it('says "from memory, verify" and "derived" in words', () => {
    expect(sourceWords(SOURCES.frontalOffset)).toMatch(
      /^offset of the implant centre .* \(derived\); .*McAfee et al\. 2005, Spine 30:1576, .* \(from memory, verify\)$/,
    )
    expect(sourceWords(SOURCES.dupuis)).toBe(
      'Dupuis et al. 1985, Spine 10:262 (thresholds from memory, verify)',
    )
  })
  it('leaves no tag in any engine source', () => {
    for (const source of Object.values(SOURCES)) expect(sourceWords(source)).not.toMatch(/\[|\]/)
  })
})
