import type { Db } from '../db/knex'
import { listReadingRecords, type ReadingListRecord } from '../db/reading-worklist'
import type { Page } from '../../shared/types/api'
import type { ReadingQuery, ReadingSummary } from '../../shared/types/readings'
import { actorIdentifies, audit, type Actor } from './audit'

function toIdentifiedSummary(record: ReadingListRecord): ReadingSummary {
  const { familyName, givenName, ...rest } = record
  return { ...rest, patientName: `${familyName}, ${givenName}` }
}

/** Built field by field, so that nothing identifying reaches a researcher by accident. */
function toDeidentifiedSummary(record: ReadingListRecord): ReadingSummary {
  return {
    id: record.id,
    imageId: record.imageId,
    template: record.template,
    options: record.options,
    status: record.status,
    version: record.version,
    raterId: record.raterId,
    raterName: record.raterName,
    patientId: record.patientId,
    studyCode: record.studyCode,
    patientName: null,
    recordNumber: null,
    visitId: record.visitId,
    visitKind: record.visitKind,
    visitDate: null,
    reviewerId: record.reviewerId,
    submittedAt: null,
    signedAt: null,
    signedByName: record.signedByName,
    returnedAt: null,
    returnedByName: record.returnedByName,
    returnComment: null,
    supersedesId: record.supersedesId,
    supersededById: record.supersededById,
    createdAt: null,
    updatedAt: null,
  }
}

/**
 * Readings for worklists and patient pages. Researchers see the patients of their studies only,
 * de-identified, in id order (any date order would betray the visit dates).
 */
export async function listReadings(
  db: Db,
  actor: Actor,
  query: ReadingQuery,
): Promise<Page<ReadingSummary>> {
  const identified = actorIdentifies(actor)
  const me = actor.user.id
  const page = await listReadingRecords(db, {
    statuses: query.status,
    raterId: query.rater === 'me' ? me : undefined,
    awaitingUserId: query.awaiting === 'me' ? me : undefined,
    signedById: query.signedBy === 'me' ? me : undefined,
    returnedById: query.returnedBy === 'me' ? me : undefined,
    patientId: query.patientId,
    researcherId: identified ? undefined : me,
    sort: identified ? (query.sort ?? 'updatedAt') : 'id',
    order: query.order ?? 'desc',
    offset: query.offset ?? 0,
    limit: query.limit ?? 20,
  })
  if (!identified) return { items: page.items.map(toDeidentifiedSummary), total: page.total }
  if (page.items.length > 0) {
    const codes = [...new Set(page.items.map((item) => item.studyCode))].join(', ')
    await audit(
      db,
      actor,
      'view',
      'reading-list',
      null,
      `Viewed ${page.items.length} of ${page.total} readings (patients ${codes})`,
    )
  }
  return { items: page.items.map(toIdentifiedSummary), total: page.total }
}
