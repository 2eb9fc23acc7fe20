import { describe, expect, it } from 'vitest'
import {
  isLandmarkOptional,
  missingRequiredLandmarks,
  submitRefusal,
} from '../../../shared/readings/reading-rules'
import { templateLandmarks } from '../../../shared/readings/templates'

// Which landmarks may be left out is common practice: the second femoral head when the two
// superimpose (the first then stands for the hip axis: Legaye et al. 1998, wording from
// memory), and the spinous process, which only checks a frontal film for rotation.
describe('reading rules', () => {
  it('marks exactly the second femoral head and the spinous processes optional', () => {
    const optional = (template: Parameters<typeof templateLandmarks>[0], options = {}) =>
      templateLandmarks(template, options)
        .filter(isLandmarkOptional)
        .map((spec) => spec.name)
    expect(optional('lumbar-alignment')).toEqual(['FH2'])
    expect(optional('slip-grade', { segment: 'L5-S1' })).toEqual([])
    expect(optional('implant-centring', { discReplacements: ['L3-L4', 'L4-L5'] })).toEqual([
      'L3.sp',
      'L4.sp',
    ])
  })
  it('names four missing landmarks and counts the rest, in checklist order', () => {
    const refusal = submitRefusal({
      template: 'slip-grade',
      options: { segment: 'L4-L5' },
      points: { 'L4.as': [1, 1] },
    })
    expect(refusal?.message).toBe(
      'Place 7 required landmarks before submitting: L4 posterior-superior, L4 posterior-inferior, L4 anterior-inferior, L5 anterior-superior and 3 more.',
    )
    expect(Object.keys(refusal?.details ?? {})).toHaveLength(7)
  })
  it('checks the extension film of a motion pair as well', () => {
    const names = templateLandmarks('motion-pair', { segment: 'L5-S1' }).map((spec) => spec.name)
    const all = Object.fromEntries(names.map((name) => [name, [1, 1] as [number, number]]))
    const missing = missingRequiredLandmarks({
      template: 'motion-pair',
      options: { segment: 'L5-S1' },
      points: all,
      pairedPoints: {},
    })
    expect(missing).toHaveLength(names.length)
    expect(missing.every((landmark) => landmark.film === 'paired')).toBe(true)
  })
  it('refuses a reading whose template lists no segment', () => {
    expect(
      submitRefusal({ template: 'implant-centring', options: {}, points: {} })?.message,
    ).toMatch(/no landmarks to place/)
  })
})
