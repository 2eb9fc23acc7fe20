import type { FilmMeasures } from '../types/compare'
import type { SegmentName } from '../types/measurement'
import { SEGMENT_NAMES } from '../measurement/landmark-names'
import { SOURCES } from '../measurement/sources'
import type { RowSpec } from './difference-row'

/** Segments with implant centring measured on a film (frontal block, measurement-reference §11). */
export function frontalSegmentsOf(measures: FilmMeasures | null): Set<SegmentName> {
  return new Set(
    SEGMENT_NAMES.filter((segment) => measures?.measurements.frontal?.[segment] !== undefined),
  )
}

/**
 * The frontal rows of one disc-replacement segment measured on two AP films: the implant's
 * lateral offset from the body midline in mm and in % of the endplate width (signed, positive
 * toward the image's right edge, as the engine gives it), the implant's coronal tilt and the
 * segment's coronal angle (both unsigned degrees). Row ids end in `-frontal-…` so that they
 * never collide with the lateral film's rows of the same segment.
 */
export function frontalSpecs(segment: SegmentName): RowSpec[] {
  const of = (m: FilmMeasures) => m.measurements.frontal?.[segment]
  const band = (m: FilmMeasures) => m.uncertainty?.measurements.frontal?.[segment]
  return [
    {
      id: `${segment}-frontal-offset-mm`,
      segment,
      label: 'Implant lateral offset (frontal)',
      unit: 'mm',
      source: SOURCES.frontalOffset,
      pick: (m) => [of(m)?.lateralOffsetMm, band(m)?.lateralOffsetMm],
      always: true,
    },
    {
      id: `${segment}-frontal-offset-percent`,
      segment,
      label: 'Implant lateral offset, of endplate width (frontal)',
      unit: '%',
      source: SOURCES.frontalOffset,
      pick: (m) => [of(m)?.lateralOffsetPercent, band(m)?.lateralOffsetPercent],
      always: true,
    },
    {
      id: `${segment}-frontal-tilt`,
      segment,
      label: 'Implant coronal tilt (frontal)',
      unit: '°',
      source: SOURCES.frontalTilt,
      pick: (m) => [of(m)?.implantTiltDeg, band(m)?.implantTiltDeg],
      always: true,
    },
    {
      id: `${segment}-frontal-coronal-angle`,
      segment,
      label: 'Segment coronal angle (frontal)',
      unit: '°',
      source: SOURCES.frontalSegmentAngle,
      pick: (m) => [of(m)?.segmentCoronalAngleDeg, band(m)?.segmentCoronalAngleDeg],
      always: true,
    },
  ]
}
