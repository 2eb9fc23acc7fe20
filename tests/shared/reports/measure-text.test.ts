import { describe, expect, it } from 'vitest'
import {
  changeIntervalText,
  changeText,
  intervalText,
  measureText,
} from '../../../shared/reports/measure-text'

// Every number carries its unit, with a true minus sign (typographic convention, common practice).
describe('measure text', () => {
  it('writes values with their units and a dash for a missing one', () => {
    expect(measureText(27, '°')).toBe('27.0°')
    expect(measureText(25, '%')).toBe('25.0 %')
    expect(measureText(-1.26, 'mm')).toBe('−1.3 mm')
    expect(measureText(null, 'mm')).toBe('—')
  })

  it('writes intervals and signed changes', () => {
    expect(intervalText({ value: 27, halfWidth95: 5.62 }, '°')).toBe('27.0° ± 5.6°')
    expect(intervalText({ value: 27, halfWidth95: null }, '°')).toBe('27.0°')
    expect(changeText(8, '°')).toBe('+8.0°')
    expect(changeText(-9, '%')).toBe('−9.0 %')
    expect(changeText(0.01, '%')).toBe('0.0 %')
    expect(changeIntervalText({ value: 8, halfWidth95: 7.94 }, '°')).toBe('+8.0° ± 7.9°')
    expect(changeIntervalText(null, '°')).toBe('—')
  })
})
