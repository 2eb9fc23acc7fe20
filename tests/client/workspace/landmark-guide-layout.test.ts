import { describe, expect, it } from 'vitest'
import { templateLandmarks } from '../../../shared/readings/templates'
import {
  anteriorRightFromPoints,
  landmarkGuideLayout,
} from '../../../src/components/workspace/landmark-guide-layout'

const names = (template: Parameters<typeof templateLandmarks>[0], options = {}) =>
  templateLandmarks(template, options).map((spec) => spec.name)

// The labels say which end is anterior (the anterior corner of an endplate is `as`/`ai`), so
// the drawing faces the way the film does without a facing flag.
describe('landmark guide layout', () => {
  it('reads the facing from the placed corners, and keeps the usual facing until then', () => {
    expect(anteriorRightFromPoints({ 'L4.as': [300, 100], 'L4.ps': [100, 100] })).toBe(true)
    expect(anteriorRightFromPoints({ 'L4.as': [100, 100], 'L4.ps': [300, 110] })).toBe(false)
    expect(anteriorRightFromPoints({ 'L4.as': [100, 100] })).toBeNull()
    const left = landmarkGuideLayout(
      'slip-grade',
      names('slip-grade', { segment: 'L4-L5' }),
      { 'L4.as': [100, 100], 'L4.ps': [300, 110] },
      'L4.pi',
    )
    const right = landmarkGuideLayout(
      'slip-grade',
      names('slip-grade', { segment: 'L4-L5' }),
      {},
      'L4.pi',
    )
    expect(left.anteriorRight).toBe(false)
    expect(right.anteriorRight).toBe(true)
    // Mirrored: the posterior corner sits on the other side of the drawing.
    const spot = (layout: typeof left) => layout.marks.find((mark) => mark.name === 'L4.pi')!
    expect(spot(left).x).toBeCloseTo(200 - spot(right).x, 9)
    expect(spot(right).next).toBe(true)
    expect(left.marks.find((mark) => mark.name === 'L4.as')?.placed).toBe(true)
  })

  it('draws L4 and L5 over the sacrum for L5-S1, the sacral wall and the hips', () => {
    const layout = landmarkGuideLayout('lumbar-alignment', names('lumbar-alignment'), {}, 'S1.pw')
    expect(layout.labels.map((label) => label.text)).toEqual(['L4', 'L5', 'S1'])
    expect(layout.gap).toBeNull()
    expect(layout.marks.find((mark) => mark.next)?.name).toBe('S1.pw')
    const upper = landmarkGuideLayout('lumbar-alignment', names('lumbar-alignment'), {}, 'L1.as')
    expect(upper.labels.map((label) => label.text)).toEqual(['L1', 'L2', 'S1'])
    // Levels lie between L2 and the sacrum: the drawing says so with a gap.
    expect(upper.gap).not.toBeNull()
  })

  it('draws a frontal segment with the implant, and marks its ends and corners', () => {
    const options = { discReplacements: ['L3-L4', 'L4-L5'] as const }
    const layout = landmarkGuideLayout(
      'implant-centring',
      names('implant-centring', { discReplacements: [...options.discReplacements] }),
      { 'L4.il': [10, 10] },
      'tdr.L4-L5.r',
    )
    expect(layout.view).toBe('frontal')
    expect(layout.labels.map((label) => label.text)).toEqual(['L4', 'L5'])
    expect(layout.marks.map((mark) => mark.name).sort()).toEqual(
      ['L4.il', 'L4.ir', 'L4.sp', 'L5.sl', 'L5.sr', 'tdr.L4-L5.l', 'tdr.L4-L5.r'].sort(),
    )
    const [l, r] = ['tdr.L4-L5.l', 'tdr.L4-L5.r'].map((name) =>
      layout.marks.find((mark) => mark.name === name)!,
    )
    // l is drawn nearer the left edge, as on the image.
    expect(l!.x).toBeLessThan(r!.x)
    expect(r!.next).toBe(true)
    // A superior endplate corner belongs to the segment above it.
    const lower = landmarkGuideLayout(
      'implant-centring',
      names('implant-centring', { discReplacements: ['L3-L4'] }),
      {},
      'L4.sl',
    )
    expect(lower.labels.map((label) => label.text)).toEqual(['L3', 'L4'])
  })
})
