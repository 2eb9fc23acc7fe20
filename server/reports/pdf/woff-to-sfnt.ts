import { inflateSync } from 'node:zlib'

const WOFF_SIGNATURE = 0x774f4646 // 'wOFF'
const WOFF_HEADER_BYTES = 44
const WOFF_ENTRY_BYTES = 20
const SFNT_HEADER_BYTES = 12
const SFNT_RECORD_BYTES = 16

const padded = (length: number) => (length + 3) & ~3

/**
 * The plain OpenType (sfnt) font inside a WOFF 1.0 file (W3C, WOFF File Format 1.0, 2012: §3
 * header, §4 table directory, §5 tables compressed with zlib when compLength < origLength). The
 * tables are unpacked once with Node's zlib, so a font engine reading the result never inflates
 * again; every table keeps its checksum, and the sfnt search fields are recomputed
 * (OpenType spec, "Organization of an OpenType Font"). Written here: fontkit reads WOFF but
 * inflates a table on every access (in JavaScript), which made each report spend most of its
 * time there, and no maintained package does only this. Throws on anything that is not WOFF 1.0.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.length < WOFF_HEADER_BYTES || woff.readUInt32BE(0) !== WOFF_SIGNATURE)
    throw new Error('Not a WOFF 1.0 font')
  const flavor = woff.readUInt32BE(4)
  const numTables = woff.readUInt16BE(12)
  const tables: Array<{ tag: number; checksum: number; data: Buffer }> = []
  for (let i = 0; i < numTables; i++) {
    const entry = WOFF_HEADER_BYTES + i * WOFF_ENTRY_BYTES
    const tag = woff.readUInt32BE(entry)
    const offset = woff.readUInt32BE(entry + 4)
    const compLength = woff.readUInt32BE(entry + 8)
    const origLength = woff.readUInt32BE(entry + 12)
    const checksum = woff.readUInt32BE(entry + 16)
    const stored = woff.subarray(offset, offset + compLength)
    const data = compLength < origLength ? inflateSync(stored) : Buffer.from(stored)
    if (data.length !== origLength) throw new Error('A WOFF table does not unpack to its length')
    tables.push({ tag, checksum, data })
  }
  // Table records are sorted by tag in an sfnt.
  tables.sort((a, b) => a.tag - b.tag)
  let size = SFNT_HEADER_BYTES + numTables * SFNT_RECORD_BYTES
  for (const table of tables) size += padded(table.data.length)
  const sfnt = Buffer.alloc(size)
  const entrySelector = Math.floor(Math.log2(numTables))
  const searchRange = 2 ** entrySelector * 16
  sfnt.writeUInt32BE(flavor, 0)
  sfnt.writeUInt16BE(numTables, 4)
  sfnt.writeUInt16BE(searchRange, 6)
  sfnt.writeUInt16BE(entrySelector, 8)
  sfnt.writeUInt16BE(numTables * 16 - searchRange, 10)
  let offset = SFNT_HEADER_BYTES + numTables * SFNT_RECORD_BYTES
  tables.forEach((table, i) => {
    const record = SFNT_HEADER_BYTES + i * SFNT_RECORD_BYTES
    sfnt.writeUInt32BE(table.tag, record)
    sfnt.writeUInt32BE(table.checksum, record + 4)
    sfnt.writeUInt32BE(offset, record + 8)
    sfnt.writeUInt32BE(table.data.length, record + 12)
    table.data.copy(sfnt, offset)
    offset += padded(table.data.length)
  })
  return sfnt
}
