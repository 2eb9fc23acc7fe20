import type { Point } from '@shared/geometry/types'
import type { PixelPoint } from '@shared/types/landmarks'
import type { MeasurementResult, SegmentName } from '@shared/types/measurement'
import { SEGMENT_NAMES } from '@shared/measurement'

/** Overlay colours encode the kind of line, never the vertebra. */
export type OverlayCategory = 'endplate' | 'wall' | 'pelvic' | 'implant' | 'disc'

export const OVERLAY_COLOURS: Record<OverlayCategory, string> = {
  endplate: '#5cc6ee',
  wall: '#f0b54a',
  pelvic: '#c39bf0',
  implant: '#78dd8c',
  disc: '#c9d1d8',
}

/** Every coordinate is in image px (x right, y down); sizes that must stay constant on screen are
 * applied by the canvas. */
export type OverlayShape =
  | { kind: 'line'; id: string; category: OverlayCategory; points: number[]; dashed?: boolean }
  | {
      kind: 'arc'
      id: string
      category: OverlayCategory
      center: Point
      radiusPx: number
      /** Clockwise from +x in degrees (y down), as Konva's `rotation`. */
      rotationDeg: number
      angleDeg: number
    }
  | { kind: 'ring'; id: string; category: OverlayCategory; center: Point; radiusPx: number }
  | {
      kind: 'label'
      id: string
      category: OverlayCategory
      at: Point
      text: string
      /** Which edge of the label sits at `at`, so labels grow away from the spine. */
      anchor: 'start' | 'end' | 'middle'
    }

type Points = Record<string, PixelPoint>

const mid = (a: Point, b: Point): Point => [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2]
const sub = (a: Point, b: Point): Point => [a[0] - b[0], a[1] - b[1]]
const len = (v: Point): number => Math.hypot(v[0], v[1])
const dirDeg = (from: Point, to: Point): number =>
  (Math.atan2(to[1] - from[1], to[0] - from[0]) * 180) / Math.PI

function line(
  id: string,
  category: OverlayCategory,
  a: Point,
  b: Point,
  dashed = false,
): OverlayShape {
  return { kind: 'line', id, category, points: [a[0], a[1], b[0], b[1]], dashed }
}

function formatNumber(
  value: number | null | undefined,
  digits: number,
  unit: string,
): string | null {
  if (value === null || value === undefined || !Number.isFinite(value)) return null
  const fixed = value.toFixed(digits)
  // −0.0 reads as a sign error.
  const text = /^-0\.?0*$/.test(fixed) ? fixed.slice(1) : fixed.replace('-', '−')
  return unit === '°' ? `${text}°` : `${text} ${unit}`
}

/** The segments whose two vertebrae the template touches. */
function segmentsOf(points: Points): SegmentName[] {
  return SEGMENT_NAMES.filter((name) => {
    const [upper, lower] = name.split('-') as [string, string]
    return `${upper}.pi` in points && `${lower}.ps` in points
  })
}

