// The XLSX writer against a download that stops reading and then goes away: exceljs buffers
// unzipped rows without asking its producer to wait, so the writer must look at the download.
import { Writable } from 'node:stream'
import { setTimeout as sleep } from 'node:timers/promises'
import { describe, expect, it } from 'vitest'
import { writeXlsx } from '../../../../server/exports/write-table'
import type { Cell } from '../../../../server/exports/export-columns'

const ROWS = 20_000

/** Rows as a generator that counts how many the writer has taken. */
function countedRows(taken: { count: number }): Generator<Cell[]> {
  return (function* rows() {
    for (let index = 0; index < ROWS; index += 1) {
      taken.count += 1
      // Numbers that do not repeat, so the zip cannot shrink them to nothing.
      yield [index, `EP-${index}`, Math.sqrt(index), index * 0.137, index % 7 === 0 ? null : 1]
    }
  })()
}

/** A download that takes its first `bytes` and then stops reading (a stalled client). */
function stallingDownload(bytes: number): Writable & { received: number } {
  const sink = new Writable({
    highWaterMark: 16 * 1024,
    write(chunk: Buffer, _encoding, done) {
      sink.received += chunk.length
      if (sink.received < bytes) done()
    },
  }) as Writable & { received: number }
  sink.received = 0
  return sink
}

describe('writeXlsx', () => {
  it('stops taking rows while the download does not read, and fails when it closes', async () => {
    const taken = { count: 0 }
    const download = stallingDownload(64 * 1024)
    const writing = writeXlsx(
      [{ name: 'Measurements', headers: ['a', 'b', 'c', 'd', 'e'], rows: countedRows(taken) }],
      download,
    )
    writing.catch(() => {})
    // Time enough for an unthrottled writer to take every row (it needs well under a second).
    await sleep(1500)
    expect(download.received).toBeGreaterThan(0)
    expect(taken.count).toBeLessThan(ROWS / 2)
    download.destroy()
    await expect(writing).rejects.toThrow(/closed before the end/)
    expect(taken.count).toBeLessThan(ROWS / 2)
  })

  it('writes every row to a download that reads', async () => {
    const taken = { count: 0 }
    const chunks: Buffer[] = []
    const download = new Writable({
      write(chunk: Buffer, _encoding, done) {
        chunks.push(chunk)
        done()
      },
    })
    await writeXlsx(
      [{ name: 'Measurements', headers: ['a', 'b', 'c', 'd', 'e'], rows: countedRows(taken) }],
      download,
    )
    expect(taken.count).toBe(ROWS)
    // A ZIP file starts with a local file header, "PK\x03\x04" (APPNOTE.TXT, section 4.3.7).
    expect(Buffer.concat(chunks).subarray(0, 4).toString('latin1')).toBe('PK\u0003\u0004')
  })
})
