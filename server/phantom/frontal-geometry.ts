import {
  LUMBAR_LEVELS,
  SPINE_SEGMENTS,
  type ImplantSpec,
  type LumbarLevel,
  type PhantomParams,
  type SpineSegment,
} from './phantom-params'
import { discHeightsMm, type SpineGeometry } from './spine-geometry'
import { add, along, degToRad, length, mid, scale, sub, unit, type Vec2 } from './vec2'

// The frontal frame, millimetres: x toward the image's right edge (the `r` side of the
// landmark names), y cranial. Rotation and pixels come later, in frontal-placement.ts.

/** A vertebral body seen from the front: its endplate ends and its spinous process tip. */
export interface FrontalVertebra {
  /** Inferior endplate, the end toward the image's left (l) and right (r). */
  il: Vec2
  ir: Vec2
  /** Superior endplate, left and right ends. */
  sl: Vec2
  sr: Vec2
  /** Tip of the spinous process, projected onto the body. */
  sp: Vec2
}

export interface FrontalDiscReplacement {
  kind: 'disc-replacement'
  segment: SpineSegment
  /** The lower plate's ends: the `tdr.<segment>.l` and `.r` landmarks. */
  lowerPlate: [Vec2, Vec2]
  upperPlate: [Vec2, Vec2]
  /** The implant centre: the body midline moved by the offset along the endplates. */
  centre: Vec2
}

export interface FrontalCage {
  kind: 'cage'
  segment: SpineSegment
  /** Corners lower-left, lower-right, upper-right, upper-left. */
  corners: [Vec2, Vec2, Vec2, Vec2]
}

export type FrontalImplant = FrontalDiscReplacement | FrontalCage

export interface FrontalGeometry {
  vertebrae: Record<LumbarLevel, FrontalVertebra>
  s1: { sl: Vec2; sr: Vec2 }
  implants: FrontalImplant[]
}

/** Counter-clockwise turn by `radians` in the frontal frame (y up). */
function turn(v: Vec2, radians: number): Vec2 {
  const c = Math.cos(radians)
  const s = Math.sin(radians)
  return [v[0] * c - v[1] * s, v[0] * s + v[1] * c]
}

/** The quarter turn toward cranial of a direction pointing to the image's right. */
const cranialOf = (a: Vec2): Vec2 => [-a[1], a[0]]

function lowerOf(geometry: FrontalGeometry, segment: SpineSegment): { sl: Vec2; sr: Vec2 } {
  const index = SPINE_SEGMENTS.indexOf(segment)
  const lower = LUMBAR_LEVELS[index + 1]
  return lower === undefined ? geometry.s1 : geometry.vertebrae[lower]
}

/**
 * The endplate frame of a segment exactly as the engine defines it (measurement-reference §11):
 * e = unit((U.ir − U.il) + (W.sr − W.sl)), the midline point m (mean of the four corners) and
 * the mean width w, so an implant placed from them has the offset and tilt it was given.
 */
export function frontalSegmentFrame(
  geometry: FrontalGeometry,
  segment: SpineSegment,
): { e: Vec2; midline: Vec2; widthMm: number } {
  const upper = geometry.vertebrae[segment.split('-')[0] as LumbarLevel]
  const lower = lowerOf(geometry, segment)
  const upperLine = sub(upper.ir, upper.il)
  const lowerLine = sub(lower.sr, lower.sl)
  const corners = [upper.il, upper.ir, lower.sl, lower.sr]
  return {
    e: unit(add(upperLine, lowerLine)),
    midline: scale(corners.reduce(add, [0, 0] as Vec2), 1 / corners.length),
    widthMm: (length(upperLine) + length(lowerLine)) / 2,
  }
}

function buildImplant(
  geometry: FrontalGeometry,
  spec: ImplantSpec,
  discHeightMm: number,
): FrontalImplant {
  const { e, midline, widthMm } = frontalSegmentFrame(geometry, spec.segment)
  const n = cranialOf(e)
  if (spec.kind === 'cage') {
    const half = 0.3 * widthMm
    const low = along(midline, n, -discHeightMm / 2 + 0.4)
    const high = along(midline, n, discHeightMm / 2 - 0.4)
    return {
      kind: 'cage',
      segment: spec.segment,
      corners: [
        along(low, e, -half),
        along(low, e, half),
        along(high, e, half),
        along(high, e, -half),
      ],
    }
  }
  const centre = along(midline, e, spec.lateralOffsetMm)
  const t = turn(e, degToRad(spec.coronalTiltDeg))
  const half = ((spec.frontalWidthPercent / 100) * widthMm) / 2
  // The plates sit just inside the endplates; shifting them along n (perpendicular to e) keeps
  // the offset along e exactly as given.
  const plate = (height: number): [Vec2, Vec2] => {
    const middle = along(centre, n, height)
    return [along(middle, t, -half), along(middle, t, half)]
  }
  const inset = Math.max(0.6, discHeightMm / 2 - 1)
  return {
    kind: 'disc-replacement',
    segment: spec.segment,
    lowerPlate: plate(-inset),
    upperPlate: plate(inset),
    centre,
  }
}

/**
 * Stacks the bodies from the S1 endplate upward as seen on an AP film: each disc as high as
 * the lateral phantom's mean disc height there, each upper endplate turned by the segment's
 * coronal angle, each body as high as its mean lateral height; then places every implant.
 */
export function buildFrontalGeometry(
  params: PhantomParams,
  lateral: SpineGeometry,
): FrontalGeometry {
  const shape = params.frontal
  const s1 = { sl: [-shape.sacrumWidthMm / 2, 0] as Vec2, sr: [shape.sacrumWidthMm / 2, 0] as Vec2 }
  const vertebrae = {} as Record<LumbarLevel, FrontalVertebra>
  let below = s1
  for (const level of [...LUMBAR_LEVELS].reverse()) {
    const segment = SPINE_SEGMENTS[LUMBAR_LEVELS.indexOf(level)] as SpineSegment
    const heights = discHeightsMm(lateral, segment)
    const discMm = (heights.posterior + heights.anterior) / 2
    const a = unit(sub(below.sr, below.sl))
    const centre = along(mid(below.sl, below.sr), cranialOf(a), discMm)
    const aUpper = turn(a, degToRad(shape.coronalAngleDeg[segment]))
    const halfWidth = shape.bodyWidthMm[level] / 2
    const il = along(centre, aUpper, -halfWidth)
    const ir = along(centre, aUpper, halfWidth)
    const body = params.vertebrae[level]
    const height = (body.posteriorHeightMm + body.anteriorHeightMm) / 2
    const up = cranialOf(aUpper)
    const sp = along(
      along(centre, up, 0.3 * height),
      aUpper,
      (shape.spinousOffsetPercent / 100) * halfWidth,
    )
    vertebrae[level] = { il, ir, sl: along(il, up, height), sr: along(ir, up, height), sp }
    below = vertebrae[level]
  }
  const geometry: FrontalGeometry = { vertebrae, s1, implants: [] }
  geometry.implants = params.implants.map((implant) => {
    const heights = discHeightsMm(lateral, implant.segment)
    return buildImplant(geometry, implant, (heights.posterior + heights.anterior) / 2)
  })
  return geometry
}
