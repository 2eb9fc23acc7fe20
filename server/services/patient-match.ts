import type { DicomHeader } from '../images/dicom/dicom-header'
import type { PatientRecord } from '../db/patients'
import type { VisitRecord } from '../db/visits'
import type { PatientMismatch } from '../../shared/types/api'

/** Letters only, upper case, accents folded: "Müller-Lüdenscheidt" and "MULLER LUDENSCHEIDT" agree. */
function nameKey(text: string): string {
  return text
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z]/g, '')
    .toUpperCase()
}

/**
 * Compares a DICOM header with the visit's patient. Only attributes present in the file are
 * compared: an anonymised film with no patient module does not count as a mismatch.
 */
export function comparePatient(
  header: DicomHeader,
  patient: PatientRecord,
  visit: VisitRecord,
): PatientMismatch['differences'] {
  const differences: PatientMismatch['differences'] = []
  const name = header.patient.name
  if (name && (name.family || name.given)) {
    const sameFamily = nameKey(name.family) === nameKey(patient.familyName)
    const sameGiven = !name.given || nameKey(name.given) === nameKey(patient.givenName)
    if (!sameFamily || !sameGiven) {
      differences.push({
        field: 'name',
        inFile: [name.family, name.given].filter(Boolean).join(', '),
        onRecord: `${patient.familyName}, ${patient.givenName}`,
      })
    }
  }
  if (
    header.patient.id &&
    header.patient.id.trim().toUpperCase() !== patient.recordNumber.toUpperCase()
  ) {
    differences.push({ field: 'id', inFile: header.patient.id, onRecord: patient.recordNumber })
  }
  if (header.patient.birthDate && header.patient.birthDate !== patient.birthDate) {
    differences.push({
      field: 'birthDate',
      inFile: header.patient.birthDate,
      onRecord: patient.birthDate,
    })
  }
  if (header.studyDate && header.studyDate !== visit.visitDate) {
    differences.push({ field: 'studyDate', inFile: header.studyDate, onRecord: visit.visitDate })
  }
  return differences
}
