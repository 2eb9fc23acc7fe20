import type { PixelPoint } from '@shared/types/landmarks'
import type { ReadingTemplate } from '@shared/types/domain'
import { templateReadsFrontalFilm } from '@shared/readings/templates'

/**
 * The landmark guide's drawing: a schematic of our own in a 200 × 150 view box (y down). On a
 * lateral film two vertebral bodies over the sacrum, drawn with the front toward the side the
 * film shows it (read from the placed corners); on a frontal film two bodies with a disc
 * replacement between them. Each landmark of the segment concerned gets a mark, the next one
 * to place a ring.
 */
export interface GuideMark {
  name: string
  x: number
  y: number
  placed: boolean
  next: boolean
}

export interface GuideLayout {
  view: 'lateral' | 'frontal'
  /** Lateral: the front of the spine is toward the image's right. */
  anteriorRight: boolean
  /** Outlines: bodies, sacrum, femoral head, implant plates (SVG path data). */
  bones: string[]
  implants: string[]
  /** A dotted gap between the lower body and the sacrum when levels lie between them. */
  gap: string | null
  labels: Array<{ x: number; y: number; text: string }>
  marks: GuideMark[]
}

const LEVELS = ['L1', 'L2', 'L3', 'L4', 'L5', 'S1'] as const
type Level = (typeof LEVELS)[number]
type Xy = [number, number]

// Lateral schematic, front to the right: corners of the two bodies, the sacral plate and wall.
const UPPER: Record<'ps' | 'as' | 'ai' | 'pi', Xy> = {
  ps: [62, 14],
  as: [128, 18],
  ai: [126, 50],
  pi: [64, 48],
}
const LOWER: Record<'ps' | 'as' | 'ai' | 'pi', Xy> = {
  ps: [60, 62],
  as: [131, 60],
  ai: [129, 93],
  pi: [61, 95],
}
const SACRUM = { ps: [58, 113] as Xy, as: [133, 104] as Xy, pw: [54, 136] as Xy }
const HEAD: Xy = [156, 134]

// Frontal schematic: the upper body's lower corners, the lower body's upper corners.
const FRONTAL = {
  upper: { sl: [56, 12] as Xy, sr: [144, 12] as Xy, il: [54, 56] as Xy, ir: [146, 56] as Xy },
  lower: { sl: [52, 90] as Xy, sr: [148, 90] as Xy, il: [50, 136] as Xy, ir: [150, 136] as Xy },
  sp: [100, 40] as Xy,
  plates: { lowerL: [68, 78] as Xy, lowerR: [132, 78] as Xy, upperL: [68, 62] as Xy },
}

const path = (points: Xy[]) => `M ${points.map(([x, y]) => `${x} ${y}`).join(' L ')} Z`

function levelOf(name: string): Level | null {
  const head = name.split('.')[0] as Level
  return (LEVELS as readonly string[]).includes(head) ? head : null
}

/** The segment a cage, marker or frontal implant landmark belongs to, e.g. ['L4', 'L5']. */
function segmentOf(name: string): [Level, Level] | null {
  const match = /^(?:cage|implant|tdr)\.(L[1-5])-(L[1-5]|S1)\./.exec(name)
  return match ? [match[1] as Level, match[2] as Level] : null
}

/**
 * Which way a lateral film faces, from the placed corners: the anterior corners of most
 * placed endplates lie right of their posterior ones, or left. Null when no endplate has both.
 */
export function anteriorRightFromPoints(
  points: Readonly<Record<string, PixelPoint>>,
): boolean | null {
  let votes = 0
  for (const level of LEVELS) {
    for (const [front, back] of [
      ['as', 'ps'],
      ['ai', 'pi'],
    ] as const) {
      const a = points[`${level}.${front}`]
      const p = points[`${level}.${back}`]
      if (a && p && a[0] !== p[0]) votes += a[0] > p[0] ? 1 : -1
    }
  }
  return votes === 0 ? null : votes > 0
}

/** The two bodies drawn for the landmark `focus`: the upper one first. */
function lateralLevels(focus: string | null, fallbackSegment: string | undefined): [Level, Level] {
  const segment = focus ? segmentOf(focus) : null
  const level = focus ? levelOf(focus) : null
  const fallback = (fallbackSegment?.split('-')[0] ?? 'L4') as Level
  const upper = segment?.[0] ?? (focus?.startsWith('FH') ? 'L5' : (level ?? fallback))
  // L5, S1 and the hips are drawn as L4 and L5 over the sacrum.
  if (upper === 'L5' || upper === 'S1') return ['L4', 'L5']
  return [upper, LEVELS[LEVELS.indexOf(upper) + 1] as Level]
}

