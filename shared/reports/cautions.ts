/** The cautions every report and printed page carries, word for word. */
export const REPORT_CAUTIONS: readonly string[] = [
  'Decision support only: these measurements do not make a diagnosis or a treatment decision.',
  'Verify every landmark and the calibration on the film before relying on a value.',
  'Defer to local protocols and licensed clinical practice.',
]

/** The stamp of a reading that is not signed, or null for a signed one. */
export function unsignedStamp(status: string): string | null {
  if (status === 'signed') return null
  if (status === 'draft') return 'DRAFT · NOT SIGNED'
  return 'NOT SIGNED'
}
