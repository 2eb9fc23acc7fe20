/**
 * The rules of a reading, in one place for the server (which refuses a submission that breaks
 * them) and the client (its checklist and Submit button): which landmarks a template requires,
 * which are optional and why, and the message for the missing ones.
 */
import type { PixelPoint } from '../types/landmarks'
import type { ReadingTemplate } from '../types/domain'
import {
  templateLandmarks,
  templateNeedsPairedImage,
  type LandmarkSpec,
  type TemplateOptions,
} from './templates'

/** Which film of a reading a landmark belongs to: the image, or a motion pair's second film. */
export type ReadingFilm = 'primary' | 'paired'

/** A required landmark not yet placed, with the words to name it. */
export interface MissingLandmark {
  name: string
  label: string
  film: ReadingFilm
}

/** What a refused submission says: the message, and one detail per missing landmark. */
export interface SubmitRefusal {
  message: string
  details: Record<string, string[]>
}

export interface ReadingRuleInput {
  template: ReadingTemplate
  options: TemplateOptions
  points: Readonly<Record<string, PixelPoint>>
  /** Motion pair: the extension film's landmarks (null or absent for other templates). */
  pairedPoints?: Readonly<Record<string, PixelPoint>> | null
}

/** True when a reading may be submitted without this landmark (the reason is on the spec). */
export function isLandmarkOptional(spec: LandmarkSpec): boolean {
  return spec.optionalBecause !== undefined
}

/** The films a template's landmarks are placed on. */
export function readingFilms(template: ReadingTemplate): ReadingFilm[] {
  return templateNeedsPairedImage(template) ? ['primary', 'paired'] : ['primary']
}

/** How a film is named in messages: "the flexion film", "the extension film" or "the film". */
export function readingFilmName(template: ReadingTemplate, film: ReadingFilm): string {
  if (!templateNeedsPairedImage(template)) return 'the film'
  return film === 'primary' ? 'the flexion film' : 'the extension film'
}

/** Every required landmark not placed, film by film, in checklist order. */
export function missingRequiredLandmarks(input: ReadingRuleInput): MissingLandmark[] {
  const specs = templateLandmarks(input.template, input.options)
  const missing: MissingLandmark[] = []
  for (const film of readingFilms(input.template)) {
    const placed = (film === 'primary' ? input.points : input.pairedPoints) ?? {}
    for (const spec of specs) {
      if (!isLandmarkOptional(spec) && !(spec.name in placed)) {
        missing.push({ name: spec.name, label: spec.label, film })
      }
    }
  }
  return missing
}

/** At most this many landmarks are named in a message; the rest are counted. */
const NAMED_IN_MESSAGE = 4

/**
 * Why the reading cannot be submitted yet, or null when it can: every required landmark of its
 * template must be placed on each of its films; optional ones (say, the second femoral head or
 * a spinous process) may be left out.
 */
export function submitRefusal(input: ReadingRuleInput): SubmitRefusal | null {
  if (templateLandmarks(input.template, input.options).length === 0) {
    return {
      message: 'This reading has no landmarks to place: its template lists no segment.',
      details: { options: ['options: no segment to read'] },
    }
  }
  const missing = missingRequiredLandmarks(input)
  if (missing.length === 0) return null
  const films = readingFilms(input.template)
  const named = missing.slice(0, NAMED_IN_MESSAGE).map((landmark) => {
    const where = films.length > 1 ? ` on ${readingFilmName(input.template, landmark.film)}` : ''
    return `${landmark.label}${where}`
  })
  const more = missing.length - named.length
  const count = `${missing.length} required landmark${missing.length === 1 ? '' : 's'}`
  const list = `${named.join(', ')}${more > 0 ? ` and ${more} more` : ''}`
  const details: Record<string, string[]> = {}
  for (const landmark of missing) {
    const field = `${landmark.film === 'primary' ? 'points' : 'pairedPoints'}.${landmark.name}`
    details[field] = [`${field}: required before submitting`]
  }
  return { message: `Place ${count} before submitting: ${list}.`, details }
}
