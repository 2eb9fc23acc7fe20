/**
 * Reading templates: the landmarks a reading asks for, in placing order, each with a one-line
 * hint. Names follow the landmark document of the engine (`L5.as`, `S1.pw`, `cage.L5-S1.sup.p` …).
 */
import type { MotionSegment, ReadingTemplate } from '../types/domain'

export type LandmarkKind =
  | 'corner'
  | 'sacral-wall'
  | 'femoral-head'
  | 'cage'
  | 'implant-marker'
  | 'frontal-corner'
  | 'frontal-implant'
  | 'spinous-process'

export interface LandmarkSpec {
  name: string
  label: string
  hint: string
  kind: LandmarkKind
  /**
   * Why a reading may be submitted without this landmark; absent for a required one. The
   * rule that reads it lives in ./reading-rules.
   */
  optionalBecause?: string
}

/** What a template needs to know beyond its name. */
export interface TemplateOptions {
  /** Slip grade and motion pair: the motion segment read. */
  segment?: MotionSegment
  /** Construct check: the treated segments and the implant at each. */
  construct?: Array<{ segment: MotionSegment; implant: 'cage' | 'disc-replacement' }>
  /** Implant centring: the segments with a disc replacement, read on the frontal film. */
  discReplacements?: MotionSegment[]
}

export const TEMPLATE_LABELS: Record<ReadingTemplate, string> = {
  'slip-grade': 'Slip grade',
  'lumbar-alignment': 'Lumbar alignment',
  'construct-check': 'Construct check',
  'motion-pair': 'Motion pair',
  'implant-centring': 'Implant centring (AP)',
}

const CORNER_WORDS = {
  as: ['anterior-superior', 'front top corner'],
  ps: ['posterior-superior', 'back top corner'],
  pi: ['posterior-inferior', 'back bottom corner'],
  ai: ['anterior-inferior', 'front bottom corner'],
} as const

type Corner = keyof typeof CORNER_WORDS

function corner(vertebra: string, which: Corner): LandmarkSpec {
  const [formal, plain] = CORNER_WORDS[which]
  const body = vertebra === 'S1' ? 'of the S1 endplate' : `of the ${vertebra} body`
  return {
    name: `${vertebra}.${which}`,
    label: `${vertebra} ${formal}`,
    hint: `The ${plain} ${body}, on the cortical rim.`,
    kind: 'corner',
  }
}

const sacralWall: LandmarkSpec = {
  name: 'S1.pw',
  label: 'S1 posterior wall',
  hint: 'A point on the posterior wall of the sacrum, well below the S1 posterior-superior corner.',
  kind: 'sacral-wall',
}

const femoralHeads: LandmarkSpec[] = [
  {
    name: 'FH1',
    label: 'Femoral head centre 1',
    hint: 'Centre of the nearer femoral head (the larger circle).',
    kind: 'femoral-head',
  },
  {
    name: 'FH2',
    label: 'Femoral head centre 2',
    hint: 'Centre of the other femoral head; skip it when the heads superimpose.',
    kind: 'femoral-head',
    optionalBecause: 'when the two heads superimpose, the first one is the hip axis',
  },
]

function vertebraeOf(segment: MotionSegment): [upper: string, lower: string] {
  const [upper, lower] = segment.split('-') as [string, string]
  return [upper, lower]
}

/** Both vertebrae of a segment: four corners above, the lower one's endplates below. */
function segmentLandmarks(segment: MotionSegment): LandmarkSpec[] {
  const [upper, lower] = vertebraeOf(segment)
  const specs = (['as', 'ps', 'pi', 'ai'] as const).map((which) => corner(upper, which))
  specs.push(corner(lower, 'as'), corner(lower, 'ps'))
  if (lower === 'S1') specs.push(sacralWall)
  else specs.push(corner(lower, 'pi'), corner(lower, 'ai'))
  return specs
}

function cageLandmarks(segment: MotionSegment): LandmarkSpec[] {
  const surface = (where: 'sup' | 'inf', end: 'p' | 'a'): LandmarkSpec => ({
    name: `cage.${segment}.${where}.${end}`,
    label: `Cage ${where === 'sup' ? 'upper' : 'lower'} surface, ${end === 'p' ? 'posterior' : 'anterior'}`,
    hint: `${end === 'p' ? 'Back' : 'Front'} end of the cage's ${where === 'sup' ? 'upper' : 'lower'} surface at ${segment}.`,
    kind: 'cage',
  })
  return [surface('sup', 'p'), surface('sup', 'a'), surface('inf', 'p'), surface('inf', 'a')]
}

