/**
 * Three-valued "or" over flags that may be unknown (null): true if any is true, null if none is
 * true but one is unknown, else false. A missing input must never read as "not flagged".
 */
export function anyFlagged(flags: readonly (boolean | null)[]): boolean | null {
  if (flags.some((flag) => flag === true)) return true
  if (flags.some((flag) => flag === null)) return null
  return false
}