function lateralLayout(
  names: string[],
  placed: Readonly<Record<string, PixelPoint>>,
  focus: string | null,
  fallbackSegment: string | undefined,
): GuideLayout {
  const anteriorRight = anteriorRightFromPoints(placed) ?? true
  const flip = ([x, y]: Xy): Xy => (anteriorRight ? [x, y] : [200 - x, y])
  const [top, bottom] = lateralLevels(focus, fallbackSegment)
  const body = (c: typeof UPPER) => path([c.ps, c.as, c.ai, c.pi].map(flip))
  const sacrum = path(
    [SACRUM.ps, SACRUM.as, [124, 124], [104, 146], [80, 148], [60, 142], SACRUM.pw].map((p) =>
      flip(p as Xy),
    ),
  )
  const where = (name: string): Xy | null => {
    const [level, part] = name.split('.') as [string, string | undefined]
    if (name === 'FH1' || name === 'FH2') return HEAD
    if (level === 'S1' && part && part in SACRUM) return SACRUM[part as keyof typeof SACRUM]
    const corners = level === top ? UPPER : level === bottom ? LOWER : null
    if (corners && part && part in corners) return corners[part as keyof typeof UPPER]
    const segment = segmentOf(name)
    if (!segment) return null
    // Implants sit in the disc between the two bodies, or under the lower one at L5-S1.
    const [above, below] =
      segment[1] === 'S1' ? [LOWER, { ps: SACRUM.ps, as: SACRUM.as }] : [UPPER, LOWER]
    if (segment[0] !== (segment[1] === 'S1' ? bottom : top)) return null
    const lerp = (a: Xy, b: Xy, t: number): Xy => [
      a[0] + (b[0] - a[0]) * t,
      a[1] + (b[1] - a[1]) * t,
    ]
    const roof = (t: number) => lerp(above.pi, above.ai, t)
    const floor = (t: number) => lerp(below.ps, below.as, t)
    const mid = (t: number, h: number) => lerp(roof(t), floor(t), h)
    const spots: Record<string, Xy> = {
      'sup.p': mid(0.2, 0.2),
      'sup.a': mid(0.8, 0.2),
      'inf.p': mid(0.2, 0.8),
      'inf.a': mid(0.8, 0.8),
      marker: mid(0.5, 0.5),
    }
    return spots[name.split('.').slice(2).join('.')] ?? null
  }
  const lowerIsL5 = bottom === 'L5'
  return {
    view: 'lateral',
    anteriorRight,
    bones: [body(UPPER), body(LOWER), sacrum, circlePath(flip(HEAD), 9)],
    implants: [],
    gap: lowerIsL5 ? null : `M ${flip([95, 99]).join(' ')} L ${flip([95, 106]).join(' ')}`,
    labels: [
      { x: flip([95, 34])[0], y: 37, text: top },
      { x: flip([95, 78])[0], y: 81, text: bottom },
      { x: flip([95, 128])[0], y: 131, text: 'S1' },
    ],
    marks: marksOf(names, placed, focus, (name) => {
      const spot = where(name)
      return spot ? flip(spot) : null
    }),
  }
}

function circlePath([cx, cy]: Xy, r: number): string {
  return `M ${cx - r} ${cy} A ${r} ${r} 0 1 0 ${cx + r} ${cy} A ${r} ${r} 0 1 0 ${cx - r} ${cy} Z`
}

function marksOf(
  names: string[],
  placed: Readonly<Record<string, PixelPoint>>,
  focus: string | null,
  where: (name: string) => Xy | null,
): GuideMark[] {
  const marks: GuideMark[] = []
  for (const name of names) {
    const spot = where(name)
    if (spot)
      marks.push({ name, x: spot[0], y: spot[1], placed: name in placed, next: name === focus })
  }
  return marks
}

function frontalLayout(
  names: string[],
  placed: Readonly<Record<string, PixelPoint>>,
  focus: string | null,
  fallbackSegment: string | undefined,
): GuideLayout {
  const segment =
    (focus ? segmentOf(focus) : null) ??
    (() => {
      const level = focus ? levelOf(focus) : null
      if (level && /\.s[lr]$/.test(focus ?? '')) {
        return [LEVELS[LEVELS.indexOf(level) - 1] as Level, level] as [Level, Level]
      }
      if (level) return [level, LEVELS[LEVELS.indexOf(level) + 1] as Level] as [Level, Level]
      const [u, w] = (fallbackSegment ?? 'L4-L5').split('-') as [Level, Level]
      return [u, w] as [Level, Level]
    })()
  const [top, bottom] = segment
  const { upper, lower, plates, sp } = FRONTAL
  const where = (name: string): Xy | null => {
    if (name === `${top}.il`) return upper.il
    if (name === `${top}.ir`) return upper.ir
    if (name === `${top}.sp`) return sp
    if (name === `${bottom}.sl`) return lower.sl
    if (name === `${bottom}.sr`) return lower.sr
    if (name === `tdr.${top}-${bottom}.l`) return plates.lowerL
    if (name === `tdr.${top}-${bottom}.r`) return plates.lowerR
    return null
  }
  const plate = (y: number) => `M ${plates.lowerL[0]} ${y} L ${plates.lowerR[0]} ${y}`
  return {
    view: 'frontal',
    anteriorRight: true,
    bones: [
      path([upper.sl, upper.sr, upper.ir, upper.il]),
      path([lower.sl, lower.sr, lower.ir, lower.il]),
      `M ${sp[0]} ${sp[1] - 12} L ${sp[0] + 5} ${sp[1]} L ${sp[0]} ${sp[1] + 5} L ${sp[0] - 5} ${sp[1]} Z`,
    ],
    implants: [plate(plates.upperL[1]), plate(plates.lowerL[1])],
    gap: null,
    // Beside the bodies, clear of the spinous process drawn on the upper one.
    labels: [
      { x: 34, y: 38, text: top },
      { x: 32, y: 117, text: bottom },
    ],
    marks: marksOf(names, placed, focus, where),
  }
}

/**
 * The guide for a reading: the drawing for its film, the landmarks of the segment around
 * `focus` (the landmark to place next, or the one picked), and which are placed.
 */
export function landmarkGuideLayout(
  template: ReadingTemplate,
  names: string[],
  placed: Readonly<Record<string, PixelPoint>>,
  focus: string | null,
  fallbackSegment?: string,
): GuideLayout {
  return templateReadsFrontalFilm(template)
    ? frontalLayout(names, placed, focus, fallbackSegment)
    : lateralLayout(names, placed, focus, fallbackSegment)
}
