import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { create } from 'fontkit'
import { woffToSfnt } from '../../../../server/reports/pdf/woff-to-sfnt'

const require = createRequire(import.meta.url)
const files = join(dirname(require.resolve('@fontsource/inter/package.json')), 'files')

interface Inspected {
  numGlyphs: number
  postscriptName: string
  layout(text: string): { glyphs: Array<{ id: number; advanceWidth: number }> }
}

// fontkit reads both WOFF (W3C WOFF 1.0) and plain OpenType: the unpacked font must be the same
// font to it, glyph for glyph.
describe('woffToSfnt', () => {
  it.each(['inter-latin-400-normal.woff', 'inter-latin-ext-600-normal.woff'])(
    'unpacks %s into the same font',
    (name) => {
      const woff = readFileSync(join(files, name))
      const sfnt = woffToSfnt(woff)
      expect(sfnt.readUInt32BE(0)).toBe(0x00010000)
      const original = create(woff) as unknown as Inspected
      const unpacked = create(sfnt) as unknown as Inspected
      expect(unpacked.numGlyphs).toBe(original.numGlyphs)
      expect(unpacked.postscriptName).toBe(original.postscriptName)
      const text = 'Endplate L4-L5 ± 27.0° −9.0 % Dvořák'
      const glyphs = (font: Inspected) =>
        font.layout(text).glyphs.map((glyph) => [glyph.id, glyph.advanceWidth])
      expect(glyphs(unpacked)).toEqual(glyphs(original))
    },
  )

  it('refuses a file that is not WOFF 1.0', () => {
    expect(() => woffToSfnt(Buffer.from('not a font at all, just text here........'))).toThrow(
      /Not a WOFF 1.0 font/,
    )
  })
})
