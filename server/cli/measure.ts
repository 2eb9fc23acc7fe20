// `npm run -s measure -- FILE.json [--uncertainty] [--sigma-mm=N] [--sigma-px=N]`
// Prints the unrounded measurement JSON (measurement-reference §10) to stdout. Invalid input
// (missing file, malformed JSON, a document the engine refuses) exits non-zero with the
// message on stderr, so scripts can rely on the exit status.
import { readFile } from 'node:fs/promises'
import { computeMeasurements, computeUncertainty } from '@shared/measurement/index'
import type { UncertaintyOptions } from '@shared/measurement/index'

const USAGE = 'usage: measure FILE.json [--uncertainty] [--sigma-mm=N] [--sigma-px=N]'

interface Arguments {
  file: string
  uncertainty: boolean
  options: UncertaintyOptions
}

class UsageError extends Error {}

function parseNumberFlag(flag: string, value: string): number {
  const parsed = Number(value)
  if (value.trim() === '' || !Number.isFinite(parsed) || parsed < 0) {
    throw new UsageError(`${flag} needs a number ≥ 0, got ${JSON.stringify(value)}`)
  }
  return parsed
}

function parseArguments(argv: readonly string[]): Arguments {
  const files: string[] = []
  let uncertainty = false
  const options: UncertaintyOptions = {}
  for (const argument of argv) {
    if (argument === '--uncertainty') uncertainty = true
    else if (argument.startsWith('--sigma-mm=')) {
      options.sigmaMm = parseNumberFlag('--sigma-mm', argument.slice('--sigma-mm='.length))
    } else if (argument.startsWith('--sigma-px=')) {
      options.sigmaPx = parseNumberFlag('--sigma-px', argument.slice('--sigma-px='.length))
    } else if (argument.startsWith('--')) throw new UsageError(`unknown option ${argument}`)
    else files.push(argument)
  }
  const [file, ...extra] = files
  if (file === undefined) throw new UsageError('no landmark file given')
  if (extra.length > 0) throw new UsageError(`one file at a time, got ${files.length}`)
  if ((options.sigmaMm !== undefined || options.sigmaPx !== undefined) && !uncertainty) {
    throw new UsageError('--sigma-mm and --sigma-px only apply with --uncertainty')
  }
  return { file, uncertainty, options }
}

async function readDocument(file: string): Promise<unknown> {
  let text: string
  try {
    text = await readFile(file, 'utf8')
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code
    throw new Error(`cannot read ${file}: ${code === 'ENOENT' ? 'no such file' : String(error)}`)
  }
  try {
    return JSON.parse(text)
  } catch (error) {
    throw new Error(`${file} is not valid JSON: ${(error as Error).message}`)
  }
}

async function main(argv: readonly string[]): Promise<number> {
  let args: Arguments
  try {
    args = parseArguments(argv)
  } catch (error) {
    console.error(`${(error as Error).message}\n${USAGE}`)
    return 2
  }
  try {
    // The engine validates the untrusted document itself and throws LandmarkDocumentError.
    const document = (await readDocument(args.file)) as Parameters<typeof computeMeasurements>[0]
    const result = computeMeasurements(document)
    const output = args.uncertainty
      ? { ...result, uncertainty: computeUncertainty(document, args.options) }
      : result
    process.stdout.write(`${JSON.stringify(output, null, 2)}\n`)
    return 0
  } catch (error) {
    console.error(error instanceof Error ? error.message : String(error))
    return 1
  }
}

process.exitCode = await main(process.argv.slice(2))
