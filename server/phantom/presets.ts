import { flexionExtensionPair } from './motion-pair'
import type { PhantomParamsInput, SegmentShape } from './phantom-params'

/** A slip at L5-S1 with the segment's disc and angle adjusted as such slips look. */
function l5s1Slip(slipPercent: number, shape: Partial<SegmentShape>): PhantomParamsInput {
  return { segments: { 'L5-S1': { slipPercent, ...shape } } }
}

function patient(
  code: string,
  name: string,
  birthDate: string,
  sex: 'M' | 'F',
): PhantomParamsInput {
  return { patient: { name, id: code, birthDate, sex } }
}

const HYBRID_PATIENT = patient('PH-0301', 'PHANTOM^HYBRID', '19680412', 'F')
const HYBRID_IMPLANTS: PhantomParamsInput['implants'] = [
  { kind: 'cage', segment: 'L5-S1', positionPercent: 48, footprintPercent: 62 },
  { kind: 'disc-replacement', segment: 'L4-L5', positionPercent: 46 },
  { kind: 'disc-replacement', segment: 'L3-L4', positionPercent: 52 },
]

/**
 * The hybrid construct on the post-op AP film: the L3-L4 disc replacement close to the midline,
 * the L4-L5 one 3.8 mm toward the image's right (the patient's left) and tilted, both invented;
 * the film turned 2° and the patient a little rotated.
 */
const HYBRID_AP_IMPLANTS: PhantomParamsInput['implants'] = [
  { kind: 'cage', segment: 'L5-S1', positionPercent: 48, footprintPercent: 62 },
  {
    kind: 'disc-replacement',
    segment: 'L4-L5',
    positionPercent: 46,
    lateralOffsetMm: 3.8,
    coronalTiltDeg: 3,
  },
  {
    kind: 'disc-replacement',
    segment: 'L3-L4',
    positionPercent: 52,
    lateralOffsetMm: -1.2,
    coronalTiltDeg: 1,
  },
]

/** A portrait AP film: the frontal spine and pelvis are taller than they are wide. */
const AP_FILM: PhantomParamsInput = {
  view: 'ap',
  seriesDescription: 'LUMBAR SPINE AP',
  widthPx: 2500,
  heightPx: 3000,
}

const MOTION = flexionExtensionPair(
  {
    ...patient('PH-0401', 'PHANTOM^MOTION', '19750923', 'M'),
    segments: { 'L4-L5': { slipPercent: 9 } },
    studyDate: '20260310',
  },
  { segment: 'L4-L5', angularRangeDeg: 14, translationPercent: 12 },
)

/**
 * The demo's films (product design, demo scenario). Slips sit in the middle of each Meyerding
 * band (reference §3) so a few pixels of placement error cannot change the grade.
 */
