// npm run phantom -- (--params FILE.json | --preset NAME) --out DIR
// Writes film.png, film.dcm, landmarks.json and params.json into DIR.
import { readFile } from 'node:fs/promises'
import { parseArgs } from 'node:util'
import { PHANTOM_PRESETS, phantomPreset } from '../phantom/presets'
import type { PhantomParamsInput } from '../phantom/phantom-params'
import { writePhantomFiles } from '../phantom/write-phantom-files'

const usage =
  'Usage: npm run phantom -- (--params FILE.json | --preset NAME) --out DIR\n' +
  `Presets: ${Object.keys(PHANTOM_PRESETS).join(', ')}`

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      params: { type: 'string' },
      preset: { type: 'string' },
      out: { type: 'string' },
      help: { type: 'boolean' },
    },
  })
  if (values.help) {
    console.log(usage)
    return
  }
  if (!values.out || (values.params === undefined) === (values.preset === undefined)) {
    throw new Error(`Give --out and exactly one of --params or --preset.\n${usage}`)
  }
  const input: PhantomParamsInput = values.preset
    ? phantomPreset(values.preset)
    : (JSON.parse(await readFile(values.params as string, 'utf8')) as PhantomParamsInput)
  const files = await writePhantomFiles(input, values.out)
  console.log(`Wrote ${files.png}, ${files.dicom}, ${files.landmarks}`)
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : String(error))
  process.exitCode = 1
})
