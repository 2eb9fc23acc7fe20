/** A reading as the API answers it, and the workspace stores loaded with it (src/api mocked). */
import { vi } from 'vitest'
import type { ImageRecord } from '../../../shared/types/api'
import type { Reading } from '../../../shared/types/readings'
import { ApiError } from '../../../src/api/http'
import * as readingsApi from '../../../src/api/readings'
import * as imagesApi from '../../../src/api/images'
import * as visitsApi from '../../../src/api/visits'
import { useReadingsStore } from '../../../src/stores/readings'
import { useReadingEditorStore } from '../../../src/stores/reading-editor'

// The importing test file mocks these modules (vi.mock is hoisted only within that file).
export const api = vi.mocked(readingsApi)
const images = vi.mocked(imagesApi)
const visits = vi.mocked(visitsApi)

export function readingFixture(overrides: Partial<Reading> = {}): Reading {
  return {
    id: 7,
    imageId: 3,
    pairedImageId: null,
    raterId: 1,
    raterName: 'Test fellow',
    template: 'slip-grade',
    options: { segment: 'L5-S1' },
    landmarks: { points: {} },
    pairedLandmarks: null,
    suggestionUse: { points: {} },
    calibration: { mmPerPixel: [0.5, 0.5], source: 'dicom-pixel-spacing' },
    pairedCalibration: null,
    results: {
      measurements: {} as Reading['results']['measurements'],
      uncertainty: null,
      motion: null,
      subsidence: null,
      subsidenceBaselineReadingId: null,
    },
    engineVersion: 'test',
    status: 'draft',
    version: 1,
    blinded: false,
    supersedesId: null,
    supersedeReason: null,
    supersededById: null,
    reviewerId: null,
    submittedAt: null,
    signedAt: null,
    signedBy: null,
    signedByName: null,
    returnedBy: null,
    returnedByName: null,
    returnedAt: null,
    returnComment: null,
    createdAt: '2026-01-01T00:00:00Z',
    updatedAt: '2026-01-01T00:00:00Z',
    ...overrides,
  }
}

const film = {
  id: 3,
  visitId: 11,
  version: 1,
  width: 750,
  height: 625,
  mmPerPixel: [0.5, 0.5],
  spacingSource: 'dicom-pixel-spacing',
} as ImageRecord

/** The server's side of the contract (shared/types/readings.ts): bumps the version, echoes points. */
export function acceptPatches() {
  let version = 1
  api.patchReading.mockImplementation(async (_id, input) => {
    if (input.version !== version) throw new ApiError(409, 'version_conflict', 'stale')
    version += 1
    return readingFixture({ version, landmarks: { points: input.points } })
  })
}

/** The fixture's rater (id 1, a fellow) looks at it unless another viewer is named. */
export async function loadedStore(
  reading = readingFixture(),
  viewer: { id: number; role: 'fellow' | 'surgeon' | 'researcher' } = { id: 1, role: 'fellow' },
) {
  api.getReading.mockResolvedValue(reading)
  visits.getVisit.mockRejectedValue(new Error('not needed'))
  images.getImage.mockResolvedValue(film)
  const store = useReadingsStore()
  store.viewer = viewer
  await store.load(reading.id)
  return { store, editor: useReadingEditorStore() }
}
