import { z } from 'zod'

/** A calendar date written YYYY-MM-DD that really exists (no 2023-02-30). */
export const isoDate = z
  .string({ error: 'must be a date written YYYY-MM-DD' })
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date written YYYY-MM-DD')
  .refine((text) => {
    const date = new Date(`${text}T00:00:00Z`)
    return !Number.isNaN(date.getTime()) && date.toISOString().slice(0, 10) === text
  }, 'is not a real calendar date')

/**
 * Not after today anywhere on Earth: the server runs in UTC while a clinic east of it is already
 * in tomorrow, so one day of slack keeps a same-day visit valid in the local morning.
 */
export const notInFuture = (text: string) =>
  text <= new Date(Date.now() + 86_400_000).toISOString().slice(0, 10)

/**
 * A row id in a path: decimal digits only, no sign, no leading zero, no spaces. Number() would
 * read "0x10" as 16, "+1" and " 1" as 1 and "1e1" as 10 (ECMA-262 StringToNumber), each of
 * them another record; only the canonical spelling of an id reaches a query. Ids are MariaDB
 * INT UNSIGNED auto-increments, so at most 4294967295.
 */
export const rowId = z
  .string({ error: 'id must be a number' })
  .regex(/^[1-9][0-9]{0,9}$/, 'id must be a positive whole number written in decimal digits')
  .transform(Number)
  .refine((id) => id <= 4_294_967_295, 'id is larger than any record id')

export const idParam = z.object({ id: rowId })

/**
 * Largest distance of a landmark or calibration point from the film's origin, px. The largest
 * radiographs (stitched long-length films) are some tens of thousands of pixels across (from
 * memory); a point far beyond that is a client's mistake and would overflow the geometry.
 */
export const MAX_COORDINATE_PX = 1_000_000

/** One image coordinate in pixels: finite and within ±MAX_COORDINATE_PX. */
export const pixelCoordinate = z
  .number({ error: 'must be a number of pixels' })
  .finite('must be a finite number')
  .min(-MAX_COORDINATE_PX, `must be within ±${MAX_COORDINATE_PX} px`)
  .max(MAX_COORDINATE_PX, `must be within ±${MAX_COORDINATE_PX} px`)

export const version = z
  .number({ error: 'must be the version number you last read' })
  .int()
  .positive()

export const trimmed = (max: number) =>
  z.string().trim().max(max, `must be at most ${max} characters`)

/** Paging of a list, as the query string carries it. */
export const pagingQuery = {
  offset: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(0, 'cannot be negative')
    .optional(),
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int()
    .min(1, 'must be at least 1')
    .max(100, 'must be at most 100')
    .optional(),
}
