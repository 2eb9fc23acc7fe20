import { LUMBAR_LEVELS, type PhantomParams } from './phantom-params'
import type { FilmPlacement } from './film-placement'
import { FRONTAL_PELVIS_EXTENT } from './frontal-placement'
import type { FrontalGeometry, FrontalImplant, FrontalVertebra } from './frontal-geometry'
import { add, along, length, mid, scale, sub, unit, type Vec2 } from './vec2'
import { boneWithCortex } from './cortex-svg'

// The frontal film, drawn as attenuation like the lateral one (brighter = more bone or metal):
// bodies with their endplate corners as exact vertices, pedicle rings, spinous and transverse
// processes, the sacrum and iliac wings, and the implants' metal plates.

interface Pen {
  at(point: Vec2): string
  xy(point: Vec2): [string, string]
  px(mm: number): string
}

function pen(placement: FilmPlacement): Pen {
  const xy = (point: Vec2): [string, string] => {
    const [x, y] = placement.toPixel(point)
    return [x.toFixed(2), y.toFixed(2)]
  }
  return { xy, at: (point) => xy(point).join(' '), px: (mm) => placement.px(mm).toFixed(2) }
}

function polygon(p: Pen, points: Vec2[]): string {
  return `M ${points.map((point) => p.at(point)).join(' L ')} Z`
}

/** A point bowed `depthMm` off the middle of a → b toward `toward`. */
function bow(a: Vec2, b: Vec2, depthMm: number, toward: Vec2): Vec2 {
  const middle = mid(a, b)
  return along(middle, unit(sub(toward, middle)), depthMm)
}

/** The body through its four exact corners; the lateral walls have a waist, as real bodies do. */
function bodyPath(p: Pen, v: FrontalVertebra): string {
  const centre = scale(add(add(v.il, v.ir), add(v.sl, v.sr)), 0.25)
  const q = (a: Vec2, b: Vec2, depth: number) => `Q ${p.at(bow(a, b, depth, centre))} ${p.at(b)}`
  return [
    `M ${p.at(v.il)}`,
    q(v.il, v.ir, 0.6),
    q(v.ir, v.sr, 2.2),
    q(v.sr, v.sl, 0.6),
    q(v.sl, v.il, 2.2),
    'Z',
  ].join(' ')
}

function ellipse(p: Pen, centre: Vec2, rxMm: number, ryMm: number, attributes: string): string {
  const [cx, cy] = p.xy(centre)
  return `<ellipse cx="${cx}" cy="${cy}" rx="${p.px(rxMm)}" ry="${p.px(ryMm)}" ${attributes}/>`
}

/** Pedicles (rings), transverse processes and the spinous process of one vertebra. */
function posteriorElements(p: Pen, v: FrontalVertebra): string {
  const right = unit(sub(v.sr, v.sl))
  const up = unit(sub(v.sl, v.il))
  const width = length(sub(v.sr, v.sl))
  const height = length(sub(v.sl, v.il))
  const upper = along(mid(v.sl, v.sr), up, -0.3 * height)
  const pedicle = (side: 1 | -1) => along(upper, right, side * 0.3 * width)
  const process = (side: 1 | -1) => {
    const base = along(pedicle(side), right, side * 0.12 * width)
    const tip = along(along(base, right, side * 0.42 * width), up, 0.04 * height)
    const half = 0.07 * height
    return polygon(p, [
      along(base, up, half),
      along(tip, up, half * 0.6),
      along(tip, up, -half * 0.6),
      along(base, up, -half),
    ])
  }
  const stroke = `fill="none" stroke="#ffffff" stroke-opacity="0.42" stroke-width="${p.px(1.6)}"`
  const tip = v.sp
  const spinous = polygon(p, [
    along(tip, up, 0.22 * height),
    along(along(tip, up, 0.02 * height), right, 0.06 * width),
    along(tip, up, -0.12 * height),
    along(along(tip, up, 0.02 * height), right, -0.06 * width),
  ])
  return [
    `<path d="${process(-1)}" fill="#ffffff" fill-opacity="0.12"/>`,
    `<path d="${process(1)}" fill="#ffffff" fill-opacity="0.12"/>`,
    ellipse(p, pedicle(-1), 0.09 * width, 0.16 * height, stroke),
    ellipse(p, pedicle(1), 0.09 * width, 0.16 * height, stroke),
    `<path d="${spinous}" fill="#ffffff" fill-opacity="0.16" stroke="#ffffff" stroke-opacity="0.3" stroke-width="${p.px(1)}"/>`,
  ].join('')
}

