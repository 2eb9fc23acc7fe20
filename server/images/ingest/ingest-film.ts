import { randomUUID } from 'node:crypto'
import { mkdir, readFile, rm, writeFile } from 'node:fs/promises'
import { join } from 'node:path'
import { decodeFilm } from '../decode-film'
import type { DecodedFilm, WindowLevel } from '../decoded-film'
import { isImageError, type ImageErrorCode } from '../image-error'
import { makeFilmRenditions, type Rendition } from '../renditions'

export type RenditionKind = 'display' | 'preview' | 'thumbnail' | 'fullDepth'

/** A rendition written to a temporary file, ready to be moved under its content key. */
export interface RenditionFile {
  path: string
  mediaType: Rendition['mediaType']
  width: number
  height: number
}

/** What filing a film needs of its decoding: everything but the pixels. */
export interface IngestedFilm {
  film: Omit<DecodedFilm, 'pixels'>
  renditions: Record<RenditionKind, RenditionFile>
  window: WindowLevel
}

/** An ImageError as plain data: class instances do not survive the trip between threads. */
export interface IngestRefusal {
  code: ImageErrorCode
  message: string
  details: Record<string, string | number>
}

export type IngestOutcome =
  { ok: true; value: IngestedFilm } | { ok: false; refusal: IngestRefusal }

export interface IngestTask {
  /** The uploaded file, already on disk. */
  path: string
  /** Where the renditions are written (the upload temporary folder). */
  tmpDir: string
}

/**
 * Decodes an uploaded film and writes its renditions to temporary files. Runs in a worker
 * thread (see ingest-pool.ts), so the decoded pixels never reach the request thread; only the
 * header, sizes and file paths come back. Refusals of the file come back as data.
 */
export async function ingestFilm(task: IngestTask): Promise<IngestOutcome> {
  const written: string[] = []
  try {
    const decoded = await decodeFilm(await readFile(task.path))
    const renditions = await makeFilmRenditions(decoded)
    await mkdir(task.tmpDir, { recursive: true })
    const save = async (rendition: Rendition): Promise<RenditionFile> => {
      const path = join(task.tmpDir, `${randomUUID()}.rendition`)
      written.push(path)
      await writeFile(path, rendition.buffer)
      return {
        path,
        mediaType: rendition.mediaType,
        width: rendition.width,
        height: rendition.height,
      }
    }
    const { pixels: _pixels, ...film } = decoded
    return {
      ok: true,
      value: {
        film,
        window: renditions.window,
        renditions: {
          display: await save(renditions.display),
          preview: await save(renditions.preview),
          thumbnail: await save(renditions.thumbnail),
          fullDepth: await save(renditions.fullDepth),
        },
      },
    }
  } catch (error) {
    await Promise.all(written.map((path) => rm(path, { force: true })))
    if (isImageError(error)) {
      return {
        ok: false,
        refusal: { code: error.code, message: error.message, details: { ...error.details } },
      }
    }
    throw error
  }
}
