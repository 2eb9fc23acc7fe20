import { describe, expect, it } from 'vitest'
import { computeMeasurements } from '@shared/measurement/index'
import { phantomGroundTruth } from '../../../../server/phantom/generate-phantom'
import { phantomPelvicTiltDeg, SPINE_SEGMENTS } from '../../../../server/phantom/phantom-params'
import { PHANTOM_PRESETS } from '../../../../server/phantom/presets'

// The measurement engine (shared/measurement, written independently of the generator) must give
// back the parameters each demo phantom was drawn from.
describe('computeMeasurements on the phantom presets', () => {
  const lateral = Object.keys(PHANTOM_PRESETS).filter(
    (name) => PHANTOM_PRESETS[name]?.view !== 'ap',
  )
  it.each(lateral)('gives back the parameters of preset %s', (name) => {
    const { params, landmarks } = phantomGroundTruth(PHANTOM_PRESETS[name])
    const result = computeMeasurements(landmarks)
    for (const segment of SPINE_SEGMENTS) {
      const asked = params.segments[segment]!
      const measured = result.segments[segment]!
      expect(measured.slipPercent).toBeCloseTo(asked.slipPercent, 6)
      expect(measured.segmentalLordosisDeg).toBeCloseTo(asked.segmentalAngleDeg, 6)
    }
    expect(result.pelvis?.sacralSlopeDeg).toBeCloseTo(params.sacralSlopeDeg, 6)
    expect(result.pelvis?.tiltDeg).toBeCloseTo(phantomPelvicTiltDeg(params), 6)
    expect(result.pelvis?.incidenceDeg).toBeCloseTo(
      params.sacralSlopeDeg + phantomPelvicTiltDeg(params),
      6,
    )
    // A cage filling the disc space has the disc's angle (reference §7); a disc replacement's
    // marker sits at the position asked for.
    const implantChecks = params.implants.map((implant) => {
      const measured = result.segments[implant.segment]!
      return implant.kind === 'cage'
        ? [measured.cageLordosisDeg, measured.discAngleDeg]
        : [measured.implantPositionPercent, implant.positionPercent]
    })
    for (const [measured, expected] of implantChecks) {
      expect(measured).toBeCloseTo(expected as number, 6)
    }
  })

  it('reads the posterior disc height in mm of a segment without slip (point to point = perpendicular)', () => {
    const { params, landmarks } = phantomGroundTruth(PHANTOM_PRESETS.normal)
    const result = computeMeasurements(landmarks)
    expect(result.segments['L3-L4']!.discHeightMm?.posterior).toBeCloseTo(
      params.segments['L3-L4']!.posteriorDiscHeightMm,
      6,
    )
  })
})
