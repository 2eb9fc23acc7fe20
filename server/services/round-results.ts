/**
 * The reliability results of a round, computed with shared/statistics from the submitted
 * blinded readings. Rows are the round's films (by blind code), columns the raters (inter) or,
 * in an intra round, one rater's passes; a film missing a value in any column is left out of
 * that measure and counted as excluded.
 */
import type { Db } from '../db/knex'
import { listRoundAssignments, listRoundRaters, listRoundReadings } from '../db/rounds'
import { HttpError } from '../errors'
import {
  analyseReliability,
  blandAltman,
  completeTargets,
  kooLiBand,
  weightedKappa,
  type RatingTable,
} from '../../shared/statistics/index'
import {
  MEYERDING_CATEGORIES,
  meyerdingCategory,
  roundMeasures,
  roundSegments,
} from '../../shared/rounds/round-measures'
import type { ReadingResults } from '../../shared/types/readings'
import type { MeasurementResult } from '../../shared/types/measurement'
import type {
  AgreementPair,
  IccFormResult,
  KappaPair,
  MeasureResult,
  RoundResults,
} from '../../shared/types/rounds'
import type { Actor } from './audit'
import { isDone } from './round-progress'
import { loadVisibleRound } from './rounds'
import type { RoundRecord } from '../db/rounds'

const finiteOrNull = (value: number) => (Number.isFinite(value) ? value : null)

/** One column of the statistics: whose values, from which pass. */
interface Column {
  code: string
  raterId: number
  repetition: number
}

/** Each film's measurements per column, films in blind-code order. */
interface Sheet {
  imageIds: number[]
  cell: (imageId: number, column: Column) => MeasurementResult | null
}

function formsOf(analysis: Extract<ReturnType<typeof analyseReliability>, { status: 'ok' }>) {
  return Object.fromEntries(
    Object.entries(analysis.forms).map(([form, estimate]) => [
      form,
      {
        icc: estimate.icc,
        lower: finiteOrNull(estimate.lower),
        upper: finiteOrNull(estimate.upper),
        f: finiteOrNull(estimate.f),
        df1: estimate.df1,
        df2: estimate.df2,
        p: estimate.p,
      } satisfies IccFormResult,
    ]),
  ) as MeasureResult['forms']
}

function agreementPairs(table: RatingTable, columns: readonly Column[]): AgreementPair[] {
  const pairs: AgreementPair[] = []
  for (let i = 0; i < columns.length; i += 1) {
    for (let j = i + 1; j < columns.length; j += 1) {
      const pairTable = table.map((row) => [row[i] ?? null, row[j] ?? null])
      const result = blandAltman(pairTable)
      if (result.status !== 'ok') continue
      const { rows } = completeTargets(pairTable)
      pairs.push({
        a: columns[i]!.code,
        b: columns[j]!.code,
        n: result.n,
        bias: result.bias,
        sd: result.sd,
        lower: result.lower,
        upper: result.upper,
        biasCi: [result.biasInterval.lower, result.biasInterval.upper],
        lowerCi: [result.lowerInterval.lower, result.lowerInterval.upper],
        upperCi: [result.upperInterval.lower, result.upperInterval.upper],
        points: rows.map(([a, b]) => ({
          mean: ((a as number) + (b as number)) / 2,
          difference: (a as number) - (b as number),
        })),
      })
    }
  }
  return pairs
}

function continuousMeasure(
  measure: ReturnType<typeof roundMeasures>[number],
  sheet: Sheet,
  columns: readonly Column[],
  labelSuffix: string,
  keyPrefix: string,
): MeasureResult {
  const table: Array<Array<number | null>> = sheet.imageIds.map((imageId) =>
    columns.map((column) => {
      const result = sheet.cell(imageId, column)
      const value = result ? measure.valueOf(result) : null
      return value === null || !Number.isFinite(value) ? null : value
    }),
  )
  const base = {
    key: `${keyPrefix}${measure.key}`,
    label: `${measure.label}${labelSuffix}`,
    unit: measure.unit,
    k: columns.length,
  }
  const analysis = analyseReliability(table)
  if (analysis.status !== 'ok') {
    return {
      ...base,
      n: analysis.n,
      excluded: analysis.excluded,
      tooFew: `Too few complete films for this measure: ${analysis.reason}.`,
      forms: null,
      band: null,
      sem: null,
      mdc95: null,
      pairs: [],
    }
  }
  const lower21 = analysis.forms['2,1'].lower
  return {
    ...base,
    n: analysis.n,
    excluded: analysis.excluded,
    tooFew: null,
    forms: formsOf(analysis),
    band: kooLiBand(lower21),
    sem: analysis.sem,
    mdc95: analysis.mdc95,
    pairs: agreementPairs(table, columns),
  }
}

