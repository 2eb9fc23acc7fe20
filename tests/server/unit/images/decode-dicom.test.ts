import dicomParser from 'dicom-parser'
import { describe, expect, it } from 'vitest'
import { decodeDicom } from '../../../../server/images/dicom/decode-dicom'
import { writeTestDicom } from './dicom-fixture'

describe('DICOM written by dcmjs, read by dicom-parser', () => {
  it('reads back the header and the exact pixels (two independent libraries)', async () => {
    const pixels = Uint16Array.from([0, 1, 2, 65535, 4096, 30000, 12, 13, 14, 15, 16, 17])
    const file = writeTestDicom({
      pixels,
      attributes: {
        PixelSpacing: [0.139, 0.14],
        PixelSpacingCalibrationType: 'GEOMETRY',
        ViewPosition: 'LL',
        SeriesDescription: 'L-SPINE LAT FLEXION',
      },
    })
    // dicom-parser alone first: the raw attribute strings dcmjs wrote.
    const raw = dicomParser.parseDicom(new Uint8Array(file))
    expect(raw.string('x00280030')).toBe('0.139\\0.14')
    expect(raw.uint16('x00280010')).toBe(3)

    const film = await decodeDicom(file)
    expect(film).toMatchObject({ width: 4, height: 3, bitsStored: 16, window: null })
    expect(Array.from(film.pixels)).toEqual(Array.from(pixels))
    expect(film.header).toMatchObject({
      transferSyntaxName: 'Explicit VR Little Endian',
      modality: 'DX',
      patient: {
        name: { family: 'PHANTOM', given: 'LUMBAR', raw: 'PHANTOM^LUMBAR' },
        id: 'PH-TEST-1',
        birthDate: '1970-01-01',
        sex: 'O',
      },
      studyDate: '2026-01-02',
      acquisitionDate: '2026-01-03',
      view: 'lateral-flexion',
      pixel: { rows: 3, columns: 4, bitsAllocated: 16, bitsStored: 16, highBit: 15 },
    })
    // Row spacing first, then column (PS3.3 §10.7.1.3).
    expect(film.header?.spacing.mmPerPixel).toEqual([0.139, 0.14])
  })

  it('inverts MONOCHROME1 so larger is brighter (PS3.3 C.7.6.3.1.2)', async () => {
    const pixels = Uint16Array.from([0, 1000, 4095, 2048])
    const file = writeTestDicom({
      width: 2,
      height: 2,
      pixels,
      attributes: {
        PhotometricInterpretation: 'MONOCHROME1',
        BitsStored: 12,
        HighBit: 11,
        WindowCenter: [1000],
        WindowWidth: [500],
      },
    })
    const film = await decodeDicom(file)
    expect(Array.from(film.pixels)).toEqual([4095, 3095, 0, 2047])
    expect(film.bitsStored).toBe(12)
    // The window moves with the inversion: centre 1000 becomes 4095 − 1000.
    expect(film.window).toEqual({ center: 3095, width: 500 })
    // And back: modality value = offset + slope × pixel.
    expect(film.toModality.offset + film.toModality.slope * 3095).toBe(1000)
  })

  it('masks to Bits Stored and sign-extends signed pixels (PS3.3 C.7.6.3.1.1, C.7.6.3.1.2)', async () => {
    // 12 bits stored in 16: the top four bits carry junk (overlay bits in old files) and must go.
    const words = Int16Array.from([0x0fff, 0x0800, 0x0001 | 0x7000, 0x07ff | -0x8000])
    const file = writeTestDicom({
      width: 2,
      height: 2,
      pixels: words,
      attributes: { BitsStored: 12, HighBit: 11, PixelRepresentation: 1 },
    })
    const film = await decodeDicom(file)
    // Stored values −1, −2048, 1, 2047 shifted by +2048 to be non-negative.
    expect(Array.from(film.pixels)).toEqual([2047, 0, 2049, 4095])
    expect(film.toModality).toEqual({ offset: -2048, slope: 1 })
    expect(film.bitsStored).toBe(12)
  })

  it('applies Rescale Slope and Intercept before the window (PS3.3 C.11.1, modality LUT first)', async () => {
    const file = writeTestDicom({
      width: 2,
      height: 1,
      pixels: Uint16Array.from([0, 1000]),
      attributes: {
        BitsStored: 12,
        HighBit: 11,
        RescaleSlope: 2,
        RescaleIntercept: -1024,
        WindowCenter: [40],
        WindowWidth: [400],
      },
    })
    const film = await decodeDicom(file)
    const modality = Array.from(
      film.pixels,
      (p) => film.toModality.offset + film.toModality.slope * p,
    )
    expect(modality).toEqual([-1024, 976])
    // The window is in modality units (HU here): centre 40 HU lands on pixel 40 + 1024.
    expect(film.window).toEqual({ center: 1064, width: 400 })
  })

  it('keeps every Window Center/Width pair and uses the first by default (PS3.3 C.11.2.1.2)', async () => {
    const file = writeTestDicom({
      attributes: {
        WindowCenter: [1500, 800],
        WindowWidth: [3000, 400],
        WindowCenterWidthExplanation: ['SOFT', 'BONE'],
        VOILUTFunction: 'SIGMOID',
      },
    })
    const film = await decodeDicom(file)
    expect(film.header?.windows).toEqual([
      { center: 1500, width: 3000, explanation: 'SOFT' },
      { center: 800, width: 400, explanation: 'BONE' },
    ])
    expect(film.window).toEqual({ center: 1500, width: 3000 })
    expect(film.header?.voiLutFunction).toBe('SIGMOID')
  })

  it('reads 16-bit pixels that start at an odd byte offset by copying them', async () => {
    const file = writeTestDicom()
    const shifted = new Uint8Array(file.length + 1)
    shifted.set(file, 1)
    const film = await decodeDicom(shifted.subarray(1))
    expect(Array.from(film.pixels)).toEqual(Array.from({ length: 12 }, (_, i) => i * 100))
  })

  it('maps view hints to our views (PS3.3 C.8.11.5 View Position, plus free text)', async () => {
    const view = async (attributes: Record<string, unknown>) =>
      (await decodeDicom(writeTestDicom({ attributes }))).header?.view
    expect(await view({ ViewPosition: 'LL' })).toBe('lateral-neutral')
    expect(await view({ ViewPosition: 'RL', SeriesDescription: 'LSPINE LAT EXT' })).toBe(
      'lateral-extension',
    )
    expect(await view({ ProtocolName: 'Whole spine lateral standing long' })).toBe(
      'lateral-standing-long',
    )
    expect(await view({ ViewPosition: 'AP' })).toBe('ap')
    expect(await view({ SeriesDescription: 'PELVIS' })).toBeNull()
  })

  it('keeps Patient Orientation (0020,0020) as row and column directions (PS3.3 C.7.6.1.1.1)', async () => {
    const orientation = async (attributes: Record<string, unknown>) =>
      (await decodeDicom(writeTestDicom({ attributes }))).header?.patientOrientation
    // An AP film as usually hung: rows run to the patient's left, columns to the feet.
    expect(await orientation({ PatientOrientation: ['L', 'F'] })).toEqual(['L', 'F'])
    expect(await orientation({ PatientOrientation: ['r', 'fp'] })).toEqual(['R', 'FP'])
    expect(await orientation({})).toBeNull()
    // One value, or letters outside A, P, R, L, H, F: not an orientation.
    expect(await orientation({ PatientOrientation: ['L'] })).toBeNull()
    expect(await orientation({ PatientOrientation: ['X', 'F'] })).toBeNull()
  })
})
