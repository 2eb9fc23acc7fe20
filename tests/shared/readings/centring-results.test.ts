import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '../../../shared/measurement/compute-measurements'
import { computeUncertainty } from '../../../shared/measurement/uncertainty'
import type { PixelPoint } from '../../../shared/types/landmarks'
import { workspaceResultSections } from '../../../shared/readings/result-rows'

/**
 * Level endplates 200 px wide at 0.2 mm/px (40 mm) and an implant whose centre sits 20 px =
 * 4 mm toward the image's right edge: 10 % of the width, above McAfee et al. 2005's 3 mm
 * (from memory, verify). By hand: midline x = 200, implant centre x = (150 + 290)/2 = 220.
 */
const POINTS: Record<string, PixelPoint> = {
  'L4.il': [100, 100],
  'L4.ir': [300, 100],
  'L5.sl': [100, 200],
  'L5.sr': [300, 200],
  'tdr.L4-L5.l': [150, 150],
  'tdr.L4-L5.r': [290, 150],
  'L4.sp': [200, 60],
}

function sections(imageRightSide: 'patient-left' | 'unknown', mmPerPixel: number | null) {
  const doc = { mmPerPixel, points: POINTS }
  return workspaceResultSections({
    template: 'implant-centring',
    options: { discReplacements: ['L4-L5'] },
    primary: {
      measurements: computeMeasurements(doc),
      uncertainty: computeUncertainty(doc),
      spacingSource: mmPerPixel === null ? 'none' : 'dicom-pixel-spacing',
    },
    paired: null,
    motion: null,
    imageRightSide,
  })
}

describe('implant centring results', () => {
  it('names the side from the film and flags an offset above 3 mm', () => {
    const [segment, sides] = sections('patient-left', 0.2)
    const value = (id: string) => segment!.rows.find((row) => row.id === id)?.value
    expect(value('L4-L5-frontal-offset')).toBe('4.0 mm toward patient left')
    expect(value('L4-L5-frontal-offset-percent')).toBe('10.0 % toward patient left')
    expect(value('L4-L5-frontal-tilt')).toBe('0.0°')
    expect(segment!.flags.map((flag) => flag.id)).toEqual(['L4-L5-off-centre', 'L4-L5-rotation'])
    // The spinous process on the midline: 0 % rotation.
    expect(segment!.flags[1]!.text).toMatch(/lies 0 % of the half-width/)
    expect(sides!.flags[0]!.text).toMatch(/right edge is the patient's left/)
    // Plain words for the clinician, no code tags.
    expect(segment!.rows[0]!.source).not.toMatch(/\[/)
    expect(segment!.rows[0]!.interval).toMatch(/^± \d\.\d mm$/)
  })
  it('says "image right" without an orientation, and needs calibration for the 3 mm check', () => {
    const [segment, sides] = sections('unknown', null)
    const value = (id: string) => segment!.rows.find((row) => row.id === id)?.value
    expect(value('L4-L5-frontal-offset')).toBe('—')
    expect(value('L4-L5-frontal-offset-percent')).toBe('10.0 % toward image right')
    expect(segment!.flags[0]!.id).toBe('L4-L5-off-centre-unknown')
    expect(sides!.flags[0]!.text).toMatch(/image right/)
  })
})