function kappaMeasure(
  segment: ReturnType<typeof roundSegments>[number],
  sheet: Sheet,
  columns: readonly Column[],
  labelSuffix: string,
  keyPrefix: string,
): MeasureResult {
  const grades = sheet.imageIds.map((imageId) =>
    columns.map((column) => {
      const result = sheet.cell(imageId, column)
      return result ? meyerdingCategory(result, segment) : null
    }),
  )
  const complete = grades.filter((row) => row.every((grade) => grade !== null)).length
  const pairs: KappaPair[] = []
  for (let i = 0; i < columns.length; i += 1) {
    for (let j = i + 1; j < columns.length; j += 1) {
      const ratings = grades.map((row) => [row[i] ?? null, row[j] ?? null] as const)
      const linear = weightedKappa(ratings, MEYERDING_CATEGORIES, 'linear')
      const quadratic = weightedKappa(ratings, MEYERDING_CATEGORIES, 'quadratic')
      const estimate = (result: typeof linear) =>
        result.status === 'ok'
          ? { kappa: result.kappa, lower: result.lower, upper: result.upper }
          : null
      pairs.push({
        a: columns[i]!.code,
        b: columns[j]!.code,
        n: linear.n,
        linear: estimate(linear),
        quadratic: estimate(quadratic),
        tooFew: linear.status === 'ok' ? null : `No kappa: ${linear.reason}.`,
      })
    }
  }
  return {
    key: `${keyPrefix}${segment}.meyerdingGrade`,
    label: `${segment} Meyerding grade${labelSuffix}`,
    unit: 'grade',
    n: complete,
    k: columns.length,
    excluded: grades.length - complete,
    tooFew:
      complete < 2
        ? `Too few complete films for this measure: ${complete} graded by every rater; at least 2 are needed.`
        : null,
    forms: null,
    band: null,
    sem: null,
    mdc95: null,
    pairs: [],
    kappa: pairs,
  }
}

function measuresOf(
  round: RoundRecord,
  sheet: Sheet,
  columns: Column[],
  suffix: string,
  prefix: string,
) {
  const continuous = roundMeasures(round.template, round.templateOptions).map((measure) =>
    continuousMeasure(measure, sheet, columns, suffix, prefix),
  )
  const grades = roundSegments(round.template, round.templateOptions).map((segment) =>
    kappaMeasure(segment, sheet, columns, suffix, prefix),
  )
  return [...continuous, ...grades]
}

/** The results of a round from its submitted readings, as the statistics module computes them. */
export async function computeRoundResults(
  db: Db,
  round: RoundRecord,
  now: Date,
): Promise<RoundResults> {
  const raters = await listRoundRaters(db, round.id)
  const readings = await listRoundReadings(db, round.id)
  const byCell = new Map<string, MeasurementResult>()
  for (const reading of readings) {
    const measurements = (reading.results as ReadingResults | null)?.measurements
    if (measurements)
      byCell.set(`${reading.imageId}:${reading.raterId}:${reading.repetition}`, measurements)
  }
  const assignments = await listRoundAssignments(db, round.id)
  const codeOf = new Map(
    assignments.filter((a) => a.repetition === 1).map((a) => [a.imageId, a.blindCode]),
  )
  const imageIds = [...codeOf.keys()].sort((a, b) => codeOf.get(a)!.localeCompare(codeOf.get(b)!))
  const sheet: Sheet = {
    imageIds,
    cell: (imageId, column) =>
      byCell.get(`${imageId}:${column.raterId}:${column.repetition}`) ?? null,
  }
  if (round.kind === 'inter') {
    const columns = raters.map((rater) => ({
      code: rater.raterCode,
      raterId: rater.userId,
      repetition: 1,
    }))
    return {
      roundId: round.id,
      kind: round.kind,
      computedAt: now.toISOString(),
      columns: columns.map((column) => column.code),
      measures: measuresOf(round, sheet, columns, '', ''),
    }
  }
  // Intra: each rater's passes are the "raters" of that rater's statistics.
  const measures: MeasureResult[] = []
  const allColumns: string[] = []
  for (const rater of raters) {
    const columns = Array.from({ length: round.repeats }, (_, index) => ({
      code: `${rater.raterCode} pass ${index + 1}`,
      raterId: rater.userId,
      repetition: index + 1,
    }))
    allColumns.push(...columns.map((column) => column.code))
    const suffix = ` — ${rater.raterCode}, passes 1–${round.repeats} as raters`
    measures.push(...measuresOf(round, sheet, columns, suffix, `${rater.raterCode}/`))
  }
  return {
    roundId: round.id,
    kind: round.kind,
    computedAt: now.toISOString(),
    columns: allColumns,
    measures,
  }
}

/**
 * The results for someone allowed to read the round. A rater of the round who still has readings
 * to make in it sees no results until they are done (the numbers would unblind the films).
 */
export async function getRoundResults(
  db: Db,
  actor: Actor,
  id: number,
  now: Date,
): Promise<RoundResults> {
  const round = await loadVisibleRound(db, actor, id)
  if (round.status === 'open') {
    const own = (await listRoundAssignments(db, id)).filter((a) => a.raterId === actor.user.id)
    if (own.some((assignment) => !isDone(assignment)))
      throw new HttpError(
        409,
        'rater_not_done',
        'You are a rater in this round with readings still to make; its results open to you once they are done.',
      )
  }
  return computeRoundResults(db, round, now)
}
