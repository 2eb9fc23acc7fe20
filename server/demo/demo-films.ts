/**
 * Which synthetic phantom film goes on which demo visit. Films are rendered by the project's own
 * phantom generator with the demo patient's invented header data, so every demo film has an
 * exact ground truth.
 */
import type { PhantomParamsInput } from '../phantom/phantom-params'
import { phantomPreset } from '../phantom/presets'
import type { ReadingTemplate } from '../../shared/types/domain'
import type { TemplateOptions } from '../../shared/readings/templates'
import type { DemoPatient, DemoVisit } from './demo-data'

export interface DemoFilm {
  patientKey: string
  /** Index of the visit in the demo patient's visit list. */
  visitIndex: number
  preset: string
  seed: number
  /** The demo reading made on this film by a fellow, if any. */
  reading?: { template: ReadingTemplate; options: TemplateOptions; submit: boolean }
}

const HYBRID_CONSTRUCT: TemplateOptions = {
  construct: [
    { segment: 'L3-L4', implant: 'disc-replacement' },
    { segment: 'L4-L5', implant: 'disc-replacement' },
    { segment: 'L5-S1', implant: 'cage' },
  ],
}

export const DEMO_FILMS: DemoFilm[] = [
  {
    patientKey: 'grade-1',
    visitIndex: 0,
    preset: 'meyerding-1',
    seed: 11,
    reading: { template: 'slip-grade', options: { segment: 'L5-S1' }, submit: true },
  },
  {
    patientKey: 'grade-2',
    visitIndex: 0,
    preset: 'meyerding-2',
    seed: 12,
    reading: { template: 'slip-grade', options: { segment: 'L5-S1' }, submit: true },
  },
  {
    patientKey: 'grade-3',
    visitIndex: 0,
    preset: 'meyerding-3',
    seed: 13,
    reading: { template: 'slip-grade', options: { segment: 'L5-S1' }, submit: false },
  },
  { patientKey: 'grade-4', visitIndex: 0, preset: 'meyerding-4', seed: 14 },
  { patientKey: 'grade-5', visitIndex: 0, preset: 'meyerding-5', seed: 15 },
  {
    patientKey: 'retrolisthesis',
    visitIndex: 0,
    preset: 'retrolisthesis-l2-l3',
    seed: 16,
    reading: { template: 'slip-grade', options: { segment: 'L2-L3' }, submit: true },
  },
  {
    patientKey: 'hybrid',
    visitIndex: 0,
    preset: 'hybrid-pre-op',
    seed: 21,
    reading: { template: 'lumbar-alignment', options: {}, submit: true },
  },
  {
    patientKey: 'hybrid',
    visitIndex: 1,
    preset: 'hybrid-post-op',
    seed: 22,
    reading: { template: 'construct-check', options: HYBRID_CONSTRUCT, submit: true },
  },
  {
    patientKey: 'hybrid',
    visitIndex: 1,
    preset: 'hybrid-post-op-ap',
    seed: 24,
    reading: {
      template: 'implant-centring',
      options: { discReplacements: ['L3-L4', 'L4-L5'] },
      submit: true,
    },
  },
  {
    patientKey: 'hybrid',
    visitIndex: 2,
    preset: 'hybrid-one-year',
    seed: 23,
    reading: { template: 'construct-check', options: HYBRID_CONSTRUCT, submit: false },
  },
  {
    patientKey: 'dynamic',
    visitIndex: 0,
    preset: 'motion-flexion',
    seed: 31,
    reading: { template: 'motion-pair', options: { segment: 'L4-L5' }, submit: true },
  },
  { patientKey: 'dynamic', visitIndex: 0, preset: 'motion-extension', seed: 32 },
  {
    patientKey: 'normal-1',
    visitIndex: 0,
    preset: 'normal',
    seed: 41,
    reading: { template: 'lumbar-alignment', options: {}, submit: false },
  },
  // Last, so the fellows' alternation over the films above stays as it was.
  {
    patientKey: 'hybrid',
    visitIndex: 2,
    preset: 'hybrid-one-year-ap',
    seed: 25,
    reading: {
      template: 'implant-centring',
      options: { discReplacements: ['L3-L4', 'L4-L5'] },
      submit: false,
    },
  },
]

/** The phantom parameters of a demo film, with the demo patient's invented header data. */
export function demoFilmParams(
  film: DemoFilm,
  patient: DemoPatient,
  visit: DemoVisit,
): PhantomParamsInput {
  const dicomDate = (iso: string) => iso.replace(/-/g, '')
  return {
    ...phantomPreset(film.preset),
    seed: film.seed,
    patient: {
      name: `${patient.familyName.toUpperCase()}^${patient.givenName.toUpperCase()}`,
      id: patient.recordNumber,
      birthDate: dicomDate(patient.birthDate),
      sex: patient.sex === 'female' ? 'F' : patient.sex === 'male' ? 'M' : 'O',
    },
    studyDate: dicomDate(visit.date),
  }
}
