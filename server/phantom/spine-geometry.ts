import {
  LUMBAR_LEVELS,
  SPINE_SEGMENTS,
  phantomPelvicTiltDeg,
  type ImplantSpec,
  type LumbarLevel,
  type PhantomParams,
  type SpineSegment,
} from './phantom-params'
import {
  add,
  along,
  angleOf,
  degToRad,
  direction,
  dot,
  intersect,
  length,
  mid,
  perpendicular,
  scale,
  sub,
  unit,
  type Vec2,
} from './vec2'

/** A vertebral body's corners (reference §1 names) in the anatomical frame, millimetres. */
export interface VertebraCorners {
  as: Vec2
  ps: Vec2
  pi: Vec2
  ai: Vec2
}

export interface CageGeometry {
  kind: 'cage'
  segment: SpineSegment
  supP: Vec2
  supA: Vec2
  infP: Vec2
  infA: Vec2
}

export interface DiscReplacementGeometry {
  kind: 'disc-replacement'
  segment: SpineSegment
  /** The plate on W's superior endplate and the one under U's inferior endplate, p then a. */
  lowerPlate: [Vec2, Vec2]
  upperPlate: [Vec2, Vec2]
  marker: Vec2
}

export type ImplantGeometry = CageGeometry | DiscReplacementGeometry

/** Everything the renderer draws and the ground truth reports, in mm (u anterior, v cranial). */
export interface SpineGeometry {
  vertebrae: Record<LumbarLevel, VertebraCorners>
  s1: { as: Vec2; ps: Vec2; pw: Vec2 }
  /** Unit vector down the posterior wall of the sacrum, from S1.ps toward S1.pw. */
  sacralWall: Vec2
  femoralHeads: [Vec2, Vec2]
  implants: ImplantGeometry[]
}

/** The vertebra below each segment's upper vertebra. */
const LOWER_OF: Record<SpineSegment, LumbarLevel | 'S1'> = {
  'L1-L2': 'L2',
  'L2-L3': 'L3',
  'L3-L4': 'L4',
  'L4-L5': 'L5',
  'L5-S1': 'S1',
}

function segmentOf(upper: LumbarLevel): SpineSegment {
  return SPINE_SEGMENTS[LUMBAR_LEVELS.indexOf(upper)] as SpineSegment
}

/** Wedge of a body: its superior endplate's angle minus its inferior endplate's. */
export function wedgeRad(shape: PhantomParams['vertebrae'][LumbarLevel]): number {
  return Math.atan2(shape.anteriorHeightMm - shape.posteriorHeightMm, shape.depthMm)
}

function buildVertebra(
  pi: Vec2,
  inferiorAngle: number,
  shape: PhantomParams['vertebrae'][LumbarLevel],
): VertebraCorners {
  const e = direction(inferiorAngle)
  const n = perpendicular(e)
  const ai = along(pi, e, shape.depthMm)
  return {
    pi,
    ai,
    ps: along(pi, n, shape.posteriorHeightMm),
    as: along(ai, n, shape.anteriorHeightMm),
  }
}

/**
 * Stacks the spine from S1 upward so each segment has exactly the requested slip and segmental
 * angle (reference §3 definitions), then places the sacral wall and femoral heads from the
 * sacral slope and pelvic tilt (reference §4). S1.ps is the origin.
 */
