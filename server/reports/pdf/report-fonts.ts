import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import { create, type Font } from 'fontkit'
import { woffToSfnt } from './woff-to-sfnt'

/**
 * Inter from the app's own @fontsource WOFF files, unpacked in memory to plain OpenType once per
 * process (woffToSfnt; nothing comes from the network) and parsed once by fontkit, pdfkit's font
 * engine; every document gets the same parsed fonts (pdfkit takes a fontkit font as well as a
 * file) and embeds only the glyphs it uses. @fontsource cuts Inter into subsets by
 * script (latin, latin-ext, greek, cyrillic, vietnamese) and pdfkit has no font fallback, so text
 * is split into runs, each set in the subset that holds its characters. Written here because no
 * maintained library does per-character font fallback for pdfkit.
 */

export type FontWeight = 400 | 600

const require = createRequire(import.meta.url)
const FONT_DIR = join(dirname(require.resolve('@fontsource/inter/package.json')), 'files')
const RANGES = require('@fontsource/inter/unicode.json') as Record<string, string>

/** Subsets in the order they are tried: the common Latin one first. */
const SUBSETS = [
  'latin',
  'latin-ext',
  'vietnamese',
  'greek',
  'greek-ext',
  'cyrillic',
  'cyrillic-ext',
]

/** Characters no subset holds, written the way a reader expects on paper. */
const PLAIN_FALLBACK: Record<string, string> = {
  '≤': 'up to',
  '≥': 'at least',
  '→': 'to',
  '√': 'sqrt',
  '₁': '1',
  '₂': '2',
  Δ: 'delta ',
}

interface Subset {
  name: string
  ranges: Array<[number, number]>
}

function parseRanges(text: string): Array<[number, number]> {
  return text.split(',').map((part) => {
    const [from, to] = part.trim().replace(/^U\+/i, '').split('-')
    const start = parseInt(from as string, 16)
    return [start, to === undefined ? start : parseInt(to, 16)]
  })
}

const SUBSET_RANGES: Subset[] = SUBSETS.filter((name) => RANGES[name]).map((name) => ({
  name,
  ranges: parseRanges(RANGES[name] as string),
}))

/** The pdfkit font name of a subset and weight. */
export const fontName = (subset: string, weight: FontWeight) => `inter-${subset}-${weight}`

const fontCache = new Map<string, Font>()
function fontOf(subset: string, weight: FontWeight): Font {
  const key = fontName(subset, weight)
  let font = fontCache.get(key)
  if (!font) {
    const woff = readFileSync(join(FONT_DIR, `inter-${subset}-${weight}-normal.woff`))
    font = create(woffToSfnt(woff))
    fontCache.set(key, font)
  }
  return font
}

/**
 * Registers every subset and weight on a document. Files are read and parsed once per process;
 * pdfkit embeds only the glyphs a document uses.
 */
export function registerReportFonts(doc: PDFKit.PDFDocument): void {
  for (const { name } of SUBSET_RANGES) {
    for (const weight of [400, 600] as const) {
      // pdfkit's types name files and buffers; at run time it also takes a fontkit font.
      doc.registerFont(fontName(name, weight), fontOf(name, weight) as unknown as Buffer)
    }
  }
}

function subsetOf(codePoint: number): string | null {
  for (const subset of SUBSET_RANGES)
    if (subset.ranges.some(([from, to]) => codePoint >= from && codePoint <= to)) return subset.name
  return null
}

export interface TextRun {
  font: string
  text: string
}

/**
 * Splits text into runs of one Inter subset each. A character no subset holds is written with
 * its plain fallback in words (≤ as "up to"), or "?" when it has none.
 */
export function textRuns(text: string, weight: FontWeight): TextRun[] {
  const runs: TextRun[] = []
  for (const character of text) {
    let written = character
    let subset = subsetOf(character.codePointAt(0) as number)
    if (subset === null) {
      written = PLAIN_FALLBACK[character] ?? '?'
      subset = 'latin'
    }
    const font = fontName(subset, weight)
    const last = runs[runs.length - 1]
    if (last && last.font === font) last.text += written
    else runs.push({ font, text: written })
  }
  return runs
}

/** The text as the fonts can write it, in the Latin subset's metrics (for measuring). */
export function writableText(text: string): string {
  return textRuns(text, 400)
    .map((run) => run.text)
    .join('')
}
