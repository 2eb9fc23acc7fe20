/** A4 portrait in PDF points (1/72 in), with the report's margins. */
export const PAGE = {
  width: 595.28,
  height: 841.89,
  left: 42,
  right: 42,
  top: 44,
  /** Room kept at the foot of each page for the footer. */
  bottom: 60,
} as const

export const CONTENT_WIDTH = PAGE.width - PAGE.left - PAGE.right
export const CONTENT_BOTTOM = PAGE.height - PAGE.bottom

export const COLOURS = {
  text: '#1e2226',
  muted: '#59626b',
  accent: '#2c7f78',
  rule: '#dde1e5',
  headFill: '#f1f4f5',
  stamp: '#b3261e',
  cautionFill: '#fbf6e9',
  cautionText: '#6b5314',
} as const

/** Moves to a new page when `height` pt does not fit below the cursor; answers the cursor. */
export function ensureSpace(doc: PDFKit.PDFDocument, height: number): number {
  if (doc.y + height > CONTENT_BOTTOM) {
    doc.addPage()
    doc.y = PAGE.top + 18
  }
  return doc.y
}
