/**
 * A citation as a clinician reads it. The engine's sources carry tags for the code ([V]
 * checked, [V-sec] through a secondary source, [M] from memory, [D] derived); on screen a
 * checked citation stands alone and the others say what they are in plain words.
 */
export function sourceWords(source: string): string {
  return source
    .replace(/\s*\[V(?:-sec)?\]/g, '')
    .replace(/\s*\[M\]/g, ' (from memory, verify)')
    .replace(/\s*\[D\]/g, ' (derived)')
    .replace(/\s*\[[^\]]*\bM for [^\]]*\]/g, ' (partly from memory, verify)')
    .replace(/\s*\[[^\]]*\]/g, '')
    .trim()
}
