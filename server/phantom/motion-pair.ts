import {
  SPINE_SEGMENTS,
  resolvePhantomParams,
  type PhantomParams,
  type PhantomParamsInput,
  type SpineSegment,
} from './phantom-params'

export interface MotionPairOptions {
  /** The segment whose motion is of interest. */
  segment: SpineSegment
  /** Angular range of motion there: |lordosis(extension) − lordosis(flexion)|. */
  angularRangeDeg: number
  /** Translation there: slip(flexion) − slip(extension), % of W's endplate depth. */
  translationPercent: number
  /** Range of motion at every other segment. */
  otherRangeDeg?: number
}

/**
 * A flexion and an extension film of one spine (reference §6): the same vertebrae, each segment
 * turned by half its range either way around the neutral film, the chosen segment translated.
 */
export function flexionExtensionPair(
  neutral: PhantomParamsInput,
  options: MotionPairOptions,
): { flexion: PhantomParams; extension: PhantomParams } {
  const base = resolvePhantomParams(neutral)
  const turn = (sign: 1 | -1, view: PhantomParams['view']): PhantomParams => {
    const segments = { ...base.segments }
    for (const name of SPINE_SEGMENTS) {
      const range =
        name === options.segment ? options.angularRangeDeg : (options.otherRangeDeg ?? 6)
      const slipShift = name === options.segment ? options.translationPercent / 2 : 0
      segments[name] = {
        ...base.segments[name],
        // Flexion closes lordosis and slides U forward; extension opens it and slides U back.
        segmentalAngleDeg: base.segments[name].segmentalAngleDeg + (sign * range) / 2,
        slipPercent: base.segments[name].slipPercent - sign * slipShift,
      }
    }
    const description = view === 'lateral-flexion' ? 'LAT FLEXION' : 'LAT EXTENSION'
    return { ...base, segments, view, seriesDescription: `LUMBAR SPINE ${description}` }
  }
  return { flexion: turn(-1, 'lateral-flexion'), extension: turn(1, 'lateral-extension') }
}
