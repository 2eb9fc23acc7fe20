import sharp from 'sharp'
import type { PhantomParams } from './phantom-params'
import { seededRandom } from './seeded-random'

// Grey levels of the drawing (0–1) span this part of the 16-bit range: air is not quite zero
// and dense bone does not saturate, as on a well-exposed film.
const AIR_LEVEL = 1500
const LEVEL_SPAN = 56000

function toUint16(buffer: Buffer): Uint16Array {
  return new Uint16Array(buffer.buffer, buffer.byteOffset, buffer.length >> 1)
}

/**
 * Rasterises the phantom's SVG to 16-bit grey pixels: blur (focal spot and scatter) at 16-bit
 * precision so the 8-bit drawing does not band, then seeded Gaussian detector noise.
 */
export async function renderFilmPixels(svg: string, params: PhantomParams): Promise<Uint16Array> {
  const raw = { width: params.widthPx, height: params.heightPx, channels: 1 as const }
  const drawn = await sharp(Buffer.from(svg))
    .flatten({ background: '#000000' })
    .greyscale()
    .toColourspace('grey16')
    .raw({ depth: 'ushort' })
    .toBuffer()
  let levels = toUint16(drawn)
  if (params.blurPx >= 0.3) {
    levels = toUint16(
      await sharp(levels, { raw })
        .blur(params.blurPx)
        .toColourspace('grey16')
        .raw({ depth: 'ushort' })
        .toBuffer(),
    )
  }
  const random = seededRandom(params.seed)
  const sd = params.noise * 65535
  const out = new Uint16Array(levels.length)
  for (let i = 0; i < out.length; i += 2) {
    // Box–Muller gives two independent normal draws per pair of uniforms.
    const r = Math.sqrt(-2 * Math.log(1 - random()))
    const theta = 2 * Math.PI * random()
    out[i] = clamp(
      AIR_LEVEL + ((levels[i] as number) / 65535) * LEVEL_SPAN + sd * r * Math.cos(theta),
    )
    if (i + 1 < out.length) {
      out[i + 1] = clamp(
        AIR_LEVEL + ((levels[i + 1] as number) / 65535) * LEVEL_SPAN + sd * r * Math.sin(theta),
      )
    }
  }
  return out
}

function clamp(value: number): number {
  return value < 0 ? 0 : value > 65535 ? 65535 : Math.round(value)
}