function markerLandmark(segment: MotionSegment): LandmarkSpec {
  return {
    name: `implant.${segment}.marker`,
    label: `Disc replacement marker ${segment}`,
    hint: `The radiographic marker of the disc replacement at ${segment} (its core or centre pin).`,
    kind: 'implant-marker',
  }
}

/**
 * A disc replacement's segment on a frontal (AP) film: the lateral ends of the endplates around
 * it, the implant's two lateral ends and the spinous process of the upper vertebra. `l` and `r`
 * are the ends nearer the image's left and right edges, whichever patient side that is.
 */
function centringLandmarks(segment: MotionSegment): LandmarkSpec[] {
  const [upper, lower] = vertebraeOf(segment)
  const end = (side: 'l' | 'r') => (side === 'l' ? 'image-left' : 'image-right')
  const endplate = (vertebra: string, where: 'i' | 's', side: 'l' | 'r'): LandmarkSpec => {
    const plate = where === 'i' ? 'inferior' : 'superior'
    return {
      name: `${vertebra}.${where}${side}`,
      label: `${vertebra} ${plate} endplate, ${end(side)} end`,
      hint: `The lateral corner of the ${vertebra} ${plate} endplate nearer the image's ${side === 'l' ? 'left' : 'right'} edge.`,
      kind: 'frontal-corner',
    }
  }
  const implant = (side: 'l' | 'r'): LandmarkSpec => ({
    name: `tdr.${segment}.${side}`,
    label: `Disc replacement ${segment}, ${end(side)} end`,
    hint: `The lateral end of the disc replacement (its lower plate) nearer the image's ${side === 'l' ? 'left' : 'right'} edge.`,
    kind: 'frontal-implant',
  })
  return [
    endplate(upper, 'i', 'l'),
    endplate(upper, 'i', 'r'),
    endplate(lower, 's', 'l'),
    endplate(lower, 's', 'r'),
    implant('l'),
    implant('r'),
    {
      name: `${upper}.sp`,
      label: `${upper} spinous process tip`,
      hint: `The tip of the ${upper} spinous process, seen end-on between the pedicles: checks film rotation.`,
      kind: 'spinous-process',
      optionalBecause: 'it only checks the film for rotation',
    },
  ]
}

/** Every landmark a template asks for, in the order the checklist offers them. */
export function templateLandmarks(
  template: ReadingTemplate,
  options: TemplateOptions = {},
): LandmarkSpec[] {
  switch (template) {
    case 'slip-grade':
    case 'motion-pair':
      return segmentLandmarks(options.segment ?? 'L5-S1')
    case 'lumbar-alignment': {
      const specs: LandmarkSpec[] = []
      for (const vertebra of ['L1', 'L2', 'L3', 'L4', 'L5']) {
        for (const which of ['as', 'ps', 'pi', 'ai'] as const) specs.push(corner(vertebra, which))
      }
      specs.push(corner('S1', 'as'), corner('S1', 'ps'), sacralWall, ...femoralHeads)
      return specs
    }
    case 'construct-check': {
      const seen = new Set<string>()
      const specs: LandmarkSpec[] = []
      for (const { segment, implant } of options.construct ?? []) {
        for (const spec of segmentLandmarks(segment)) {
          if (!seen.has(spec.name)) specs.push(spec)
          seen.add(spec.name)
        }
        specs.push(...(implant === 'cage' ? cageLandmarks(segment) : [markerLandmark(segment)]))
      }
      return specs
    }
    case 'implant-centring':
      return (options.discReplacements ?? []).flatMap(centringLandmarks)
  }
}

/** The second film of a motion pair carries the same landmarks as the first. */
export function templateNeedsPairedImage(template: ReadingTemplate): boolean {
  return template === 'motion-pair'
}

/** Implant centring is read on a frontal (AP) film; every other template on a lateral one. */
export function templateReadsFrontalFilm(template: ReadingTemplate): boolean {
  return template === 'implant-centring'
}
