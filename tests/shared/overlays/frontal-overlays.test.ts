import { describe, expect, it } from 'vitest'
import type { PixelPoint } from '../../../shared/types/landmarks'
import { computeMeasurements } from '../../../shared/measurement'
import { readingOverlayShapes, type OverlayShape } from '../../../shared/overlays'

/**
 * Level endplates 200 px wide at 0.2 mm/px and an implant whose centre sits 20 px (4 mm) toward
 * the image's right edge (reference §11 construction). By hand: midline x = 200, implant centre
 * x = (150 + 290) / 2 = 220.
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

const byId = (shapes: OverlayShape[], id: string) => shapes.find((shape) => shape.id === id)

describe('frontal overlays (implant centring)', () => {
  const shapes = readingOverlayShapes(
    'implant-centring',
    POINTS,
    computeMeasurements({ mmPerPixel: 0.2, points: POINTS }),
  )

  it('draws both endplates and the implant between their landmarks', () => {
    expect(byId(shapes, 'frontal-upper-L4-L5')).toMatchObject({ points: [100, 100, 300, 100] })
    expect(byId(shapes, 'frontal-lower-L4-L5')).toMatchObject({ points: [100, 200, 300, 200] })
    expect(byId(shapes, 'frontal-implant-L4-L5')).toMatchObject({
      category: 'implant',
      points: [150, 150, 290, 150],
    })
    expect(byId(shapes, 'frontal-implant-centre-L4-L5')).toMatchObject({ center: [220, 150] })
    expect(byId(shapes, 'frontal-spinous-L4')).toMatchObject({ center: [200, 60] })
  })

  it('draws the body midline through the mean of the corners, at right angles to the endplates', () => {
    const midline = byId(shapes, 'frontal-midline-L4-L5')
    if (midline?.kind !== 'line') throw new Error('no midline')
    const [x1, y1, x2, y2] = midline.points as [number, number, number, number]
    expect(x1).toBeCloseTo(200, 9)
    expect(x2).toBeCloseTo(200, 9)
    expect((y1 + y2) / 2).toBeCloseTo(150, 9)
  })

  it("labels the engine's offset in mm and % of the endplate width, with its image side", () => {
    // By hand: (220 − 200) px × 0.2 mm/px = 4 mm; 20 px of a 200 px wide endplate = 10 %.
    expect(byId(shapes, 'frontal-offset-label-L4-L5')).toMatchObject({
      text: 'L4-L5 offset 4.0 mm / 10.0 % to image right',
      anchor: 'start',
    })
  })

  it("labels the implant's tilt left of the segment's leftmost corner, level with the implant", () => {
    // Implant and endplates all level: no tilt (reference §11 unsigned angle).
    expect(byId(shapes, 'frontal-tilt-label-L4-L5')).toMatchObject({
      text: 'tilt 0.0°',
      anchor: 'end',
    })
    const label = byId(shapes, 'frontal-tilt-label-L4-L5')
    if (label?.kind !== 'label') throw new Error('no tilt label')
    // Left of L4.il / L5.sl at x = 100, clear of every landmark.
    expect(label.at[0]).toBeLessThan(100)
    expect(label.at[1]).toBe(150)
  })

  it("names the patient's side as the results do when the file's Patient Orientation gives it", () => {
    // DICOM PS3.3 C.7.6.1.1.1: rows toward L — the image's right edge is the patient's left.
    const named = readingOverlayShapes(
      'implant-centring',
      POINTS,
      computeMeasurements({ mmPerPixel: 0.2, points: POINTS }),
      { imageRightSide: 'patient-left' },
    )
    expect(byId(named, 'frontal-offset-label-L4-L5')).toMatchObject({
      text: 'L4-L5 offset 4.0 mm / 10.0 % to patient left',
    })
  })

  it('gives the offset in % alone on an uncalibrated film, and the tilt of a tilted implant', () => {
    // The implant's right end 14 px lower over 140 px: atan(14 / 140) = 5.71° (by hand).
    const tilted = { ...POINTS, 'tdr.L4-L5.r': [290, 164] as PixelPoint }
    const uncalibrated = readingOverlayShapes(
      'implant-centring',
      tilted,
      computeMeasurements({ points: tilted }),
    )
    expect(byId(uncalibrated, 'frontal-offset-label-L4-L5')).toMatchObject({
      text: 'L4-L5 offset 10.0 % to image right',
    })
    expect(byId(uncalibrated, 'frontal-tilt-label-L4-L5')).toMatchObject({ text: 'tilt 5.7°' })
  })
})