function segmentOverlays(
  segment: SegmentName,
  points: Points,
  results: MeasurementResult | null,
  labelSmallSlips: boolean,
): OverlayShape[] {
  const shapes: OverlayShape[] = []
  const [u, w] = segment.split('-') as [string, string]
  const measures = results?.segments[segment]
  const uPi = points[`${u}.pi`]
  const uAi = points[`${u}.ai`]
  const uAs = points[`${u}.as`]
  const uPs = points[`${u}.ps`]
  const wPs = points[`${w}.ps`]
  const wAs = points[`${w}.as`]
  if (uPi && wPs && wAs) {
    // Slip offset: U's posterior-inferior corner projected on W's superior endplate.
    const along = sub(wAs, wPs)
    const depth = len(along)
    if (depth > 0) {
      const a: Point = [along[0] / depth, along[1] / depth]
      const d = (uPi[0] - wPs[0]) * a[0] + (uPi[1] - wPs[1]) * a[1]
      const foot: Point = [wPs[0] + a[0] * d, wPs[1] + a[1] * d]
      shapes.push(line(`slip-${segment}`, 'wall', wPs, foot))
      shapes.push(line(`slip-drop-${segment}`, 'wall', uPi, foot, true))
      const slip = measures?.slipPercent
      const text = formatNumber(slip, 1, '%')
      // On a whole spine, a label on every aligned segment is noise; a slip of 1 % or more is not.
      if (text && slip != null && (labelSmallSlips || Math.abs(slip) >= 1)) {
        // Behind the posterior wall, growing away from the spine.
        const outward: Point = [-a[0] * depth * 0.25, -a[1] * depth * 0.25]
        shapes.push({
          kind: 'label',
          id: `slip-label-${segment}`,
          category: 'wall',
          at: [wPs[0] + outward[0], wPs[1] + outward[1]],
          text: `slip ${text}`,
          anchor: a[0] > 0 ? 'end' : 'start',
        })
      }
    }
  }
  if (uAi && wAs) shapes.push(line(`disc-a-${segment}`, 'disc', uAi, wAs, true))
  if (uPi && wPs) shapes.push(line(`disc-p-${segment}`, 'disc', uPi, wPs, true))

  // Segmental lordosis: a small protractor in front of the disc, two rays parallel to U's
  // superior endplate and W's reference endplate with the arc between them. The lines
  // themselves rarely meet on the film at lordotic angles, so the angle is drawn beside them.
  const wLowerFrom = w === 'S1' ? points['S1.ps'] : points[`${w}.pi`]
  const wLowerTo = w === 'S1' ? points['S1.as'] : points[`${w}.ai`]
  const value = measures?.segmentalLordosisDeg
  if (uPs && uAs && wLowerFrom && wLowerTo && value !== null && value !== undefined) {
    const upper = sub(uAs, uPs)
    const lower = sub(wLowerTo, wLowerFrom)
    const depth = (len(upper) + len(lower)) / 2
    if (depth > 0) {
      const anterior: Point = [
        (upper[0] / len(upper) + lower[0] / len(lower)) / 2,
        (upper[1] / len(upper) + lower[1] / len(lower)) / 2,
      ]
      const anteriorLength = len(anterior) || 1
      const ahead: Point = [anterior[0] / anteriorLength, anterior[1] / anteriorLength]
      const front = mid(uAs, wLowerTo)
      const center: Point = [front[0] + ahead[0] * depth * 0.35, front[1] + ahead[1] * depth * 0.35]
      const rayLength = depth * 0.45
      // Rays point forward, along each endplate from posterior to anterior.
      const rayU: Point = [
        center[0] + (upper[0] / len(upper)) * rayLength,
        center[1] + (upper[1] / len(upper)) * rayLength,
      ]
      const rayW: Point = [
        center[0] + (lower[0] / len(lower)) * rayLength,
        center[1] + (lower[1] / len(lower)) * rayLength,
      ]
      shapes.push(line(`lordosis-ray-u-${segment}`, 'endplate', center, rayU))
      shapes.push(line(`lordosis-ray-w-${segment}`, 'endplate', center, rayW))
      const a1 = dirDeg(uPs, uAs)
      const a2 = dirDeg(wLowerFrom, wLowerTo)
      let sweep = a2 - a1
      while (sweep > 180) sweep -= 360
      while (sweep < -180) sweep += 360
      shapes.push({
        kind: 'arc',
        id: `lordosis-arc-${segment}`,
        category: 'endplate',
        center,
        radiusPx: rayLength * 0.7,
        rotationDeg: sweep >= 0 ? a1 : a2,
        angleDeg: Math.max(0.5, Math.abs(sweep)),
      })
      shapes.push({
        kind: 'label',
        id: `lordosis-label-${segment}`,
        category: 'endplate',
        at: [
          center[0] + ahead[0] * rayLength * 1.1,
          center[1] + ahead[1] * rayLength * 1.1 - depth * 0.08,
        ],
        text: `${segment} ${formatNumber(value, 1, '°')}`,
        anchor: ahead[0] >= 0 ? 'start' : 'end',
      })
    }
  }
  return shapes
}

