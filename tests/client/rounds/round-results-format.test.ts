import { describe, expect, it } from 'vitest'
import {
  formatPValue,
  formatStatistic,
  formatWithInterval,
} from '@/components/rounds/round-results-format'
import { roundFieldMessage } from '@/components/rounds/round-form-errors'

describe('formatStatistic', () => {
  it('rounds to two places with a true minus sign and no negative zero', () => {
    expect(formatStatistic(0.7149)).toBe('0.71')
    expect(formatStatistic(-0.2913)).toBe('−0.29')
    expect(formatStatistic(-0.001)).toBe('0.00')
    expect(formatStatistic(1.23456, 3)).toBe('1.235')
  })

  it('says what an absent or unbounded value is', () => {
    expect(formatStatistic(null)).toBe('—')
    expect(formatStatistic(Number.NaN)).toBe('—')
    expect(formatStatistic(Infinity)).toBe('∞')
    expect(formatStatistic(-Infinity)).toBe('−∞')
  })
})

describe('formatWithInterval', () => {
  // Shrout & Fleiss (1979), Table 2: ICC(2,1) = 0.29 for their 6 × 4 example; the interval
  // here is only for the format.
  it('writes an estimate with its interval in brackets', () => {
    expect(formatWithInterval(0.2898, 0.019, 0.7611)).toBe('0.29 (0.02 to 0.76)')
    expect(formatWithInterval(0.5, null, 0.9)).toBe('0.50 (— to 0.90)')
  })

  it('says so when an estimate has no interval at all', () => {
    // The ICC(2,1) interval is not defined when the films barely differ (see shared/statistics/icc.ts).
    expect(formatWithInterval(-0.2899, null, null)).toBe('−0.29 (no interval)')
  })
})

describe('formatPValue', () => {
  it('prints small p values as "< 0.001" (common practice in journals)', () => {
    expect(formatPValue(0.0000012)).toBe('< 0.001')
    expect(formatPValue(0.0312)).toBe('0.031')
    expect(formatPValue(null)).toBe('—')
  })
})

describe('roundFieldMessage', () => {
  it('reads a message that continues the field after its label', () => {
    expect(roundFieldMessage('imageIds', 'must list at least 2 films')).toBe(
      'Films must list at least 2 films',
    )
    expect(roundFieldMessage('options.gapDays', 'must be at least 1 day')).toBe(
      'Gap between passes must be at least 1 day',
    )
  })

  it('shows a message that stands alone as a sentence', () => {
    expect(roundFieldMessage('raterIds', 'an inter-rater round needs at least 2 raters')).toBe(
      'An inter-rater round needs at least 2 raters',
    )
  })
})
