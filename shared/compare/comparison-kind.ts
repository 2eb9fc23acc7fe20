import type { ImageView, VisitKind } from '../types/domain'
import type { ComparisonKind } from '../types/compare'

/** Lateral films taken in the neutral posture, the ones compared across visits. */
export const STATIC_LATERAL_VIEWS: readonly ImageView[] = [
  'lateral-neutral',
  'lateral-standing-long',
]

/** Which usual pairing two films make; `before` is the earlier (or the flexion) film. */
export function comparisonKindOf(
  before: { visitKind: VisitKind; view: ImageView },
  after: { visitKind: VisitKind; view: ImageView },
  sameVisit: boolean,
): ComparisonKind {
  if (sameVisit && before.view === 'lateral-flexion' && after.view === 'lateral-extension')
    return 'flexion-extension'
  if (before.visitKind === 'pre-op' && after.visitKind !== 'pre-op') return 'pre-op-post-op'
  if (before.visitKind !== 'pre-op' && after.visitKind === 'follow-up') return 'follow-ups'
  return 'other'
}

export const COMPARISON_KIND_LABELS: Record<ComparisonKind, string> = {
  'pre-op-post-op': 'Before and after surgery',
  'follow-ups': 'Over follow-up',
  'flexion-extension': 'Flexion against extension',
  other: 'Two films',
}
