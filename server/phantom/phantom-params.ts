import type { FilmView } from '../images/film-view'

export const LUMBAR_LEVELS = ['L1', 'L2', 'L3', 'L4', 'L5'] as const
export type LumbarLevel = (typeof LUMBAR_LEVELS)[number]

/** Motion segments from the top down, each named upper-lower. */
export const SPINE_SEGMENTS = ['L1-L2', 'L2-L3', 'L3-L4', 'L4-L5', 'L5-S1'] as const
export type SpineSegment = (typeof SPINE_SEGMENTS)[number]

/**
 * A vertebral body as a quadrilateral: the inferior endplate is `depthMm` long, both walls stand
 * perpendicular to it, the posterior wall `posteriorHeightMm` high and the anterior
 * `anteriorHeightMm` (taller anterior = lordotic wedge).
 */
export interface VertebraShape {
  depthMm: number
  posteriorHeightMm: number
  anteriorHeightMm: number
}

/**
 * One motion segment, upper vertebra U over lower W (W = S1 at L5-S1), in the definitions of the
 * measurement reference §3:
 * - slipPercent: 100 · (U.pi − W.ps)·a / |W.as − W.ps|, a = unit(W.as − W.ps).
 * - segmentalAngleDeg: U's superior endplate against W's inferior endplate (S1: its superior),
 *   lordosis positive. With the vertebra shapes fixed this sets the disc angle.
 * - posteriorDiscHeightMm: height of U.pi above W's superior endplate, perpendicular to it.
 *   The anterior disc height follows from the angle.
 */
export interface SegmentShape {
  slipPercent: number
  segmentalAngleDeg: number
  posteriorDiscHeightMm: number
}

export interface ImplantSpec {
  kind: 'cage' | 'disc-replacement'
  segment: SpineSegment
  /** Centre of the implant along W's superior endplate, % of its depth from the posterior edge. */
  positionPercent: number
  /** Footprint along the endplate, % of its depth. */
  footprintPercent: number
  /**
   * Frontal film only: the implant centre's offset from the body midline along the mean
   * endplate direction, mm, positive toward the image's right edge (measurement-reference §11).
   */
  lateralOffsetMm: number
  /** Frontal film only: the implant's angle against the mean endplate direction, degrees. */
  coronalTiltDeg: number
  /** Frontal film only: the implant's width, % of the mean endplate width. */
  frontalWidthPercent: number
}

/**
 * What a frontal (AP) film adds to the spine: the bodies' lateral widths, the coronal angle of
 * each disc, the film's rotation in its own plane and the patient's axial rotation (seen as the
 * spinous tips off the midline), and the Patient Orientation written into the DICOM file.
 */
export interface FrontalShape {
  /** Width of each body's endplates, left to right (mm). */
  bodyWidthMm: Record<LumbarLevel, number>
  /** Width of the S1 superior endplate (mm). */
  sacrumWidthMm: number
  /** Angle of U's inferior endplate against W's superior endplate, degrees (positive: turned counter-clockwise as seen, opening toward the image's right). */
  coronalAngleDeg: Record<SpineSegment, number>
  /** The whole spine turned in the film plane, degrees clockwise as seen on the film. */
  rotationDeg: number
  /** Spinous process tips off the body midline toward the image's right, % of the half-width. */
  spinousOffsetPercent: number
  /** DICOM Patient Orientation (0020,0020) of the file; null writes none. */
  patientOrientation: [row: string, column: string] | null
}

export interface PhantomPatient {
  name: string
  id: string
  birthDate: string
  sex: 'M' | 'F' | 'O'
}

export interface PhantomParams {
  widthPx: number
  heightPx: number
  /** Detector pixel pitch (DICOM Imager Pixel Spacing). */
  detectorPixelMm: number
  /** Radiographic magnification at the spine: mm per pixel there = detectorPixelMm / magnification. */
  magnification: number
  /** Which way the patient's front points on the film. */
  facing: 'left' | 'right'
  sacralSlopeDeg: number
  /** Pelvic tilt; ignored when pelvicIncidenceDeg is set (PI = PT + SS, Legaye et al. 1998). */
  pelvicTiltDeg: number
  pelvicIncidenceDeg: number | null
  /** Distance from the middle of S1's superior endplate to the hip axis. */
  hipAxisDistanceMm: number
  femoralHeadRadiusMm: number
  /** How far apart the two femoral heads project (beam divergence, slight pelvic rotation). */
  femoralHeadSeparationMm: number
  sacrumDepthMm: number
  /** Angle between S1's superior endplate and the posterior wall of the sacrum. */
  sacralTableAngleDeg: number
  vertebrae: Record<LumbarLevel, VertebraShape>
  segments: Record<SpineSegment, SegmentShape>
  implants: ImplantSpec[]
  /** Used when `view` is 'ap': the frontal film. */
  frontal: FrontalShape
  /** Detector noise, SD as a fraction of the full 16-bit scale. */
  noise: number
  /** Gaussian blur sigma in pixels (focal spot, scatter). */
  blurPx: number
  seed: number
  pngBits: 8 | 16
  view: FilmView
  seriesDescription: string
  patient: PhantomPatient
  studyDate: string
}

