import { describe, expect, it } from 'vitest'
import { numberText, numberWithUnit } from '../../../shared/format/number-text'
import {
  SPACING_SOURCE_LABELS,
  SPACING_SOURCE_SHORT,
} from '../../../shared/format/spacing-source-labels'
import { SPACING_SOURCES } from '../../../shared/types/domain'

describe('the shared number formatter', () => {
  // ECMAScript's Number.prototype.toFixed rounds half away from zero on the decimal string
  // of the double (ECMA-262 §21.1.3.3): 1.25 is exact in binary, so "1.3".
  it('fixes the digits and writes a true minus sign (Unicode U+2212 MINUS SIGN)', () => {
    expect(numberText(12.345, 1)).toBe('12.3')
    expect(numberText(1.25, 1)).toBe('1.3')
    expect(numberText(-4.06, 1)).toBe('\u22124.1')
  })

  it('puts no sign on a value that rounds to zero', () => {
    expect(numberText(-0.04, 1)).toBe('0.0')
    expect(numberText(-0, 0)).toBe('0')
  })

  it('attaches degrees, spaces other units, and gives null for no value', () => {
    expect(numberWithUnit(12.5, 1, '°')).toBe('12.5°')
    expect(numberWithUnit(25, 1, '%')).toBe('25.0 %')
    expect(numberWithUnit(4.06, 1, 'mm')).toBe('4.1 mm')
    expect(numberWithUnit(3, 0, '')).toBe('3')
    for (const nothing of [null, undefined, Number.NaN, Infinity])
      expect(numberWithUnit(nothing, 1, 'mm')).toBeNull()
  })
})

describe('the calibration-source labels', () => {
  it('name every spacing source, long and short', () => {
    for (const source of SPACING_SOURCES) {
      expect(SPACING_SOURCE_LABELS[source]).toBeTruthy()
      expect(SPACING_SOURCE_SHORT[source]).toBeTruthy()
    }
  })
})
