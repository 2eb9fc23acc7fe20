import { createRequire } from 'node:module'
import { ImageError } from '../image-error'
import type { PixelEncoding } from './transfer-syntax'

type CompressedEncoding = Exclude<PixelEncoding, 'native-little-endian' | 'native-big-endian'>

/** One decompressed frame: samples as unsigned bit patterns, little-endian host order. */
export interface DecompressedFrame {
  width: number
  height: number
  components: number
  samples: Uint8Array | Uint16Array
}

type WasmFactory = (options: EmscriptenCodecOptions) => Promise<Record<string, unknown>>

// The codec packages are Emscripten CommonJS glue that finds its .wasm beside itself through
// __dirname, so they are required (not bundled) and instantiated once, on first use.
const require = createRequire(import.meta.url)
const quiet: EmscriptenCodecOptions = { print: () => {}, printErr: () => {} }

const WASM_CODECS: Record<Exclude<CompressedEncoding, 'jpeg-lossless'>, [string, string]> = {
  'jpeg-2000': ['@cornerstonejs/codec-openjpeg/decodewasmjs', 'J2KDecoder'],
  'jpeg-ls': ['@cornerstonejs/codec-charls/decodewasmjs', 'JpegLSDecoder'],
  'jpeg-baseline': ['@cornerstonejs/codec-libjpeg-turbo-8bit/decodewasmjs', 'JPEGDecoder'],
}

const loaded = new Map<string, Promise<new () => WasmFrameDecoder>>()

function wasmDecoderClass(encoding: keyof typeof WASM_CODECS): Promise<new () => WasmFrameDecoder> {
  const [modulePath, className] = WASM_CODECS[encoding]
  let pending = loaded.get(modulePath)
  if (!pending) {
    const factory = require(modulePath) as WasmFactory
    pending = factory({ ...quiet }).then(
      (module) => module[className] as new () => WasmFrameDecoder,
    )
    loaded.set(modulePath, pending)
  }
  return pending
}

function copySamples(bytes: Uint8Array, bitsPerSample: number): Uint8Array | Uint16Array {
  // The decoded buffer lives in the WebAssembly heap and is overwritten by the next decode.
  const copy = new Uint8Array(bytes)
  return bitsPerSample > 8 ? new Uint16Array(copy.buffer, 0, copy.length >> 1) : copy
}

async function decodeWithWasm(
  encoding: keyof typeof WASM_CODECS,
  codestream: Uint8Array,
): Promise<DecompressedFrame> {
  const Decoder = await wasmDecoderClass(encoding)
  const decoder = new Decoder()
  try {
    decoder.getEncodedBuffer(codestream.length).set(codestream)
    decoder.decode()
    const info = decoder.getFrameInfo()
    return {
      width: info.width,
      height: info.height,
      components: info.componentCount,
      samples: copySamples(decoder.getDecodedBuffer(), info.bitsPerSample),
    }
  } finally {
    decoder.delete()
  }
}

async function decodeJpegLossless(codestream: Uint8Array): Promise<DecompressedFrame> {
  const { Decoder } = await import('jpeg-lossless-decoder-js')
  const decoder = new Decoder()
  const output = decoder.decompress(codestream.buffer, codestream.byteOffset, codestream.length)
  const bytesPerSample = decoder.frame.precision > 8 ? 2 : 1
  const samples =
    bytesPerSample === 2
      ? new Uint16Array(output, 0, output.byteLength >> 1)
      : new Uint8Array(output)
  return { width: decoder.xDim, height: decoder.yDim, components: decoder.numComp, samples }
}

/** Decompresses one frame with the codec package for its transfer syntax. */
export async function decompressFrame(
  encoding: CompressedEncoding,
  codestream: Uint8Array,
): Promise<DecompressedFrame> {
  try {
    return encoding === 'jpeg-lossless'
      ? await decodeJpegLossless(codestream)
      : await decodeWithWasm(encoding, codestream)
  } catch (error) {
    if (error instanceof ImageError) throw error
    const reason = error instanceof Error ? error.message : String(error)
    throw new ImageError(
      'corrupt-dicom',
      `The compressed frame (${encoding}) cannot be decoded: ${reason}`,
    )
  }
}
