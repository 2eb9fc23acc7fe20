/** A decoded greyscale image: one value per pixel, row by row. */
export interface GreyImage {
  width: number
  height: number
  bitDepth: 8 | 16
  pixels: Uint16Array
}

const SIGNATURE = [137, 80, 78, 71, 13, 10, 26, 10]

async function inflate(data: Uint8Array): Promise<Uint8Array> {
  // PNG's IDAT stream is zlib-wrapped deflate, which DecompressionStream calls 'deflate'.
  const stream = new Blob([data as BlobPart])
    .stream()
    .pipeThrough(new DecompressionStream('deflate'))
  return new Uint8Array(await new Response(stream).arrayBuffer())
}

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c
  const pa = Math.abs(p - a)
  const pb = Math.abs(p - b)
  const pc = Math.abs(p - c)
  if (pa <= pb && pa <= pc) return a
  return pb <= pc ? b : c
}

/**
 * Decodes a non-interlaced greyscale PNG of 8 or 16 bits (PNG specification, W3C 2003: IHDR,
 * IDAT, the five filter types) keeping every bit, which a browser canvas would not. Anything
 * else (colour, palette, interlaced, other depths) is refused with a message.
 */
export async function decodeGreyPng(bytes: Uint8Array): Promise<GreyImage> {
  if (!SIGNATURE.every((value, i) => bytes[i] === value)) throw new Error('Not a PNG file')
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  let offset = 8
  let width = 0
  let height = 0
  let bitDepth = 0
  const parts: Uint8Array[] = []
  while (offset + 8 <= bytes.length) {
    const length = view.getUint32(offset)
    const type = String.fromCharCode(...bytes.subarray(offset + 4, offset + 8))
    const data = bytes.subarray(offset + 8, offset + 8 + length)
    if (type === 'IHDR') {
      width = view.getUint32(offset + 8)
      height = view.getUint32(offset + 12)
      bitDepth = data[8] as number
      const colourType = data[9]
      const interlace = data[12]
      if (colourType !== 0) throw new Error('Only greyscale PNG films can be windowed here')
      if (bitDepth !== 8 && bitDepth !== 16)
        throw new Error(`Unsupported PNG bit depth ${bitDepth}`)
      if (interlace !== 0) throw new Error('Interlaced PNG films are not supported')
    } else if (type === 'IDAT') {
      parts.push(data)
    } else if (type === 'IEND') {
      break
    }
    offset += 12 + length
  }
  if (width === 0 || height === 0) throw new Error('The PNG has no image header')
  const joined = new Uint8Array(parts.reduce((sum, part) => sum + part.length, 0))
  let at = 0
  for (const part of parts) {
    joined.set(part, at)
    at += part.length
  }
  const raw = await inflate(joined)
  const bytesPerPixel = bitDepth / 8
  const stride = width * bytesPerPixel
  if (raw.length < (stride + 1) * height) throw new Error('The PNG image data is truncated')
  const previous = new Uint8Array(stride)
  const current = new Uint8Array(stride)
  const pixels = new Uint16Array(width * height)
  for (let row = 0; row < height; row++) {
    const start = row * (stride + 1)
    const filter = raw[start] as number
    for (let i = 0; i < stride; i++) {
      const x = raw[start + 1 + i] as number
      const a = i >= bytesPerPixel ? (current[i - bytesPerPixel] as number) : 0
      const b = previous[i] as number
      const c = i >= bytesPerPixel ? (previous[i - bytesPerPixel] as number) : 0
      let value: number
      switch (filter) {
        case 0:
          value = x
          break
        case 1:
          value = x + a
          break
        case 2:
          value = x + b
          break
        case 3:
          value = x + ((a + b) >> 1)
          break
        case 4:
          value = x + paeth(a, b, c)
          break
        default:
          throw new Error(`Unknown PNG filter ${filter} on row ${row}`)
      }
      current[i] = value & 0xff
    }
    const base = row * width
    if (bytesPerPixel === 2) {
      for (let col = 0; col < width; col++) {
        pixels[base + col] = ((current[2 * col] as number) << 8) | (current[2 * col + 1] as number)
      }
    } else {
      for (let col = 0; col < width; col++) pixels[base + col] = current[col] as number
    }
    previous.set(current)
  }
  return { width, height, bitDepth: bitDepth as 8 | 16, pixels }
}
