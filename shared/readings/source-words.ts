/**
 * A citation as a clinician (or a reader of an export or a report) reads it: the one place the
 * engine's evidence tags become words. The tags are for the code: [V] checked in the published
 * source and [V-sec] checked through a secondary source (the citation then stands alone), [M]
 * from memory, [D] derived geometry, and mixed ones like "[V for the paper; M for the
 * thresholds]". Every screen, report, export and setting shows sources through this function.
 */
export function sourceWords(source: string): string {
  return source
    .replace(/\s*\[V(?:-sec)?\]/g, '')
    .replace(/\s*\[M\]/g, ' (from memory, verify)')
    .replace(/\s*\[D\]/g, ' (derived)')
    .replace(/\s*\[V(?:-sec)? for [^;\]]*; M for (?:the )?([^\]]*)\]/g, ' ($1 from memory, verify)')
    .replace(/\s*\[(?:V|M|D|V-sec)\b[^\]]*\]/g, '')
    .trim()
}