export function buildSpineGeometry(params: PhantomParams): SpineGeometry {
  const slope = degToRad(params.sacralSlopeDeg)
  const s1ps: Vec2 = [0, 0]
  // Sacral slope is positive when the anterior corner is lower: the endplate points down-forward.
  const s1as = along(s1ps, direction(-slope), params.sacrumDepthMm)
  const sacralWall = direction(-slope - degToRad(params.sacralTableAngleDeg))
  const s1pw = along(s1ps, sacralWall, 30)

  const vertebrae = {} as Record<LumbarLevel, VertebraCorners>
  // The endplate below the current upper vertebra: W's superior (defines a, c) and the endplate
  // the segmental angle is measured against (W's inferior, or S1's superior).
  let lowerSuperior = { ps: s1ps, as: s1as }
  let referenceAngle = angleOf(sub(s1as, s1ps))

  for (const level of [...LUMBAR_LEVELS].reverse()) {
    const segment = params.segments[segmentOf(level)]
    const shape = params.vertebrae[level]
    const a = unit(sub(lowerSuperior.as, lowerSuperior.ps))
    const c = perpendicular(a)
    const slipMm = (segment.slipPercent / 100) * length(sub(lowerSuperior.as, lowerSuperior.ps))
    const pi = add(add(lowerSuperior.ps, scale(a, slipMm)), scale(c, segment.posteriorDiscHeightMm))
    const superiorAngle = referenceAngle + degToRad(segment.segmentalAngleDeg)
    const corners = buildVertebra(pi, superiorAngle - wedgeRad(shape), shape)
    vertebrae[level] = corners
    lowerSuperior = { ps: corners.ps, as: corners.as }
    referenceAngle = angleOf(sub(corners.ai, corners.pi))
  }

  const pelvicTilt = degToRad(phantomPelvicTiltDeg(params))
  const endplateMiddle = mid(s1ps, s1as)
  // PT = atan2(f·v.x, v.y) for v = H − M in image axes: H lies below M, anterior when PT > 0.
  const hip = add(
    endplateMiddle,
    scale([Math.sin(pelvicTilt), -Math.cos(pelvicTilt)], params.hipAxisDistanceMm),
  )
  const offset = scale(unit([1, 0.35]), params.femoralHeadSeparationMm / 2)

  const geometry: SpineGeometry = {
    vertebrae,
    s1: { as: s1as, ps: s1ps, pw: s1pw },
    sacralWall,
    femoralHeads: [add(hip, offset), sub(hip, offset)],
    implants: [],
  }
  geometry.implants = params.implants.map((implant) => buildImplant(geometry, implant))
  return geometry
}

/** U and W endplates of a segment: W's superior (p → a) and U's inferior (p → a). */
export function segmentEndplates(
  geometry: SpineGeometry,
  segment: SpineSegment,
): { lower: [Vec2, Vec2]; upper: [Vec2, Vec2] } {
  const upperLevel = segment.split('-')[0] as LumbarLevel
  const lowerLevel = LOWER_OF[segment]
  const w = lowerLevel === 'S1' ? geometry.s1 : geometry.vertebrae[lowerLevel]
  const u = geometry.vertebrae[upperLevel]
  return { lower: [w.ps, w.as], upper: [u.pi, u.ai] }
}

function buildImplant(geometry: SpineGeometry, spec: ImplantSpec): ImplantGeometry {
  const { lower, upper } = segmentEndplates(geometry, spec.segment)
  const depth = length(sub(lower[1], lower[0]))
  const a = unit(sub(lower[1], lower[0]))
  const c = perpendicular(a)
  const upperDirection = unit(sub(upper[1], upper[0]))
  const start = ((spec.positionPercent - spec.footprintPercent / 2) / 100) * depth
  const end = ((spec.positionPercent + spec.footprintPercent / 2) / 100) * depth
  const onLower = (s: number) => along(lower[0], a, s)
  // Straight up from a point of W's endplate (along c) to U's inferior endplate.
  const above = (p: Vec2) => intersect(p, c, upper[0], upperDirection)
  if (spec.kind === 'cage') {
    const infP = onLower(start)
    const infA = onLower(end)
    return { kind: 'cage', segment: spec.segment, infP, infA, supP: above(infP), supA: above(infA) }
  }
  const centre = onLower((spec.positionPercent / 100) * depth)
  const centreAbove = above(centre)
  return {
    kind: 'disc-replacement',
    segment: spec.segment,
    lowerPlate: [onLower(start), onLower(end)],
    upperPlate: [above(onLower(start)), above(onLower(end))],
    // Half-way up the disc space, so its position along the endplate is exactly positionPercent.
    marker: mid(centre, centreAbove),
  }
}

/** Heights of a segment's disc at U's corners, perpendicular to W's superior endplate (mm). */
export function discHeightsMm(
  geometry: SpineGeometry,
  segment: SpineSegment,
): { posterior: number; anterior: number } {
  const { lower, upper } = segmentEndplates(geometry, segment)
  const c = perpendicular(unit(sub(lower[1], lower[0])))
  return {
    posterior: dot(sub(upper[0], lower[0]), c),
    anterior: dot(sub(upper[1], lower[0]), c),
  }
}

/** Refuses parameter sets that would draw bones through each other. */
export function checkSpineGeometry(geometry: SpineGeometry): void {
  for (const segment of SPINE_SEGMENTS) {
    const { posterior, anterior } = discHeightsMm(geometry, segment)
    if (anterior < 1 || posterior < 0.5) {
      throw new Error(
        `${segment}: the disc would be ${posterior.toFixed(1)} mm high posteriorly and ` +
          `${anterior.toFixed(1)} mm anteriorly; raise its disc height or change its segmental angle.`,
      )
    }
  }
}
