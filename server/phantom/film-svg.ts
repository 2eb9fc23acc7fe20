import { LUMBAR_LEVELS, type PhantomParams } from './phantom-params'
import type { FilmPlacement } from './film-placement'
import type { ImplantGeometry, SpineGeometry, VertebraCorners } from './spine-geometry'
import { add, along, length, mid, perpendicular, scale, sub, unit, type Vec2 } from './vec2'
import { boneWithCortex } from './cortex-svg'

// The film is drawn as attenuation: brighter = more bone or metal, as on a MONOCHROME2 radiograph.
// Overlapping structures are semi-transparent white so their densities add up, roughly as X-ray
// attenuation does along the beam.

interface Pen {
  at(point: Vec2): string
  px(mm: number): string
}

function pen(placement: FilmPlacement): Pen {
  return {
    at: (point) => {
      const [x, y] = placement.toPixel(point)
      return `${x.toFixed(2)} ${y.toFixed(2)}`
    },
    px: (mm) => placement.px(mm).toFixed(2),
  }
}

function polygon(p: Pen, points: Vec2[]): string {
  return `M ${points.map((point) => p.at(point)).join(' L ')} Z`
}

/** A point bowed `depthMm` off the middle of a → b, toward `toward`'s side. */
function bow(a: Vec2, b: Vec2, depthMm: number, toward: Vec2): Vec2 {
  const middle = mid(a, b)
  return along(middle, unit(sub(toward, middle)), depthMm)
}

/**
 * A vertebral body through its four exact corners: walls and endplates bow inward a little, as
 * real bodies do, but the landmark corners stay the path's vertices.
 */
function bodyPath(p: Pen, v: VertebraCorners): string {
  const centre = scale(add(add(v.as, v.ps), add(v.pi, v.ai)), 0.25)
  const q = (a: Vec2, b: Vec2, depth: number) => `Q ${p.at(bow(a, b, depth, centre))} ${p.at(b)}`
  return [
    `M ${p.at(v.ps)}`,
    q(v.ps, v.as, 0.8),
    q(v.as, v.ai, 1.6),
    q(v.ai, v.pi, 0.8),
    q(v.pi, v.ps, 0.7),
    'Z',
  ].join(' ')
}

/**
 * Pedicle, articular pillar and spinous process behind a body: fainter than the body, as they are
 * thinner along the beam.
 */
function posteriorElementsPath(p: Pen, v: VertebraCorners): string {
  const up = unit(sub(v.ps, v.pi))
  const back = unit(sub(v.ps, v.as))
  const height = length(sub(v.ps, v.pi))
  const wall = (fraction: number) => along(v.pi, up, fraction * height)
  const pedicleTop = along(wall(0.88), back, 11)
  const pedicleBottom = along(wall(0.45), back, 11)
  const pillarTop = along(pedicleTop, up, 0.3 * height)
  const pillarBack = along(pillarTop, back, 13)
  const spineTop = along(along(pedicleTop, back, 22), up, -0.15 * height)
  const spineTip = along(along(spineTop, back, 30), up, -0.3 * height)
  const spineTipLow = along(spineTip, up, -0.4 * height)
  const spineBottom = along(along(pedicleBottom, back, 24), up, -0.4 * height)
  const pillarLow = along(along(pedicleBottom, up, -0.75 * height), back, 6)
  return [
    `M ${p.at(wall(0.9))} L ${p.at(pedicleTop)} L ${p.at(pillarTop)} L ${p.at(pillarBack)}`,
    `L ${p.at(spineTop)} Q ${p.at(along(spineTip, up, 0.05 * height))} ${p.at(spineTip)}`,
    `Q ${p.at(along(mid(spineTip, spineTipLow), back, 4))} ${p.at(spineTipLow)}`,
    `L ${p.at(spineBottom)} L ${p.at(pillarLow)} L ${p.at(pedicleBottom)} L ${p.at(wall(0.5))} Z`,
  ].join(' ')
}

function sacrumPath(p: Pen, geometry: SpineGeometry): string {
  const { as, ps, pw } = geometry.s1
  const down = geometry.sacralWall
  const forward = unit(sub(as, ps))
  // The anterior surface runs roughly parallel to the posterior wall, then curves back to the tip.
  const depth = length(sub(as, ps))
  const anterior1 = along(along(ps, down, 34), forward, depth * 0.92)
  const anterior2 = along(along(ps, down, 72), forward, depth * 0.55)
  // Sacral kyphosis: the lower segments curve forward under the upper ones.
  const tip = along(along(ps, down, 100), forward, depth * 0.35)
  const posterior2 = along(along(ps, down, 72), forward, 6)
  return [
    `M ${p.at(ps)} L ${p.at(as)}`,
    `Q ${p.at(along(mid(as, anterior1), forward, 3))} ${p.at(anterior1)}`,
    `Q ${p.at(along(mid(anterior1, anterior2), forward, 6))} ${p.at(anterior2)}`,
    `Q ${p.at(along(mid(anterior2, tip), forward, 4))} ${p.at(tip)}`,
    `L ${p.at(posterior2)} L ${p.at(pw)} Z`,
  ].join(' ')
}