/** Sacrum below the S1 endplate, and the iliac wings beside it. */
function pelvisMarkup(p: Pen, geometry: FrontalGeometry): string {
  const { sl, sr } = geometry.s1
  const right = unit(sub(sr, sl))
  const down: Vec2 = [right[1], -right[0]]
  const width = length(sub(sr, sl))
  const centre = mid(sl, sr)
  const tip = along(centre, down, FRONTAL_PELVIS_EXTENT.caudalMm * 0.85)
  const sacrum = [
    `M ${p.at(sl)} L ${p.at(sr)}`,
    `Q ${p.at(along(along(sr, right, 0.35 * width), down, 0.35 * width))} ${p.at(along(along(centre, right, 0.32 * width), down, 1.1 * width))}`,
    `L ${p.at(tip)}`,
    `L ${p.at(along(along(centre, right, -0.32 * width), down, 1.1 * width))}`,
    `Q ${p.at(along(along(sl, right, -0.35 * width), down, 0.35 * width))} ${p.at(sl)} Z`,
  ].join(' ')
  const foramina = [0.35, 0.62, 0.86]
    .flatMap((depth) =>
      ([-1, 1] as const).map((side) =>
        ellipse(
          p,
          along(along(centre, down, depth * width), right, side * 0.24 * width),
          2.6,
          2.2,
          'fill="#000000" fill-opacity="0.35"',
        ),
      ),
    )
    .join('')
  // An iliac wing as a fan from the sacroiliac joint: the crest arches up to about the L4-L5
  // disc and out to the flank, the outer edge runs down toward the hip.
  const wing = (side: 1 | -1): string => {
    const at = (x: number, y: number) =>
      along(along(centre, right, side * x * width), down, -y * width)
    const [joint, crest, flank, hip, notch, jointLow] = [
      at(0.5, 0.05),
      at(1.45, 0.85),
      at(2.15, 0.35),
      at(1.9, -1.05),
      at(1.0, -1.15),
      at(0.55, -0.85),
    ]
    return [
      `<path d="M ${p.at(joint)} Q ${p.at(at(0.75, 0.85))} ${p.at(crest)}`,
      `Q ${p.at(at(2.05, 0.8))} ${p.at(flank)}`,
      `Q ${p.at(at(2.15, -0.4))} ${p.at(hip)}`,
      `Q ${p.at(at(1.4, -0.85))} ${p.at(notch)}`,
      `Q ${p.at(at(0.75, -1.1))} ${p.at(jointLow)} Z"`,
      `fill="#ffffff" fill-opacity="0.1" stroke="#ffffff" stroke-opacity="0.22" stroke-width="${p.px(2)}"/>`,
    ].join(' ')
  }
  return [
    wing(-1),
    wing(1),
    boneWithCortex({
      id: 'bone-S1',
      d: sacrum,
      cortexPx: Number(p.px(1.4)),
      fillOpacity: 0.75,
      rimColour: '#d0d0d0',
      marrow: false,
    }),
    foramina,
  ].join('\n')
}

