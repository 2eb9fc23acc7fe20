import { createHash } from 'node:crypto'
import { mkdir, writeFile } from 'node:fs/promises'
import { join } from 'node:path'
import type { Knex } from 'knex'
import { config } from '../server/config'
import { TABLES } from '../server/db/tables'
import { createLocalFileStore } from '../server/storage/local-file-store'
import { uploadImages } from '../server/services/images'
import { generatePhantom, phantomDicom } from '../server/phantom/generate-phantom'
import { DEMO_PATIENTS } from '../server/demo/demo-data'
import { DEMO_FILMS, demoFilmParams } from '../server/demo/demo-films'

/**
 * Files a rendered phantom film on each demo visit through the same pipeline as a user's upload.
 * Skipped under NODE_ENV=test: the tests render the small films they need themselves.
 */
export async function seed(knex: Knex): Promise<void> {
  if (process.env.NODE_ENV === 'production') throw new Error('Demo seeds never run in production.')
  if (process.env.NODE_ENV === 'test' && process.env.ENDPLATE_SEED_FILMS !== '1') return

  const fellow = await knex(TABLES.users)
    .where({ email: 'priya.lindqvist@endplate.example' })
    .first()
  const actor = {
    user: {
      id: fellow.id,
      email: fellow.email,
      displayName: fellow.display_name,
      role: fellow.role,
    },
    ip: null,
  }
  const store = createLocalFileStore(config.uploadDirAbsolute)
  const tmpDir = join(config.uploadDirAbsolute, 'tmp')
  await mkdir(tmpDir, { recursive: true })

  for (const film of DEMO_FILMS) {
    const patient = DEMO_PATIENTS.find((candidate) => candidate.key === film.patientKey)
    const visitPlan = patient?.visits[film.visitIndex]
    if (!patient || !visitPlan) throw new Error(`Demo film ${film.preset} names no demo visit`)
    const patientRow = await knex(TABLES.patients)
      .where({ record_number: patient.recordNumber })
      .first()
    const visitRow = await knex(TABLES.visits)
      .where({ patient_id: patientRow.id, visit_date: visitPlan.date })
      .first()
    const bytes = phantomDicom(await generatePhantom(demoFilmParams(film, patient, visitPlan)))
    const path = join(tmpDir, `demo-${film.preset}-${film.seed}.upload`)
    await writeFile(path, bytes)
    await uploadImages(knex, store, actor, visitRow.id, {
      files: [
        {
          path,
          size: bytes.length,
          sha256: createHash('sha256').update(bytes).digest('hex'),
          originalName: `${film.preset}.dcm`,
        },
      ],
      views: [],
      confirmPatientMismatch: false,
      workDir: tmpDir,
    })
  }
}
