import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs'

interface Placed {
  text: string
  x: number
  y: number
  end: number
}

/**
 * The text of each page of a PDF as Mozilla's pdf.js reads it (an independent parser: what it
 * finds, a reader's viewer finds too). Pieces are put back into lines by their position: one line
 * per baseline, left to right, with a space where pieces stand apart.
 */
export async function pdfPageTexts(pdf: Buffer): Promise<string[]> {
  const document = await getDocument({
    data: new Uint8Array(pdf),
    disableFontFace: true,
    isEvalSupported: false,
    verbosity: 0,
  }).promise
  const pages: string[] = []
  for (let number = 1; number <= document.numPages; number++) {
    const page = await document.getPage(number)
    const content = await page.getTextContent()
    const placed: Placed[] = []
    for (const item of content.items) {
      if (!('str' in item) || item.str === '') continue
      const [, , , , x, y] = item.transform as number[]
      placed.push({
        text: item.str,
        x: x as number,
        y: y as number,
        end: (x as number) + item.width,
      })
    }
    const lines: Placed[][] = []
    for (const piece of placed.sort((a, b) => b.y - a.y || a.x - b.x)) {
      const line = lines.find((candidate) => Math.abs((candidate[0] as Placed).y - piece.y) < 1.5)
      if (line) line.push(piece)
      else lines.push([piece])
    }
    pages.push(
      lines
        .map((line) => {
          let text = ''
          let end = -Infinity
          for (const piece of line.sort((a, b) => a.x - b.x)) {
            text += (piece.x - end > 1 && text ? ' ' : '') + piece.text
            end = piece.end
          }
          return text
        })
        .join('\n'),
    )
  }
  await document.destroy()
  return pages
}
