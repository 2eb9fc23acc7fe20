// `npm run -s reliability -- FILE.json`, FILE holding { "ratings": [[...], ...] } with rows =
// targets and columns = raters (null for a missing rating). Prints the six ICC forms of Shrout &
// Fleiss (1979) with their F tests and 95 % intervals, and for two raters the Bland–Altman bias,
// SD and limits (first column minus second), as JSON on stdout:
//
//   { "n", "k", "excluded", "forms": { "1,1": F, ... "3,k": F }, "blandAltman": {...} | null }
//
// each F being { "icc", "lower", "upper", "f", "df1", "df2", "p" } (f is null when the error mean
// square is 0, i.e. an infinite F; icc, lower and upper are null where not defined: ICC(2,k) past
// the Spearman–Brown pole, or an ICC(2,·) interval when the targets differ less than one
// target's ratings do). A target with a missing rating is left out and counted in
// "excluded". Bad input, and data too few or without variance for an ICC, exit non-zero with
// the message on stderr, so scripts can rely on the exit status.
import { readFile } from 'node:fs/promises'
import { analyseReliability } from '@shared/statistics/index'

const USAGE = 'usage: reliability FILE.json   (FILE: { "ratings": [[...], ...] }, rows = targets)'

class UsageError extends Error {}

function parseArguments(argv: readonly string[]): string {
  const files: string[] = []
  for (const argument of argv) {
    if (argument.startsWith('--')) throw new UsageError(`unknown option ${argument}`)
    files.push(argument)
  }
  const [file, ...extra] = files
  if (file === undefined) throw new UsageError('no ratings file given')
  if (extra.length > 0) throw new UsageError(`one file at a time, got ${files.length}`)
  return file
}

async function readRatings(file: string): Promise<unknown> {
  let text: string
  try {
    text = await readFile(file, 'utf8')
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code
    throw new Error(`cannot read ${file}: ${code === 'ENOENT' ? 'no such file' : String(error)}`)
  }
  let document: unknown
  try {
    document = JSON.parse(text)
  } catch (error) {
    throw new Error(`${file} is not valid JSON: ${(error as Error).message}`)
  }
  if (typeof document !== 'object' || document === null || !('ratings' in document)) {
    throw new Error(`${file} must be an object with a "ratings" array (rows = targets)`)
  }
  return document.ratings
}

async function main(argv: readonly string[]): Promise<number> {
  let file: string
  try {
    file = parseArguments(argv)
  } catch (error) {
    console.error(`${(error as Error).message}\n${USAGE}`)
    return 2
  }
  try {
    // The statistics validate the untrusted table themselves (StatisticsInputError).
    const ratings = (await readRatings(file)) as Parameters<typeof analyseReliability>[0]
    const result = analyseReliability(ratings)
    if (result.status !== 'ok') {
      console.error(`not enough data: ${result.reason} (${result.excluded} excluded)`)
      return 1
    }
    const forms = Object.fromEntries(
      Object.entries(result.forms).map(([form, { icc, lower, upper, f, df1, df2, p }]) => [
        form,
        { icc, lower, upper, f, df1, df2, p },
      ]),
    )
    const agreement = result.blandAltman
    const output = {
      n: result.n,
      k: result.k,
      excluded: result.excluded,
      forms,
      blandAltman: agreement
        ? { bias: agreement.bias, sd: agreement.sd, lower: agreement.lower, upper: agreement.upper }
        : null,
    }
    process.stdout.write(`${JSON.stringify(output, null, 2)}\n`)
    return 0
  } catch (error) {
    console.error(error instanceof Error ? error.message : String(error))
    return 1
  }
}

process.exitCode = await main(process.argv.slice(2))
