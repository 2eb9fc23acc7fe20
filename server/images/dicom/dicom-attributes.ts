import type { DataSet } from 'dicom-parser'

// Small readers over dicom-parser's DataSet that turn absent, empty and unparsable values into
// `undefined`, so the header code can state its defaults once.

export function readText(dataSet: DataSet, tag: string, index?: number): string | undefined {
  const value = dataSet.string(tag, index)?.trim()
  return value ? value : undefined
}

/** All values of a multi-valued decimal or integer string (DS, IS), skipping unparsable ones. */
export function readNumbers(dataSet: DataSet, tag: string): number[] {
  const raw = dataSet.string(tag)
  if (!raw) return []
  return raw
    .split('\\')
    .map((part) => Number.parseFloat(part.trim()))
    .filter((value) => Number.isFinite(value))
}

export function readNumber(dataSet: DataSet, tag: string): number | undefined {
  return readNumbers(dataSet, tag)[0]
}

export function readUint16(dataSet: DataSet, tag: string): number | undefined {
  if (!dataSet.elements[tag]) return undefined
  const value = dataSet.uint16(tag)
  return value === undefined || Number.isNaN(value) ? undefined : value
}

/** A DA value (YYYYMMDD) as an ISO date, or undefined when it is not a real calendar date. */
export function readDate(dataSet: DataSet, tag: string): string | undefined {
  const raw = readText(dataSet, tag)?.replace(/[.-]/g, '')
  const match = raw ? /^(\d{4})(\d{2})(\d{2})/.exec(raw) : null
  if (!match) return undefined
  const [, year, month, day] = match as unknown as [string, string, string, string]
  const date = new Date(Date.UTC(Number(year), Number(month) - 1, Number(day)))
  if (date.getUTCMonth() !== Number(month) - 1 || date.getUTCDate() !== Number(day)) {
    return undefined
  }
  return `${year}-${month}-${day}`
}
