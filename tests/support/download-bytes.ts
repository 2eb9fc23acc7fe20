import type { Response } from 'superagent'
import { unzipSync } from 'fflate'

/** supertest parser that keeps a download's body as raw bytes. */
export function binaryParser(
  res: Response,
  callback: (error: Error | null, body: Buffer) => void,
): void {
  const stream = res as unknown as NodeJS.ReadableStream
  const chunks: Buffer[] = []
  stream.on('data', (chunk: Buffer) => chunks.push(chunk))
  stream.on('end', () => callback(null, Buffer.concat(chunks)))
  stream.on('error', (error: Error) => callback(error, Buffer.alloc(0)))
}

/** Every byte of an XLSX (a zip of XML parts), unpacked, as one text to search. */
export function xlsxText(bytes: Buffer): string {
  const parts = unzipSync(new Uint8Array(bytes))
  return Object.entries(parts)
    .map(([name, content]) => `${name}\n${Buffer.from(content).toString('utf8')}`)
    .join('\n')
}
