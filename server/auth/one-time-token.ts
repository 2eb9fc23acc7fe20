import { createHash, randomBytes } from 'node:crypto'

/**
 * Single-use link tokens (invitations, password resets): 256 random bits, of which only the
 * SHA-256 hash is stored, so a copy of the database opens no account.
 */
export function newOneTimeToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashOneTimeToken(token) }
}

export function hashOneTimeToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex')
}
