import type { IncomingMessage, ServerResponse } from 'node:http'

const strictUtf8 = new TextDecoder('utf-8', { fatal: true })

/**
 * body-parser's `verify` hook: refuses a JSON body whose bytes are not UTF-8 (RFC 8259 §8.1),
 * which body-parser would otherwise decode with U+FFFD in place of each bad byte, storing text
 * the client never sent.
 */
export function refuseInvalidUtf8(
  _req: IncomingMessage,
  _res: ServerResponse,
  bytes: Buffer,
): void {
  strictUtf8.decode(bytes)
}
