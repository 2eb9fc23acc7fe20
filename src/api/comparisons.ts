import type { Comparison } from '@shared/types/compare'
import { http, queryString } from './http'

/** Two films of one patient with their current readings (or those named) and their differences. */
export const getComparison = (imageIds: [number, number], readingIds: number[] = []) =>
  http.get<Comparison>(
    `/comparisons${queryString({
      images: imageIds.join(','),
      readings: readingIds.length ? readingIds.join(',') : undefined,
    })}`,
  )
