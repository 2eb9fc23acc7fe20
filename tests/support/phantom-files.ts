import { generatePhantom, phantomDicom, phantomPng } from '../../server/phantom/generate-phantom'
import type { PhantomParamsInput } from '../../server/phantom/phantom-params'

/** A small synthetic film (750 × 625 px at 0.52 mm/px) as DICOM and PNG bytes, for upload tests. */
export async function smallPhantomFiles(overrides: PhantomParamsInput = {}) {
  const film = await generatePhantom({
    widthPx: 750,
    heightPx: 625,
    detectorPixelMm: 0.6,
    ...overrides,
  })
  return { film, dicom: phantomDicom(film), png: await phantomPng(film) }
}
