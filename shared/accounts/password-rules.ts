/**
 * Rules for a password set through an invitation or a reset link (server and form share them).
 * bcrypt reads at most 72 bytes of UTF-8 (Provos & Mazières 1999, the key schedule's limit), so a
 * longer password is refused rather than silently cut.
 */
export const PASSWORD_MIN_CHARACTERS = 12
export const PASSWORD_MAX_BYTES = 72

/** The part of an e-mail address before the @, lower-cased. */
function localPart(email: string): string {
  return (email.split('@')[0] ?? '').trim().toLowerCase()
}

/** Null when the password may be used; otherwise the rule it breaks, in words. */
export function passwordProblem(password: string, email: string): string | null {
  // Characters as a reader counts them (code points), not UTF-16 units.
  if ([...password].length < PASSWORD_MIN_CHARACTERS)
    return `Use at least ${PASSWORD_MIN_CHARACTERS} characters.`
  if (new TextEncoder().encode(password).length > PASSWORD_MAX_BYTES) {
    return `Use at most ${PASSWORD_MAX_BYTES} bytes (about ${PASSWORD_MAX_BYTES} plain letters; accented letters and symbols count 2–4 each).`
  }
  const name = localPart(email)
  if (name.length >= 3 && password.toLowerCase().includes(name))
    return 'Do not use the name part of your e-mail address in the password.'
  return null
}
