/**
 * A round's results as one CSV table: a row per measure (the ICC forms side by side), then a row
 * per measure and pair of raters for Bland–Altman, and per pair for the Meyerding kappa. Text
 * cells are escaped against spreadsheet formulas; numbers stay numbers.
 */
import { stringify } from 'csv-stringify/sync'
import { ICC_FORMS } from '../../shared/statistics/index'
import type { RoundResults } from '../../shared/types/rounds'
import { escapeSpreadsheetText } from '../exports/formula-escape'
import type { Db } from '../db/knex'
import { audit, type Actor } from './audit'
import { getRoundResults } from './round-results'

type Cell = string | number | null

const FORM_FIELDS = ['icc', 'lower', 'upper', 'f', 'df1', 'df2', 'p'] as const

export const ROUND_RESULTS_COLUMNS: string[] = [
  'row',
  'measure',
  'label',
  'unit',
  'n',
  'k',
  'excluded',
  'too_few',
  ...ICC_FORMS.flatMap((form) =>
    FORM_FIELDS.map((field) => `icc_${form.replace(',', '_')}_${field}`),
  ),
  'koo_li_band_of_icc_2_1_lower',
  'sem',
  'mdc95',
  'pair_a',
  'pair_b',
  'pair_n',
  'bias',
  'sd_of_differences',
  'lower_limit',
  'upper_limit',
  'bias_ci_lower',
  'bias_ci_upper',
  'lower_limit_ci_lower',
  'lower_limit_ci_upper',
  'upper_limit_ci_lower',
  'upper_limit_ci_upper',
  'kappa_linear',
  'kappa_linear_lower',
  'kappa_linear_upper',
  'kappa_quadratic',
  'kappa_quadratic_lower',
  'kappa_quadratic_upper',
]

const text = (value: string | null) => (value === null ? null : escapeSpreadsheetText(value))

export function roundResultsCsv(results: RoundResults): string {
  const rows: Cell[][] = []
  const empty = (count: number) => Array<Cell>(count).fill(null)
  const formsWidth = ICC_FORMS.length * FORM_FIELDS.length
  for (const measure of results.measures) {
    const head: Cell[] = [
      text(measure.key),
      text(measure.label),
      text(measure.unit),
      measure.n,
      measure.k,
      measure.excluded,
      text(measure.tooFew),
    ]
    const forms: Cell[] = measure.forms
      ? ICC_FORMS.flatMap((form) => FORM_FIELDS.map((field) => measure.forms![form][field]))
      : empty(formsWidth)
    rows.push([
      'measure',
      ...head,
      ...forms,
      measure.band,
      measure.sem,
      measure.mdc95,
      ...empty(19),
    ])
    for (const pair of measure.pairs) {
      rows.push([
        'bland-altman',
        ...head,
        ...empty(formsWidth + 3),
        text(pair.a),
        text(pair.b),
        pair.n,
        pair.bias,
        pair.sd,
        pair.lower,
        pair.upper,
        ...pair.biasCi,
        ...pair.lowerCi,
        ...pair.upperCi,
        ...empty(6),
      ])
    }
    for (const pair of measure.kappa ?? []) {
      rows.push([
        'weighted-kappa',
        ...head,
        ...empty(formsWidth + 3),
        text(pair.a),
        text(pair.b),
        pair.n,
        ...empty(10),
        pair.linear?.kappa ?? null,
        pair.linear?.lower ?? null,
        pair.linear?.upper ?? null,
        pair.quadratic?.kappa ?? null,
        pair.quadratic?.lower ?? null,
        pair.quadratic?.upper ?? null,
      ])
    }
  }
  return stringify(rows, { header: true, columns: ROUND_RESULTS_COLUMNS, bom: true })
}

/** The results CSV for someone allowed to read the round; the download is audited as an export. */
export async function exportRoundResultsCsv(
  db: Db,
  actor: Actor,
  id: number,
  now: Date,
): Promise<string> {
  const csv = roundResultsCsv(await getRoundResults(db, actor, id, now))
  await audit(db, actor, 'export', 'round', id, `Downloaded the results of round ${id} as CSV`)
  return csv
}