export const PHANTOM_PRESETS: Record<string, PhantomParamsInput> = {
  normal: { ...patient('PH-0001', 'PHANTOM^NORMAL', '19820105', 'F') },
  'meyerding-1': {
    ...patient('PH-0101', 'PHANTOM^GRADE ONE', '19590617', 'M'),
    ...l5s1Slip(14, { segmentalAngleDeg: 16, posteriorDiscHeightMm: 5 }),
    facing: 'left',
  },
  'meyerding-2': {
    ...patient('PH-0102', 'PHANTOM^GRADE TWO', '19710228', 'F'),
    ...l5s1Slip(38, { segmentalAngleDeg: 14, posteriorDiscHeightMm: 4.5 }),
  },
  'meyerding-3': {
    ...patient('PH-0103', 'PHANTOM^GRADE THREE', '19940811', 'F'),
    ...l5s1Slip(62, { segmentalAngleDeg: 11, posteriorDiscHeightMm: 4 }),
    sacralSlopeDeg: 46,
    facing: 'left',
  },
  'meyerding-4': {
    ...patient('PH-0104', 'PHANTOM^GRADE FOUR', '20010330', 'M'),
    ...l5s1Slip(87, { segmentalAngleDeg: 9, posteriorDiscHeightMm: 3.5 }),
    sacralSlopeDeg: 50,
    pelvicTiltDeg: 22,
  },
  'meyerding-5': {
    ...patient('PH-0105', 'PHANTOM^SPONDYLOPTOSIS', '20040719', 'F'),
    ...l5s1Slip(112, { segmentalAngleDeg: 8, posteriorDiscHeightMm: 3 }),
    sacralSlopeDeg: 54,
    pelvicTiltDeg: 26,
  },
  'retrolisthesis-l2-l3': {
    ...patient('PH-0201', 'PHANTOM^RETRO', '19520902', 'M'),
    segments: { 'L2-L3': { slipPercent: -14, segmentalAngleDeg: 3, posteriorDiscHeightMm: 4 } },
    facing: 'left',
  },
  'hybrid-pre-op': {
    ...HYBRID_PATIENT,
    studyDate: '20250114',
    segments: {
      'L3-L4': { segmentalAngleDeg: 8, posteriorDiscHeightMm: 4.5 },
      'L4-L5': { segmentalAngleDeg: 13, posteriorDiscHeightMm: 4 },
      'L5-S1': { slipPercent: 16, segmentalAngleDeg: 13, posteriorDiscHeightMm: 3.5 },
    },
  },
  'hybrid-post-op': {
    ...HYBRID_PATIENT,
    studyDate: '20250303',
    segments: {
      'L3-L4': { segmentalAngleDeg: 11, posteriorDiscHeightMm: 7 },
      'L4-L5': { segmentalAngleDeg: 18, posteriorDiscHeightMm: 7.5 },
      'L5-S1': { slipPercent: 6, segmentalAngleDeg: 21, posteriorDiscHeightMm: 8 },
    },
    implants: HYBRID_IMPLANTS,
  },
  'hybrid-one-year': {
    ...HYBRID_PATIENT,
    studyDate: '20260305',
    // A year on the cage has settled by about 1.5 mm; the disc replacements keep their height.
    segments: {
      'L3-L4': { segmentalAngleDeg: 11, posteriorDiscHeightMm: 6.8 },
      'L4-L5': { segmentalAngleDeg: 17, posteriorDiscHeightMm: 7.3 },
      'L5-S1': { slipPercent: 6, segmentalAngleDeg: 20, posteriorDiscHeightMm: 6.5 },
    },
    implants: HYBRID_IMPLANTS,
  },
  'hybrid-post-op-ap': {
    ...HYBRID_PATIENT,
    ...AP_FILM,
    studyDate: '20250303',
    segments: {
      'L3-L4': { segmentalAngleDeg: 11, posteriorDiscHeightMm: 7 },
      'L4-L5': { segmentalAngleDeg: 18, posteriorDiscHeightMm: 7.5 },
      'L5-S1': { slipPercent: 6, segmentalAngleDeg: 21, posteriorDiscHeightMm: 8 },
    },
    frontal: {
      rotationDeg: 2,
      spinousOffsetPercent: 6,
      coronalAngleDeg: { 'L3-L4': 1.5, 'L4-L5': -2 },
    },
    implants: HYBRID_AP_IMPLANTS,
  },
  // The same construct a year on, on the frontal film: the disc replacements have not moved
  // (invented), so the Compare screen's frontal changes lie within their intervals; the patient
  // stands a little less rotated.
  'hybrid-one-year-ap': {
    ...HYBRID_PATIENT,
    ...AP_FILM,
    studyDate: '20260305',
    segments: {
      'L3-L4': { segmentalAngleDeg: 11, posteriorDiscHeightMm: 6.8 },
      'L4-L5': { segmentalAngleDeg: 17, posteriorDiscHeightMm: 7.3 },
      'L5-S1': { slipPercent: 6, segmentalAngleDeg: 20, posteriorDiscHeightMm: 6.5 },
    },
    frontal: {
      rotationDeg: 1,
      spinousOffsetPercent: 3,
      coronalAngleDeg: { 'L3-L4': 1.5, 'L4-L5': -2 },
    },
    implants: HYBRID_AP_IMPLANTS,
  },
  'motion-flexion': MOTION.flexion,
  'motion-extension': MOTION.extension,
  // Harder films for the corner-suggestion bench: five times the detector noise, and a blur
  // of 3.5 px (a large focal spot or motion), each on the normal spine.
  noisy: { ...patient('PH-0501', 'PHANTOM^NOISY', '19800101', 'F'), noise: 0.04 },
  blurred: { ...patient('PH-0502', 'PHANTOM^BLURRED', '19800101', 'M'), blurPx: 3.5 },
}

export function phantomPreset(name: string): PhantomParamsInput {
  const preset = PHANTOM_PRESETS[name]
  if (!preset) {
    throw new Error(
      `Unknown phantom preset "${name}". Presets: ${Object.keys(PHANTOM_PRESETS).join(', ')}.`,
    )
  }
  return preset
}
