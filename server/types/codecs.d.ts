// The image codecs ship Emscripten glue without declarations (and jpeg-lossless-decoder-js points
// its "types" at a file it does not publish). Only the decoder surface Endplate calls is declared;
// the WebAssembly codecs are loaded with require() (server/images/dicom/codecs.ts), so they are
// typed there through these global interfaces.
interface EmscriptenCodecOptions {
  print?: (text: string) => void
  printErr?: (text: string) => void
}

interface CodecFrameInfo {
  width: number
  height: number
  bitsPerSample: number
  componentCount: number
  isSigned?: boolean
}

interface WasmFrameDecoder {
  getEncodedBuffer(length: number): Uint8Array
  decode(): void
  getFrameInfo(): CodecFrameInfo
  getDecodedBuffer(): Uint8Array
  delete(): void
}

declare module 'jpeg-lossless-decoder-js' {
  export class Decoder {
    decompress(buffer: ArrayBufferLike, offset?: number, length?: number): ArrayBuffer
    numComp: number
    xDim: number
    yDim: number
    frame: { precision: number }
  }
}
