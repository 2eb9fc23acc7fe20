/** The cautions every report and printed page carries, word for word. */
export const REPORT_CAUTIONS: readonly string[] = [
  'Decision support only: these measurements do not make a diagnosis or a treatment decision.',
  'Verify every landmark and the calibration on the film before relying on a value.',
  'Defer to local protocols and licensed clinical practice.',
]

/**
 * The stamp of a reading that is not the signed record, or null for a signed one. A superseded
 * reading was signed, but a signed amendment has replaced it.
 */
export function unsignedStamp(status: string): string | null {
  if (status === 'signed') return null
  if (status === 'draft') return 'DRAFT · NOT SIGNED'
  if (status === 'returned') return 'RETURNED FOR CHANGES · NOT SIGNED'
  if (status === 'superseded') return 'REPLACED BY AN AMENDMENT'
  return 'NOT SIGNED'
}
