import type { ReadingStatus } from '@shared/types/domain'

export { READING_STATUS_LABELS } from '@shared/readings/reading-status'

/** Tag tone of each status: work waiting is blue, work back with the rater amber, done green. */
export const READING_STATUS_SEVERITY: Record<
  ReadingStatus,
  'secondary' | 'info' | 'warn' | 'success' | 'contrast'
> = {
  draft: 'secondary',
  submitted: 'info',
  returned: 'warn',
  signed: 'success',
  superseded: 'contrast',
}