/** Faint lines where the sacral segments fused, parallel to S1's endplate. */
function sacralSegmentLines(p: Pen, geometry: SpineGeometry): string {
  const { as, ps } = geometry.s1
  const forward = unit(sub(as, ps))
  const depth = length(sub(as, ps))
  return [28, 52, 74]
    .map((down, i) => {
      const start = along(ps, geometry.sacralWall, down)
      const end = along(start, forward, depth * (0.85 - i * 0.2))
      return `<path d="M ${p.at(start)} L ${p.at(end)}" stroke="#ffffff" stroke-opacity="0.18" stroke-width="${p.px(1.2)}"/>`
    })
    .join('')
}

function implantMarkup(p: Pen, implant: ImplantGeometry): string {
  if (implant.kind === 'cage') {
    const corners = [implant.infP, implant.infA, implant.supA, implant.supP]
    const centre = scale(corners.reduce(add, [0, 0] as Vec2), 0.25)
    const inset = corners.map((corner) => along(corner, unit(sub(centre, corner)), 2.2))
    return [
      `<path d="${polygon(p, corners)}" fill="#f4f4f4"/>`,
      // The graft window in the middle of the cage holds bone, not metal.
      `<path d="${polygon(p, inset)}" fill="#8c8c8c"/>`,
    ].join('')
  }
  const plate = (pair: [Vec2, Vec2], toward: Vec2) => {
    const inward = scale(unit(sub(toward, mid(pair[0], pair[1]))), 0.9)
    const [a, b] = [add(pair[0], inward), add(pair[1], inward)]
    const keelBase = mid(a, b)
    const keelTip = along(keelBase, unit(sub(keelBase, toward)), 5)
    return (
      `<path d="M ${p.at(a)} L ${p.at(b)}" stroke="#f2f2f2" stroke-width="${p.px(1.8)}" stroke-linecap="round"/>` +
      `<path d="${polygon(p, [along(keelBase, unit(sub(b, a)), -2), keelTip, along(keelBase, unit(sub(b, a)), 2)])}" fill="#e8e8e8"/>`
    )
  }
  const core = mid(mid(...implant.lowerPlate), mid(...implant.upperPlate))
  const coreRadius = length(sub(implant.lowerPlate[1], implant.lowerPlate[0])) / 2.6
  return [
    `<circle cx="${p.at(core).split(' ')[0]}" cy="${p.at(core).split(' ')[1]}" r="${p.px(coreRadius)}" fill="#ffffff" fill-opacity="0.12"/>`,
    plate(implant.lowerPlate, implant.marker),
    plate(implant.upperPlate, implant.marker),
    circle(p, implant.marker, 1.3, 'fill="#ffffff"'),
    circle(
      p,
      implant.marker,
      3.2,
      `fill="none" stroke="#ffffff" stroke-opacity="0.8" stroke-width="${p.px(0.6)}"`,
    ),
  ].join('')
}

function circle(p: Pen, centre: Vec2, radiusMm: number, attributes: string): string {
  const [cx, cy] = p.at(centre).split(' ')
  return `<circle cx="${cx}" cy="${cy}" r="${p.px(radiusMm)}" ${attributes}/>`
}

function femoralMarkup(p: Pen, head: Vec2, radiusMm: number): string {
  const neckDirection = unit([0.55, -0.83])
  const side = perpendicular(neckDirection)
  const neckEnd = along(head, neckDirection, 75)
  const neck = polygon(p, [
    along(head, side, 13),
    along(neckEnd, side, 20),
    along(neckEnd, side, -20),
    along(head, side, -13),
  ])
  const roof = (angle: number) => along(head, [Math.cos(angle), Math.sin(angle)], radiusMm + 2.5)
  // The acetabular roof: an arc over the upper half of the head.
  const acetabulum = `M ${p.at(roof(Math.PI * 0.05))} A ${p.px(radiusMm + 2.5)} ${p.px(radiusMm + 2.5)} 0 0 0 ${p.at(roof(Math.PI * 0.95))}`
  return [
    `<path d="${neck}" fill="#ffffff" fill-opacity="0.08"/>`,
    circle(
      p,
      head,
      radiusMm,
      `fill="#ffffff" fill-opacity="0.10" stroke="#ffffff" stroke-opacity="0.30" stroke-width="${p.px(1.5)}"`,
    ),
    `<path d="${acetabulum}" fill="none" stroke="#ffffff" stroke-opacity="0.22" stroke-width="${p.px(3)}"/>`,
  ].join('')
}

