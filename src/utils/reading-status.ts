import type { ReadingStatus } from '@shared/types/domain'

export { READING_STATUS_LABELS } from '@shared/readings/reading-status'

/**
 * Tag tone of each status: waiting for a surgeon blue, back with the rater amber, signed green;
 * drafts and replaced readings stay grey.
 */
export const READING_STATUS_SEVERITY: Record<
  ReadingStatus,
  'secondary' | 'info' | 'warn' | 'success'
> = {
  draft: 'secondary',
  submitted: 'info',
  returned: 'warn',
  signed: 'success',
  superseded: 'secondary',
}
