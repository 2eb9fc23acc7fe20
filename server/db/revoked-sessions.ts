import type { Db } from './knex'
import { TABLES } from './tables'

export async function revokeSession(db: Db, sessionId: string, expiresAt: Date): Promise<void> {
  // Expired entries can go: their tokens are refused on expiry alone.
  await db(TABLES.revokedSessions).where('expires_at', '<', new Date()).delete()
  await db(TABLES.revokedSessions)
    .insert({ session_id: sessionId, expires_at: expiresAt })
    .onConflict('session_id')
    .ignore()
}
