import { expect } from 'vitest'
import request from 'supertest'
import type { Express } from 'express'
import { templateLandmarks, type TemplateOptions } from '../../shared/readings/templates'
import type { ReadingTemplate } from '../../shared/types/domain'
import type { PixelPoint } from '../../shared/types/landmarks'
import type { smallPhantomFiles } from './phantom-files'

type Phantom = Awaited<ReturnType<typeof smallPhantomFiles>>
type Points = Record<string, PixelPoint>

/** Files a phantom's DICOM on a visit through the API, as a fellow would; answers the image id. */
export async function uploadPhantomFilm(
  app: Express,
  cookie: string,
  visitId: number,
  film: Phantom,
  view = 'lateral-neutral',
): Promise<number> {
  const res = await request(app)
    .post(`/api/visits/${visitId}/images`)
    .set('Cookie', cookie)
    .field('view', view)
    .field('confirmPatientMismatch', 'true')
    .attach('file', film.dicom, 'neutral.dcm')
  expect(res.status).toBe(201)
  return res.body[0].id as number
}

/**
 * A reading placed exactly at the phantom's ground-truth landmarks of the template (those the
 * phantom has), submitted unless asked not to.
 */
export async function readPhantomAt(
  app: Express,
  cookie: string,
  film: Phantom,
  imageId: number,
  template: ReadingTemplate,
  options: TemplateOptions,
  submit = true,
): Promise<{ id: number; points: Points }> {
  const truth = film.film.landmarks.points as Points
  const names = templateLandmarks(template, options).map((spec) => spec.name)
  const points = Object.fromEntries(
    names.filter((name) => truth[name]).map((name) => [name, truth[name] as PixelPoint]),
  )
  const created = await request(app)
    .post(`/api/images/${imageId}/readings`)
    .set('Cookie', cookie)
    .send({ template, options, points })
  expect(created.status).toBe(201)
  if (submit) {
    const submitted = await request(app)
      .post(`/api/readings/${created.body.id}/submit`)
      .set('Cookie', cookie)
      .send({ version: created.body.version })
    expect(submitted.status).toBe(200)
  }
  return { id: created.body.id as number, points }
}
