import type { SegmentName } from '../types/measurement'

/**
 * The landmark vocabulary of a document (measurement-reference §1). Names are case-sensitive.
 *
 * - Vertebrae L1…L5: `L<n>.as` anterior-superior, `.ps` posterior-superior, `.pi`
 *   posterior-inferior, `.ai` anterior-inferior corner.
 * - Sacrum: `S1.as`, `S1.ps` (superior endplate corners), `S1.pw` (a point on the posterior
 *   wall, caudal to S1.ps).
 * - Femoral heads: the centre `FH1` / `FH2`, or three rim points `FH1.rim1`…`FH1.rim3`
 *   (`FH2.rim1`…`FH2.rim3`) from which the centre is fitted as the circumcentre. Giving both a
 *   centre and rim points for one head is refused: the two could disagree and neither is more
 *   trustworthy, so the reader must choose.
 * - Implants follow `<object>.<segment>.<where>`: `cage.<segment>.sup.p`, `.sup.a`, `.inf.p`,
 *   `.inf.a` (posterior and anterior ends of the cage's superior and inferior surfaces) and
 *   `implant.<segment>.marker` (the radiographic marker of a disc replacement), for every
 *   segment L1-L2 … L5-S1.
 * - Frontal (AP) film, for each segment U-W: `U.il`, `U.ir` (the lateral corners of U's inferior
 *   endplate), `W.sl`, `W.sr` (the lateral corners of W's superior endplate), `tdr.U-W.l`,
 *   `tdr.U-W.r` (the two lateral ends of a disc replacement) and `U.sp` (the tip of U's
 *   spinous process). `l` and `r` are as placed on the image: `l` is nearer the image's left
 *   edge, whichever side of the patient that is.
 */

export const LUMBAR_VERTEBRAE = ['L1', 'L2', 'L3', 'L4', 'L5'] as const
export type LumbarVertebra = (typeof LUMBAR_VERTEBRAE)[number]
export type Vertebra = LumbarVertebra | 'S1'

export const VERTEBRA_CORNERS = ['as', 'ps', 'pi', 'ai'] as const
export type VertebraCorner = (typeof VERTEBRA_CORNERS)[number]

export const SACRUM_POINTS = ['as', 'ps', 'pw'] as const

export const FEMORAL_HEADS = ['FH1', 'FH2'] as const
export type FemoralHead = (typeof FEMORAL_HEADS)[number]
export const FEMORAL_HEAD_RIM_POINTS = ['rim1', 'rim2', 'rim3'] as const

/** Segments upper vertebra first, with their vertebrae. */
export const SEGMENTS: readonly { name: SegmentName; upper: LumbarVertebra; lower: Vertebra }[] = [
  { name: 'L1-L2', upper: 'L1', lower: 'L2' },
  { name: 'L2-L3', upper: 'L2', lower: 'L3' },
  { name: 'L3-L4', upper: 'L3', lower: 'L4' },
  { name: 'L4-L5', upper: 'L4', lower: 'L5' },
  { name: 'L5-S1', upper: 'L5', lower: 'S1' },
]

export const SEGMENT_NAMES: readonly SegmentName[] = SEGMENTS.map((segment) => segment.name)

export const CAGE_POINTS = ['sup.p', 'sup.a', 'inf.p', 'inf.a'] as const
export type CagePoint = (typeof CAGE_POINTS)[number]

/** Frontal-film points of a vertebra: inferior and superior endplate ends, spinous process tip. */
export const FRONTAL_VERTEBRA_POINTS = ['il', 'ir', 'sl', 'sr', 'sp'] as const
export type FrontalVertebraPoint = (typeof FRONTAL_VERTEBRA_POINTS)[number]

/** The two lateral ends of a disc replacement on a frontal film, as placed on the image. */
export const FRONTAL_IMPLANT_ENDS = ['l', 'r'] as const
export type FrontalImplantEnd = (typeof FRONTAL_IMPLANT_ENDS)[number]

/** Name of a vertebral corner, e.g. `L4.ps`. */
export function cornerName(vertebra: Vertebra, corner: VertebraCorner | 'pw'): string {
  return `${vertebra}.${corner}`
}

/** Name of a femoral head rim point, e.g. `FH1.rim2`. */
export function rimPointName(head: FemoralHead, index: 1 | 2 | 3): string {
  return `${head}.rim${index}`
}

/** Name of a cage point, e.g. `cage.L5-S1.sup.a`. */
export function cagePointName(segment: SegmentName, where: CagePoint): string {
  return `cage.${segment}.${where}`
}

/** Name of a disc-replacement marker, e.g. `implant.L4-L5.marker`. */
export function implantMarkerName(segment: SegmentName): string {
  return `implant.${segment}.marker`
}

/** Name of a frontal-film point of a vertebra, e.g. `L4.il` or `S1.sr`. */
export function frontalPointName(vertebra: Vertebra, where: FrontalVertebraPoint): string {
  return `${vertebra}.${where}`
}

/** Name of a lateral end of a disc replacement on a frontal film, e.g. `tdr.L4-L5.l`. */
export function frontalImplantName(segment: SegmentName, end: FrontalImplantEnd): string {
  return `tdr.${segment}.${end}`
}

function buildKnownNames(): ReadonlySet<string> {
  const names: string[] = []
  for (const vertebra of LUMBAR_VERTEBRAE) {
    for (const corner of VERTEBRA_CORNERS) names.push(cornerName(vertebra, corner))
  }
  for (const point of SACRUM_POINTS) names.push(`S1.${point}`)
  for (const head of FEMORAL_HEADS) {
    names.push(head)
    for (const rim of FEMORAL_HEAD_RIM_POINTS) names.push(`${head}.${rim}`)
  }
  for (const segment of SEGMENT_NAMES) {
    for (const where of CAGE_POINTS) names.push(cagePointName(segment, where))
    names.push(implantMarkerName(segment))
  }
  // Frontal film: U's inferior endplate ends and spinous process, W's superior endplate ends.
  for (const { name, upper, lower } of SEGMENTS) {
    names.push(frontalPointName(upper, 'il'), frontalPointName(upper, 'ir'))
    names.push(frontalPointName(upper, 'sp'))
    names.push(frontalPointName(lower, 'sl'), frontalPointName(lower, 'sr'))
    for (const end of FRONTAL_IMPLANT_ENDS) names.push(frontalImplantName(name, end))
  }
  return new Set(names)
}

/** Every landmark name a document may use. */
export const KNOWN_LANDMARK_NAMES: ReadonlySet<string> = buildKnownNames()

/** True when `name` is in the vocabulary above. */
export function isKnownLandmarkName(name: string): boolean {
  return KNOWN_LANDMARK_NAMES.has(name)
}