function pelvicOverlays(points: Points, results: MeasurementResult | null): OverlayShape[] {
  const ps = points['S1.ps']
  const as = points['S1.as']
  const fh1 = points.FH1
  const fh2 = points.FH2
  const shapes: OverlayShape[] = []
  for (const [name, centre] of [
    ['FH1', fh1],
    ['FH2', fh2],
  ] as const) {
    if (centre)
      shapes.push({
        kind: 'ring',
        id: `head-${name}`,
        category: 'pelvic',
        center: centre,
        radiusPx: 0,
      })
  }
  if (!ps || !as || (!fh1 && !fh2)) return shapes
  const hip: Point = fh1 && fh2 ? mid(fh1, fh2) : ((fh1 ?? fh2) as Point)
  const m = mid(ps, as)
  const plate = sub(as, ps)
  const depth = len(plate)
  if (depth === 0) return shapes
  const a: Point = [plate[0] / depth, plate[1] / depth]
  // Extend the sacral plate a little either way so it reads as a line, not the endplate itself.
  shapes.push(
    line(
      'sacral-plate',
      'pelvic',
      [ps[0] - a[0] * depth * 0.3, ps[1] - a[1] * depth * 0.3],
      [as[0] + a[0] * depth * 0.3, as[1] + a[1] * depth * 0.3],
    ),
  )
  // The caudal normal of the plate: the perpendicular with positive y (image y is down).
  const normal: Point = [-a[1], a[0]]
  const caudal: Point = normal[1] >= 0 ? normal : [-normal[0], -normal[1]]
  const reach = len(sub(hip, m))
  shapes.push(
    line(
      'sacral-perpendicular',
      'pelvic',
      m,
      [m[0] + caudal[0] * reach, m[1] + caudal[1] * reach],
      true,
    ),
  )
  shapes.push(line('hip-axis-line', 'pelvic', m, hip))
  if (fh1 && fh2) shapes.push(line('hip-axis', 'pelvic', fh1, fh2, true))
  const pelvis = results?.pelvis
  const parts = [
    pelvis?.incidenceDeg != null ? `PI ${pelvis.incidenceDeg.toFixed(1)}°` : null,
    pelvis?.tiltDeg != null ? `PT ${pelvis.tiltDeg.toFixed(1)}°` : null,
    pelvis ? `SS ${pelvis.sacralSlopeDeg.toFixed(1)}°` : null,
  ].filter((part): part is string => part !== null)
  if (parts.length) {
    shapes.push({
      kind: 'label',
      id: 'pelvic-label',
      category: 'pelvic',
      at: [hip[0], hip[1] + depth * 0.4],
      text: parts.join('  '),
      anchor: 'middle',
    })
  }
  return shapes
}

function implantOverlays(points: Points): OverlayShape[] {
  const shapes: OverlayShape[] = []
  for (const name of Object.keys(points)) {
    const cage = /^cage\.(.+)\.(sup|inf)\.p$/.exec(name)
    if (cage) {
      const anterior = points[`cage.${cage[1]}.${cage[2]}.a`]
      const posterior = points[name] as PixelPoint
      if (anterior) shapes.push(line(`cage-${cage[1]}-${cage[2]}`, 'implant', posterior, anterior))
    }
    if (/^implant\..+\.marker$/.test(name)) {
      shapes.push({
        kind: 'ring',
        id: `marker-${name}`,
        category: 'implant',
        center: points[name] as PixelPoint,
        radiusPx: 0,
      })
    }
  }
  return shapes
}

/**
 * The overlays drawn over a film from its landmarks: endplate lines, posterior walls, the slip
 * offset with its percentage, segmental lordosis arcs with their values, disc height markers,
 * the pelvic lines and femoral head centres, and implant lines. Labels take their values from
 * `results` (the same engine result the results panel shows), so the two never disagree.
 */
export function readingOverlayShapes(
  points: Points,
  results: MeasurementResult | null,
): OverlayShape[] {
  const shapes: OverlayShape[] = []
  const vertebrae = new Set(Object.keys(points).map((name) => name.split('.')[0] as string))
  for (const v of vertebrae) {
    const as = points[`${v}.as`]
    const ps = points[`${v}.ps`]
    const pi = points[`${v}.pi`]
    const ai = points[`${v}.ai`]
    if (ps && as) shapes.push(line(`endplate-sup-${v}`, 'endplate', ps, as))
    if (pi && ai) shapes.push(line(`endplate-inf-${v}`, 'endplate', pi, ai))
    if (ps && pi) shapes.push(line(`wall-${v}`, 'wall', ps, pi))
  }
  const wall = points['S1.pw']
  const s1ps = points['S1.ps']
  if (wall && s1ps) shapes.push(line('wall-S1', 'wall', s1ps, wall))
  const segments = segmentsOf(points)
  for (const segment of segments)
    shapes.push(...segmentOverlays(segment, points, results, segments.length === 1))
  shapes.push(...pelvicOverlays(points, results))
  shapes.push(...implantOverlays(points))
  return shapes
}
