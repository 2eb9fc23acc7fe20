/**
 * Reading templates: the landmarks a reading asks for, in placing order, each with a one-line
 * hint. Names follow the landmark document of the engine (`L5.as`, `S1.pw`, `cage.L5-S1.sup.p` …).
 */
import type { MotionSegment, ReadingTemplate } from '../types/domain'

export type LandmarkKind = 'corner' | 'sacral-wall' | 'femoral-head' | 'cage' | 'implant-marker'

export interface LandmarkSpec {
  name: string
  label: string
  hint: string
  kind: LandmarkKind
}

/** What a template needs to know beyond its name. */
export interface TemplateOptions {
  /** Slip grade and motion pair: the motion segment read. */
  segment?: MotionSegment
  /** Construct check: the treated segments and the implant at each. */
  construct?: Array<{ segment: MotionSegment; implant: 'cage' | 'disc-replacement' }>
}

export const TEMPLATE_LABELS: Record<ReadingTemplate, string> = {
  'slip-grade': 'Slip grade',
  'lumbar-alignment': 'Lumbar alignment',
  'construct-check': 'Construct check',
  'motion-pair': 'Motion pair',
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
  }
}

/** The second film of a motion pair carries the same landmarks as the first. */
export function templateNeedsPairedImage(template: ReadingTemplate): boolean {
  return template === 'motion-pair'
}
