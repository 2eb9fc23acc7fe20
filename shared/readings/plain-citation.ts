/** Plain words for the evidence tags inside a source's brackets; null drops the tag. */
function plainTag(tag: string): string | null {
  const trimmed = tag.trim()
  if (trimmed === 'V') return null
  if (trimmed === 'V-sec') return 'via a secondary source'
  if (trimmed === 'M') return 'from memory, verify'
  if (trimmed === 'D') return 'derived'
  const partlyChecked = /^V for (.+)$/.exec(trimmed)
  if (partlyChecked) return null
  const partlyRemembered = /^M for (.+)$/.exec(trimmed)
  if (partlyRemembered) return `${partlyRemembered[1]} from memory, verify`
  return trimmed
}

/**
 * A source as a clinician reads it: the citation itself, with the evidence tags of the code
 * ("[V]" checked, "[V-sec]" through a secondary source, "[M]" from memory, "[D]" derived) turned
 * into plain words in parentheses, or dropped where the citation speaks for itself.
 */
export function plainCitation(source: string): string {
  return source
    .replace(/\s*\[([^\]]+)\]/g, (_match, tags: string) => {
      const words = tags
        .split(';')
        .map(plainTag)
        .filter((word): word is string => word !== null && word !== '')
      return words.length ? ` (${words.join('; ')})` : ''
    })
    .trim()
}