/** The phantom film as SVG in image pixels; sharp renders it (server/phantom/render-film.ts). */
export function phantomFilmSvg(
  geometry: SpineGeometry,
  placement: FilmPlacement,
  params: PhantomParams,
): string {
  const p = pen(placement)
  const { widthPx: width, heightPx: height } = params
  const l3 = geometry.vertebrae.L3
  const [fh1, fh2] = geometry.femoralHeads
  const hip = mid(fh1, fh2)
  const s1Middle = mid(geometry.s1.as, geometry.s1.ps)
  // Soft tissue: dark behind the back and in front of the belly, brightest through the trunk.
  const backSkin = p.at([l3.ps[0] - 100, 0]).split(' ')[0]
  const belly = p.at([l3.as[0] + 175, 0]).split(' ')[0]
  const ilium = along(mid(s1Middle, hip), [0, 1], 30)
  const crest = (t: number): Vec2 => add(ilium, [Math.cos(t) * 85, Math.sin(t) * 62])
  const tile = placement.px(24)
  const frequency = 1 / placement.px(2.4)
  const bodies = LUMBAR_LEVELS.map((level) => bodyPath(p, geometry.vertebrae[level]))
  const soft = (x: string, y: string, rx: number, ry: number, opacity: number, id: string) =>
    `<ellipse cx="${x}" cy="${y}" rx="${p.px(rx)}" ry="${p.px(ry)}" fill="url(#${id})" fill-opacity="${opacity}"/>`
  const [iliumX = '0', iliumY = '0'] = p.at(ilium).split(' ')
  const [trunkX = '0', trunkY = '0'] = p.at(add(mid(l3.as, l3.ps), [35, -20])).split(' ')

  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">
<defs>
  <linearGradient id="tissue" gradientUnits="userSpaceOnUse" x1="${backSkin}" y1="0" x2="${belly}" y2="0">
    <stop offset="0" stop-color="#0a0a0a"/><stop offset="0.06" stop-color="#3c3c3c"/>
    <stop offset="0.45" stop-color="#505050"/><stop offset="0.92" stop-color="#3a3a3a"/>
    <stop offset="1" stop-color="#0a0a0a"/>
  </linearGradient>
  <radialGradient id="glow"><stop offset="0" stop-color="#ffffff"/><stop offset="1" stop-color="#ffffff" stop-opacity="0"/></radialGradient>
  <radialGradient id="marrow"><stop offset="0.55" stop-color="#000000" stop-opacity="0.22"/><stop offset="1" stop-color="#000000" stop-opacity="0"/></radialGradient>
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
${soft(trunkX, trunkY, 150, 230, 0.1, 'glow')}
${soft(iliumX, iliumY, 110, 85, 0.16, 'glow')}
<path d="M ${p.at(crest(Math.PI * 0.1))} Q ${p.at(crest(Math.PI * 0.5))} ${p.at(crest(Math.PI * 0.9))}" fill="none" stroke="#ffffff" stroke-opacity="0.16" stroke-width="${p.px(2.2)}"/>
${femoralMarkup(p, fh2, params.femoralHeadRadiusMm)}
${femoralMarkup(p, fh1, params.femoralHeadRadiusMm)}
${LUMBAR_LEVELS.map((level) => `<path d="${posteriorElementsPath(p, geometry.vertebrae[level])}" fill="#ffffff" fill-opacity="0.12" stroke="#ffffff" stroke-opacity="0.2" stroke-width="${p.px(1)}" stroke-linejoin="round"/>`).join('\n')}
${boneWithCortex({ id: 'bone-S1', d: sacrumPath(p, geometry), cortexPx: placement.px(1.5), fillOpacity: 0.8, rimColour: '#d0d0d0', marrow: false })}
${sacralSegmentLines(p, geometry)}
${bodies.map((d, i) => boneWithCortex({ id: `bone-${LUMBAR_LEVELS[i]}`, d, cortexPx: placement.px(1.5) })).join('\n')}
${geometry.implants.map((implant) => implantMarkup(p, implant)).join('\n')}
</svg>`
}
