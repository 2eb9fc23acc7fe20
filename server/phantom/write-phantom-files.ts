import { mkdir, writeFile } from 'node:fs/promises'
import { join } from 'node:path'
import { generatePhantom, phantomDicom, phantomPng } from './generate-phantom'
import type { PhantomParamsInput } from './phantom-params'

export interface PhantomFiles {
  png: string
  dicom: string
  landmarks: string
  params: string
}

/** Writes film.png, film.dcm, landmarks.json (and the resolved params.json) into `dir`. */
export async function writePhantomFiles(
  input: PhantomParamsInput,
  dir: string,
): Promise<PhantomFiles> {
  const film = await generatePhantom(input)
  await mkdir(dir, { recursive: true })
  const files: PhantomFiles = {
    png: join(dir, 'film.png'),
    dicom: join(dir, 'film.dcm'),
    landmarks: join(dir, 'landmarks.json'),
    params: join(dir, 'params.json'),
  }
  await writeFile(files.png, await phantomPng(film))
  await writeFile(files.dicom, phantomDicom(film))
  await writeFile(files.landmarks, `${JSON.stringify(film.landmarks, null, 2)}\n`)
  await writeFile(files.params, `${JSON.stringify(film.params, null, 2)}\n`)
  return files
}
