import type { SubsidenceResult } from '../../types/measurement'
import { SOURCES } from '../../measurement/index'
import { row } from './row-format'
import type { ResultFlag, ResultRow, ResultSection } from './types'

/** Subsidence against the first post-op reading, as the server stored it with the draft. */
export function subsidenceSection(
  stored: Record<string, SubsidenceResult>,
  baselineId: number | null,
): ResultSection {
  const rows: ResultRow[] = []
  const flags: ResultFlag[] = []
  let source: string = SOURCES.subsidence
  for (const result of Object.values(stored)) {
    source = result.source
    for (const [name, segment] of Object.entries(result.segments)) {
      if (!segment) continue
      for (const part of ['anterior', 'posterior', 'mean'] as const) {
        rows.push(
          row(
            `${name}-subsidence-${part}`,
            `${name} height loss, ${part}`,
            segment.lossMm[part],
            null,
            'mm',
            result.source,
          ),
        )
      }
      if (segment.subsided) {
        flags.push({
          id: `${name}-subsided`,
          tone: 'warn',
          text: `${name}: disc height lost by ${result.thresholdMm} mm or more since the baseline.`,
          source: result.source,
        })
      }
    }
  }
  return {
    id: 'subsidence',
    title:
      baselineId === null
        ? 'Subsidence (saved results)'
        : `Subsidence against reading ${baselineId} (saved results)`,
    rows,
    flags: rows.length
      ? flags
      : [
          {
            id: 'subsidence-none',
            tone: 'info',
            text: 'No earlier post-op reading of these segments to compare with.',
            source,
          },
        ],
  }
}
