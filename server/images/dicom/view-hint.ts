import type { DataSet } from 'dicom-parser'
import type { FilmView } from '../film-view'
import { readText } from './dicom-attributes'

/** The header text that hints at the view, kept so a person can see why a view was chosen. */
export interface ViewHints {
  viewPosition?: string
  viewCodeMeaning?: string
  seriesDescription?: string
  studyDescription?: string
  protocolName?: string
  imageComments?: string
  bodyPartExamined?: string
}

export function readViewHints(dataSet: DataSet): ViewHints {
  const viewCode = dataSet.elements.x00540220?.items?.[0]?.dataSet
  const hints: ViewHints = {
    viewPosition: readText(dataSet, 'x00185101'),
    viewCodeMeaning: viewCode ? readText(viewCode, 'x00080104') : undefined,
    seriesDescription: readText(dataSet, 'x0008103e'),
    studyDescription: readText(dataSet, 'x00081030'),
    protocolName: readText(dataSet, 'x00181030'),
    imageComments: readText(dataSet, 'x00204000'),
    bodyPartExamined: readText(dataSet, 'x00180015'),
  }
  return Object.fromEntries(Object.entries(hints).filter(([, v]) => v !== undefined))
}

const FLEXION = /\bflex(ion|ed)?\b|\bflx\b/
const EXTENSION = /\bextension\b|\bext\b|\bextended\b/
const STANDING_LONG =
  /\b(long|full|whole|entire)[ -]?(length|spine|cassette)?\b|\bscolio|\beos\b|\bstitch/
const LATERAL = /\blat(eral)?\b/
const FRONTAL = /\b(ap|pa)\b|antero-?posterior|postero-?anterior|frontal/
// View Position defined terms (PS3.3 C.8.11.5): lateral LL/RL and their decubitus forms, or AP/PA.
const LATERAL_POSITION = /^(ll|rl|lld|rld|lat|lateral)$/
const FRONTAL_POSITION = /^(ap|pa|apl|pal)$/

/**
 * Guesses the view from the header. Free text (series, protocol, comments) goes first because
 * View Position (0018,5101) only says "LL"/"RL" for every lateral, neutral or dynamic.
 */
export function viewFromHints(hints: ViewHints): FilmView | null {
  const text = [
    hints.seriesDescription,
    hints.protocolName,
    hints.imageComments,
    hints.viewCodeMeaning,
    hints.studyDescription,
  ]
    .filter((value): value is string => value !== undefined)
    .join(' | ')
    .toLowerCase()
    .replace(/[_^]/g, ' ')
  const position = hints.viewPosition?.toLowerCase() ?? ''
  const positionLateral = LATERAL_POSITION.test(position)
  const positionFrontal = FRONTAL_POSITION.test(position)
  const lateral = positionLateral || (!positionFrontal && LATERAL.test(text))
  const frontal = positionFrontal || (!lateral && FRONTAL.test(text))

  if (FLEXION.test(text) && !frontal) return 'lateral-flexion'
  if (EXTENSION.test(text) && !frontal) return 'lateral-extension'
  if (lateral && STANDING_LONG.test(text)) return 'lateral-standing-long'
  if (lateral) return 'lateral-neutral'
  if (frontal) return 'ap'
  return null
}