export const DEFAULT_PHANTOM_PARAMS: PhantomParams = {
  widthPx: 3000,
  heightPx: 2500,
  detectorPixelMm: 0.15,
  magnification: 1.15,
  facing: 'right',
  sacralSlopeDeg: 38,
  pelvicTiltDeg: 14,
  pelvicIncidenceDeg: null,
  hipAxisDistanceMm: 105,
  femoralHeadRadiusMm: 23,
  femoralHeadSeparationMm: 7,
  sacrumDepthMm: 40,
  sacralTableAngleDeg: 96,
  // Typical adult sizes; L1–L2 slightly kyphotic wedges, L5 clearly lordotic.
  vertebrae: {
    L1: { depthMm: 32, posteriorHeightMm: 26, anteriorHeightMm: 24 },
    L2: { depthMm: 34, posteriorHeightMm: 27, anteriorHeightMm: 26 },
    L3: { depthMm: 36, posteriorHeightMm: 27, anteriorHeightMm: 27.5 },
    L4: { depthMm: 37, posteriorHeightMm: 26, anteriorHeightMm: 27.5 },
    L5: { depthMm: 38, posteriorHeightMm: 24, anteriorHeightMm: 28.5 },
  },
  // Disc angles of about 4, 6, 8, 10 and 11 degrees from L1-L2 down.
  segments: {
    'L1-L2': { slipPercent: 0, segmentalAngleDeg: -1, posteriorDiscHeightMm: 6 },
    'L2-L3': { slipPercent: 0, segmentalAngleDeg: 5, posteriorDiscHeightMm: 6.5 },
    'L3-L4': { slipPercent: 0, segmentalAngleDeg: 11, posteriorDiscHeightMm: 7 },
    'L4-L5': { slipPercent: 0, segmentalAngleDeg: 19, posteriorDiscHeightMm: 7 },
    'L5-S1': { slipPercent: 0, segmentalAngleDeg: 18, posteriorDiscHeightMm: 6 },
  },
  implants: [],
  // Typical adult lumbar body widths, increasing downward; an AP film hung as if facing the
  // patient, so the image's right edge is the patient's left (rows toward L, columns toward F).
  frontal: {
    bodyWidthMm: { L1: 42, L2: 44, L3: 47, L4: 49, L5: 51 },
    sacrumWidthMm: 50,
    coronalAngleDeg: { 'L1-L2': 0, 'L2-L3': 0, 'L3-L4': 0, 'L4-L5': 0, 'L5-S1': 0 },
    rotationDeg: 0,
    spinousOffsetPercent: 0,
    patientOrientation: ['L', 'F'],
  },
  noise: 0.008,
  blurPx: 1.2,
  seed: 1,
  pngBits: 16,
  view: 'lateral-neutral',
  seriesDescription: 'LUMBAR SPINE LAT',
  patient: { name: 'PHANTOM^LUMBAR', id: 'PH-0000', birthDate: '19700101', sex: 'O' },
  studyDate: '20260101',
}

type DeepPartial<T> = T extends (infer U)[]
  ? DeepPartial<U>[]
  : T extends object
    ? { [K in keyof T]?: DeepPartial<T[K]> }
    : T

export type PhantomParamsInput = DeepPartial<PhantomParams>

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

function merge(base: unknown, patch: unknown, path: string): unknown {
  if (patch === undefined) return base
  if (!isPlainObject(base)) return patch
  if (!isPlainObject(patch)) throw new Error(`Phantom parameter ${path} must be an object.`)
  const out: Record<string, unknown> = { ...base }
  for (const [key, value] of Object.entries(patch)) {
    if (!(key in base)) throw new Error(`Unknown phantom parameter ${path}${key}.`)
    out[key] = merge(base[key], value, `${path}${key}.`)
  }
  return out
}

/** Fills what the input leaves out from the defaults (objects merged, arrays replaced). */
export function resolvePhantomParams(
  input: PhantomParamsInput = {},
  base: PhantomParams = DEFAULT_PHANTOM_PARAMS,
): PhantomParams {
  const params = merge(base, input, '') as PhantomParams
  params.implants = params.implants.map((implant: Partial<ImplantSpec>) => {
    if (implant.kind !== 'cage' && implant.kind !== 'disc-replacement') {
      throw new Error(
        `Implant kind must be 'cage' or 'disc-replacement', not ${String(implant.kind)}.`,
      )
    }
    if (!SPINE_SEGMENTS.includes(implant.segment as SpineSegment)) {
      throw new Error(`Implant segment must be one of ${SPINE_SEGMENTS.join(', ')}.`)
    }
    return {
      positionPercent: 50,
      footprintPercent: 60,
      lateralOffsetMm: 0,
      coronalTiltDeg: 0,
      frontalWidthPercent: 72,
      ...implant,
    } as ImplantSpec
  })
  return params
}

/**
 * The spacing at the spine, the ground truth's mmPerPixel. Rounded to 10 significant digits so
 * it survives DICOM's 16-character decimal strings (PS3.5 §6.2, DS) unchanged.
 */
export function phantomMmPerPixel(params: PhantomParams): number {
  return Number((params.detectorPixelMm / params.magnification).toPrecision(10))
}

export function phantomPelvicTiltDeg(params: PhantomParams): number {
  return params.pelvicIncidenceDeg === null
    ? params.pelvicTiltDeg
    : params.pelvicIncidenceDeg - params.sacralSlopeDeg
}
