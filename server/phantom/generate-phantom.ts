import type { LandmarkDocument } from '@shared/types/landmarks'
import sharp from 'sharp'
import type { WindowLevel } from '../images/decoded-film'
import { percentileWindow, windowLookupTable } from '../images/display-window'
import { phantomLandmarks, placeOnFilm } from './film-placement'
import { phantomFilmSvg } from './film-svg'
import { resolvePhantomParams, type PhantomParams, type PhantomParamsInput } from './phantom-params'
import { renderFilmPixels } from './render-film'
import { buildSpineGeometry, checkSpineGeometry, type SpineGeometry } from './spine-geometry'
import { writePhantomDicom } from './write-phantom-dicom'

export interface PhantomFilm {
  params: PhantomParams
  geometry: SpineGeometry
  landmarks: LandmarkDocument
  width: number
  height: number
  /** 16-bit MONOCHROME2 pixels, row by row. */
  pixels: Uint16Array
  /** 1st–99th percentile window, written into the DICOM header. */
  window: WindowLevel
}

/** Only the ground truth: geometry and landmarks, without drawing a pixel. */
export function phantomGroundTruth(input: PhantomParamsInput = {}): {
  params: PhantomParams
  geometry: SpineGeometry
  landmarks: LandmarkDocument
} {
  const params = resolvePhantomParams(input)
  const geometry = buildSpineGeometry(params)
  checkSpineGeometry(geometry)
  const landmarks = phantomLandmarks(geometry, placeOnFilm(geometry, params))
  return { params, geometry, landmarks }
}

/** Renders a synthetic lateral lumbar film and its exact landmark positions. */
export async function generatePhantom(input: PhantomParamsInput = {}): Promise<PhantomFilm> {
  const params = resolvePhantomParams(input)
  const geometry = buildSpineGeometry(params)
  checkSpineGeometry(geometry)
  const placement = placeOnFilm(geometry, params)
  const pixels = await renderFilmPixels(phantomFilmSvg(geometry, placement, params), params)
  return {
    params,
    geometry,
    landmarks: phantomLandmarks(geometry, placement),
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
