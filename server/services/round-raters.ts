import type { Db } from '../db/knex'
import { listActiveUsersWithRole } from '../db/users'
import type { Page } from '../../shared/types/api'
import type { RoundRaterCandidate } from '../../shared/types/round-raters'

/**
 * Active fellows and surgeons, the roles that read films: the people a round's manager picks
 * raters from (a surgeon cannot list the team's accounts otherwise).
 */
export async function listRoundRaterCandidates(db: Db): Promise<Page<RoundRaterCandidate>> {
  const [fellows, surgeons] = await Promise.all([
    listActiveUsersWithRole(db, 'fellow'),
    listActiveUsersWithRole(db, 'surgeon'),
  ])
  const items = [...fellows, ...surgeons].map((user) => ({
    id: user.id,
    displayName: user.displayName,
    role: user.role as RoundRaterCandidate['role'],
  }))
  return { items, total: items.length }
}