function implantMarkup(p: Pen, implant: FrontalImplant): string {
  if (implant.kind === 'cage') {
    const [a, b, c, d] = implant.corners
    const inset = (corner: Vec2) => along(corner, unit(sub(mid(a, c), corner)), 2.4)
    return [
      `<path d="${polygon(p, implant.corners)}" fill="#f2f2f2" fill-opacity="0.9"/>`,
      `<path d="${polygon(p, [a, b, c, d].map(inset))}" fill="#8c8c8c"/>`,
    ].join('')
  }
  const plate = ([l, r]: [Vec2, Vec2]) =>
    `<path d="M ${p.at(l)} L ${p.at(r)}" stroke="#f4f4f4" stroke-width="${p.px(1.8)}" stroke-linecap="butt"/>`
  // Keels point away from the disc, into the bodies above and below.
  const cranial = unit(sub(mid(...implant.upperPlate), mid(...implant.lowerPlate)))
  const keel = (pair: [Vec2, Vec2], away: 1 | -1) => {
    const base = mid(pair[0], pair[1])
    const along1 = unit(sub(pair[1], pair[0]))
    return `<path d="${polygon(p, [along(base, along1, -1.2), along(base, cranial, away * 4.5), along(base, along1, 1.2)])}" fill="#e8e8e8"/>`
  }
  const coreWidth = length(sub(implant.lowerPlate[1], implant.lowerPlate[0])) * 0.32
  const coreHeight = length(sub(mid(...implant.upperPlate), mid(...implant.lowerPlate))) * 0.42
  return [
    ellipse(p, implant.centre, coreWidth, coreHeight, 'fill="#ffffff" fill-opacity="0.14"'),
    plate(implant.lowerPlate),
    plate(implant.upperPlate),
    keel(implant.lowerPlate, -1),
    keel(implant.upperPlate, 1),
  ].join('')
}

/** The frontal phantom film as SVG in image pixels; sharp renders it (render-film.ts). */
export function frontalFilmSvg(
  geometry: FrontalGeometry,
  placement: FilmPlacement,
  params: PhantomParams,
): string {
  const p = pen(placement)
  const { widthPx: width, heightPx: height } = params
  const l3 = geometry.vertebrae.L3
  const [flankLeft] = p.xy(add(mid(l3.il, l3.sl), [-150, 0]))
  const [flankRight] = p.xy(add(mid(l3.ir, l3.sr), [150, 0]))
  const tile = placement.px(24)
  const frequency = 1 / placement.px(2.4)
  const bodies = LUMBAR_LEVELS.map((level) => bodyPath(p, geometry.vertebrae[level]))
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">
<defs>
  <linearGradient id="tissue" gradientUnits="userSpaceOnUse" x1="${flankLeft}" y1="0" x2="${flankRight}" y2="0">
    <stop offset="0" stop-color="#0a0a0a"/><stop offset="0.08" stop-color="#383838"/>
    <stop offset="0.5" stop-color="#4c4c4c"/><stop offset="0.92" stop-color="#383838"/>
    <stop offset="1" stop-color="#0a0a0a"/>
  </linearGradient>
  <radialGradient id="marrow"><stop offset="0.55" stop-color="#000000" stop-opacity="0.2"/><stop offset="1" stop-color="#000000" stop-opacity="0"/></radialGradient>
  <filter id="grain" x="0" y="0" width="100%" height="100%">
    <feTurbulence type="fractalNoise" baseFrequency="${frequency.toFixed(4)}" numOctaves="2" seed="${params.seed}" stitchTiles="stitch"/>
    <feColorMatrix type="matrix" values="0 0 0 0 1  0 0 0 0 1  0 0 0 0 1  1.1 0 0 0 -0.42"/>
  </filter>
  <pattern id="trabecular" patternUnits="userSpaceOnUse" width="${tile.toFixed(2)}" height="${tile.toFixed(2)}">
    <rect width="${tile.toFixed(2)}" height="${tile.toFixed(2)}" fill="#8e8e8e"/>
    <rect width="${tile.toFixed(2)}" height="${tile.toFixed(2)}" filter="url(#grain)"/>
  </pattern>
</defs>
<rect width="${width}" height="${height}" fill="#0a0a0a"/>
<rect width="${width}" height="${height}" fill="url(#tissue)"/>
${pelvisMarkup(p, geometry)}
${bodies.map((d, i) => boneWithCortex({ id: `bone-${LUMBAR_LEVELS[i]}`, d, cortexPx: placement.px(1.5) })).join('\n')}
${LUMBAR_LEVELS.map((level) => posteriorElements(p, geometry.vertebrae[level])).join('\n')}
${geometry.implants.map((implant) => implantMarkup(p, implant)).join('\n')}
</svg>`
}
