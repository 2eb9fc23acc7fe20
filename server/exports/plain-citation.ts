/**
 * A source as a reader of an export sees it: the evidence tags kept in the code ([V] checked,
 * [V-sec] through a secondary source, [M] from memory, [D] derived) become plain words.
 */
export function plainCitation(source: string): string {
  return source
    .replace(/\s*\[V-sec\]/g, ' (through a secondary source)')
    .replace(/\s*\[M\]/g, ' (from memory, verify)')
    .replace(/\s*\[D\]/g, ' (derived)')
    .replace(/\s*\[V\]/g, '')
    .replace(/\s*\[V for the paper; M for the thresholds\]/g, ' (thresholds from memory, verify)')
    .trim()
}
