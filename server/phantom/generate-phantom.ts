import type { LandmarkDocument } from '@shared/types/landmarks'
import sharp from 'sharp'
import type { WindowLevel } from '../images/decoded-film'
import { percentileWindow, windowLookupTable } from '../images/display-window'
import { phantomLandmarks, placeOnFilm } from './film-placement'
import { phantomFilmSvg } from './film-svg'
import { buildFrontalGeometry, type FrontalGeometry } from './frontal-geometry'
import { frontalLandmarks, placeFrontalOnFilm } from './frontal-placement'
import { frontalFilmSvg } from './frontal-svg'
import { resolvePhantomParams, type PhantomParams, type PhantomParamsInput } from './phantom-params'
import { renderFilmPixels } from './render-film'
import { buildSpineGeometry, checkSpineGeometry, type SpineGeometry } from './spine-geometry'
import { writePhantomDicom } from './write-phantom-dicom'

export interface PhantomFilm {
  params: PhantomParams
  /** The spine in its sagittal frame (also behind a frontal film's disc heights). */
  geometry: SpineGeometry
  /** The spine seen from the front, when the film is AP; null on a lateral film. */
  frontal: FrontalGeometry | null
  landmarks: LandmarkDocument
  width: number
  height: number
  /** 16-bit MONOCHROME2 pixels, row by row. */
  pixels: Uint16Array
  /** 1st–99th percentile window, written into the DICOM header. */
  window: WindowLevel
}

interface PhantomDrawing {
  params: PhantomParams
  geometry: SpineGeometry
  frontal: FrontalGeometry | null
  landmarks: LandmarkDocument
  svg: () => string
}

/** The geometry, landmarks and drawing of a film: lateral, or frontal when the view is AP. */
function drawPhantom(input: PhantomParamsInput): PhantomDrawing {
  const params = resolvePhantomParams(input)
  const geometry = buildSpineGeometry(params)
  checkSpineGeometry(geometry)
  if (params.view === 'ap') {
    const frontal = buildFrontalGeometry(params, geometry)
    const placement = placeFrontalOnFilm(frontal, params)
    return {
      params,
      geometry,
      frontal,
      landmarks: frontalLandmarks(frontal, placement),
      svg: () => frontalFilmSvg(frontal, placement, params),
    }
  }
  const placement = placeOnFilm(geometry, params)
  return {
    params,
    geometry,
    frontal: null,
    landmarks: phantomLandmarks(geometry, placement),
    svg: () => phantomFilmSvg(geometry, placement, params),
  }
}

/** Only the ground truth: geometry and landmarks, without drawing a pixel. */
export function phantomGroundTruth(input: PhantomParamsInput = {}): {
  params: PhantomParams
  geometry: SpineGeometry
  frontal: FrontalGeometry | null
  landmarks: LandmarkDocument
} {
  const { params, geometry, frontal, landmarks } = drawPhantom(input)
  return { params, geometry, frontal, landmarks }
}

/**
 * Renders a synthetic lumbar film and its exact landmark positions: lateral, or frontal (AP,
 * with the implant centring landmarks) when `view` is 'ap'.
 */
export async function generatePhantom(input: PhantomParamsInput = {}): Promise<PhantomFilm> {
  const { params, geometry, frontal, landmarks, svg } = drawPhantom(input)
  const pixels = await renderFilmPixels(svg(), params)
  return {
    params,
    geometry,
    frontal,
    landmarks,
    width: params.widthPx,
    height: params.heightPx,
    pixels,
    window: percentileWindow(pixels),
  }
}

/** The film as PNG: 16-bit grey, or 8-bit through its window. */
export async function phantomPng(film: PhantomFilm): Promise<Buffer> {
  const raw = { raw: { width: film.width, height: film.height, channels: 1 as const } }
  if (film.params.pngBits === 16) {
    return sharp(film.pixels, raw).toColourspace('grey16').png().toBuffer()
  }
  const lut = windowLookupTable(film.window)
  const grey = new Uint8Array(film.pixels.length)
  for (let i = 0; i < grey.length; i++) grey[i] = lut[film.pixels[i] as number] as number
  return sharp(grey, raw).png().toBuffer()
}

export function phantomDicom(film: PhantomFilm): Buffer {
  return writePhantomDicom(film.pixels, film.params, film.window)
}
