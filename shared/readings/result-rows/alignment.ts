import { SOURCES } from '../../measurement/index'
import { row } from './row-format'
import { PI_LL_MARKED_MISMATCH_DEG, PI_LL_MODERATE_MISMATCH_DEG } from './thresholds'
import type { FilmResults, ResultFlag, ResultSection } from './types'

/** Lumbar and distal lordosis, the pelvic parameters, PI − LL and the target lordosis. */
export function alignmentSection(film: FilmResults): ResultSection {
  const m = film.measurements
  const u = film.uncertainty?.measurements
  const rows = [
    row(
      'll',
      'Lumbar lordosis L1–S1',
      m?.lumbarLordosisDeg,
      u?.lumbarLordosisDeg,
      '°',
      SOURCES.lumbarLordosis,
      { emphasis: true },
    ),
    row(
      'dl',
      'Distal lordosis L4–S1',
      m?.distalLordosisDeg,
      u?.distalLordosisDeg,
      '°',
      SOURCES.distalLordosis,
    ),
    row(
      'pi',
      'Pelvic incidence',
      m?.pelvis?.incidenceDeg,
      u?.pelvis?.incidenceDeg,
      '°',
      SOURCES.pelvis,
      { emphasis: true },
    ),
    row('pt', 'Pelvic tilt', m?.pelvis?.tiltDeg, u?.pelvis?.tiltDeg, '°', SOURCES.pelvis),
    row(
      'ss',
      'Sacral slope',
      m?.pelvis?.sacralSlopeDeg,
      u?.pelvis?.sacralSlopeDeg,
      '°',
      SOURCES.pelvis,
    ),
    row('pi-ll', 'PI − LL mismatch', m?.piLlMismatchDeg, u?.piLlMismatchDeg, '°', SOURCES.piLlBand),
    row(
      'target',
      'Target lordosis (0.54·PI + 27.6)',
      m?.targetLordosisDeg,
      u?.targetLordosisDeg,
      '°',
      SOURCES.targetLordosis,
    ),
  ]
  const flags: ResultFlag[] = []
  const band = m?.piLlBand
  if (band === '+' || band === '++') {
    flags.push({
      id: 'pi-ll',
      tone: 'warn',
      text:
        band === '++'
          ? `PI − LL above ${PI_LL_MARKED_MISMATCH_DEG}°: marked mismatch (band ++).`
          : `PI − LL between ${PI_LL_MODERATE_MISMATCH_DEG}° and ${PI_LL_MARKED_MISMATCH_DEG}°: moderate mismatch (band +).`,
      source: SOURCES.piLlBand,
    })
  } else if (band === '0') {
    flags.push({
      id: 'pi-ll',
      tone: 'info',
      text: `PI − LL below ${PI_LL_MODERATE_MISMATCH_DEG}° (band 0).`,
      source: SOURCES.piLlBand,
    })
  }
  return { id: 'alignment', title: 'Alignment and pelvis', rows, flags }
}
