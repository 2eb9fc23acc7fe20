import type { DataSet } from 'dicom-parser'
import type { FilmView } from '../film-view'
import { ImageError } from '../image-error'
import { readDate, readNumber, readNumbers, readText, readUint16 } from './dicom-attributes'
import { pickFilmSpacing, readSpacingAttributes, type FilmSpacing } from './pixel-spacing'
import { transferSyntaxName } from './transfer-syntax'
import type { BurnedInAnnotation } from '../../../shared/types/pixel-review'
import { readViewHints, viewFromHints, type ViewHints } from './view-hint'

export interface PixelModule {
  rows: number
  columns: number
  samplesPerPixel: number
  bitsAllocated: number
  bitsStored: number
  highBit: number
  /** 0 unsigned, 1 two's complement (PS3.3 C.7.6.3.1.2 Pixel Representation). */
  pixelRepresentation: 0 | 1
  photometricInterpretation: string
  numberOfFrames: number
}

export type VoiLutFunction = 'LINEAR' | 'LINEAR_EXACT' | 'SIGMOID'

/** A VOI window as written in the header, in modality units (after Rescale Slope/Intercept). */
export interface HeaderWindow {
  center: number
  width: number
  explanation?: string
}

export interface DicomHeader {
  transferSyntaxUid: string
  transferSyntaxName: string
  sopClassUid?: string
  modality?: string
  patient: {
    /** PN components (PS3.5 §6.2.1): family^given^middle^prefix^suffix. */
    name: { family: string; given: string; raw: string } | null
    id: string | null
    birthDate: string | null
    sex: 'M' | 'F' | 'O' | null
  }
  studyDate: string | null
  acquisitionDate: string | null
  view: FilmView | null
  viewHints: ViewHints
  /**
   * Patient Orientation (0020,0020): the patient directions of the rows (toward the image's
   * right edge) and of the columns (downward), e.g. ["L", "F"]; null when absent or malformed.
   */
  patientOrientation: [row: string, column: string] | null
  pixel: PixelModule
  /** Modality LUT as Rescale Slope (0028,1053) and Intercept (0028,1052). */
  rescale: { slope: number; intercept: number }
  /** Every Window Center/Width pair (0028,1050/1051); the first is the default. */
  windows: HeaderWindow[]
  voiLutFunction: VoiLutFunction
  spacing: FilmSpacing
  /** Burned In Annotation (0028,0301): whether the pixels carry identifying text. */
  burnedInAnnotation: BurnedInAnnotation
}

/** Two CS values of A, P, R, L, H and F letters (PS3.3 C.7.6.1.1.1); anything else is null. */
function readPatientOrientation(dataSet: DataSet): DicomHeader['patientOrientation'] {
  const values = (readText(dataSet, 'x00200020') ?? '').split('\\').map((v) => v.trim())
  const [row, column] = values
  const valid = (value: string | undefined): value is string =>
    value !== undefined && /^[APRLHF]{1,3}$/.test(value.toUpperCase())
  return values.length === 2 && valid(row) && valid(column)
    ? [row.toUpperCase(), column.toUpperCase()]
    : null
}

function readPatientName(dataSet: DataSet): DicomHeader['patient']['name'] {
  const raw = readText(dataSet, 'x00100010')
  if (!raw) return null
  // Only the alphabetic group (before the first '=') carries the readable name.
  const [family = '', given = ''] = (raw.split('=')[0] ?? '').split('^')
  return { family: family.trim(), given: given.trim(), raw }
}

function readSex(dataSet: DataSet): DicomHeader['patient']['sex'] {
  const value = readText(dataSet, 'x00100040')?.toUpperCase()
  return value === 'M' || value === 'F' || value === 'O' ? value : null
}

function readAcquisitionDate(dataSet: DataSet): string | null {
  return (
    readDate(dataSet, 'x00080022') ??
    readDate(dataSet, 'x0008002a') ??
    readDate(dataSet, 'x00080023') ??
    null
  )
}

function readPixelModule(dataSet: DataSet): PixelModule {
  const rows = readUint16(dataSet, 'x00280010')
  const columns = readUint16(dataSet, 'x00280011')
  if (rows === undefined || columns === undefined) {
    throw new ImageError(
      'corrupt-dicom',
      'The DICOM file has no Rows or Columns: it holds no image.',
    )
  }
  if (rows === 0 || columns === 0) {
    throw new ImageError('zero-size-image', `The DICOM image is ${columns} × ${rows} pixels.`, {
      rows,
      columns,
    })
  }
  const bitsAllocated = readUint16(dataSet, 'x00280100') ?? 16
  const bitsStored = readUint16(dataSet, 'x00280101') ?? bitsAllocated
  // PS3.3 C.7.6.3.1: High Bit is one less than Bits Stored unless the modality says otherwise.
  const highBit = readUint16(dataSet, 'x00280102') ?? bitsStored - 1
  return {
    rows,
    columns,
    samplesPerPixel: readUint16(dataSet, 'x00280002') ?? 1,
    bitsAllocated,
    bitsStored,
    highBit,
    pixelRepresentation: readUint16(dataSet, 'x00280103') === 1 ? 1 : 0,
    photometricInterpretation: readText(dataSet, 'x00280004')?.toUpperCase() ?? 'MONOCHROME2',
    numberOfFrames: Math.max(1, Math.round(readNumber(dataSet, 'x00280008') ?? 1)),
  }
}

function readWindows(dataSet: DataSet): HeaderWindow[] {
  const centers = readNumbers(dataSet, 'x00281050')
  const widths = readNumbers(dataSet, 'x00281051')
  const explanations = (readText(dataSet, 'x00281055') ?? '').split('\\')
  const windows: HeaderWindow[] = []
  for (let i = 0; i < Math.min(centers.length, widths.length); i++) {
    const center = centers[i] as number
    const width = widths[i] as number
    // PS3.3 C.11.2.1.2: Window Width shall be ≥ 1 (> 0 for LINEAR_EXACT); skip broken pairs.
    if (!(width > 0)) continue
    const explanation = explanations[i]?.trim()
    windows.push(explanation ? { center, width, explanation } : { center, width })
  }
  return windows
}

function readVoiLutFunction(dataSet: DataSet): VoiLutFunction {
  const value = readText(dataSet, 'x00281056')?.toUpperCase()
  return value === 'SIGMOID' || value === 'LINEAR_EXACT' ? value : 'LINEAR'
}

/**
 * Burned In Annotation (0028,0301; DICOM PS3.3 C.7.6.1 General Image Module): its values are
 * YES and NO. Absent or any other value says nothing, so it is 'unknown' and the film is
 * treated as possibly showing identity.
 */
function readBurnedInAnnotation(dataSet: DataSet): BurnedInAnnotation {
  const value = readText(dataSet, 'x00280301')?.toUpperCase()
  if (value === 'YES') return 'yes'
  if (value === 'NO') return 'no'
  return 'unknown'
}

/** Reads the attributes Endplate keeps from a parsed DICOM dataset. */
export function readDicomHeader(dataSet: DataSet): DicomHeader {
  const transferSyntaxUid = readText(dataSet, 'x00020010') ?? '1.2.840.10008.1.2'
  const viewHints = readViewHints(dataSet)
  const slope = readNumber(dataSet, 'x00281053')
  return {
    transferSyntaxUid,
    transferSyntaxName: transferSyntaxName(transferSyntaxUid),
    sopClassUid: readText(dataSet, 'x00080016') ?? readText(dataSet, 'x00020002'),
    modality: readText(dataSet, 'x00080060'),
    patient: {
      name: readPatientName(dataSet),
      id: readText(dataSet, 'x00100020') ?? null,
      birthDate: readDate(dataSet, 'x00100030') ?? null,
      sex: readSex(dataSet),
    },
    studyDate: readDate(dataSet, 'x00080020') ?? null,
    acquisitionDate: readAcquisitionDate(dataSet),
    view: viewFromHints(viewHints),
    viewHints,
    patientOrientation: readPatientOrientation(dataSet),
    pixel: readPixelModule(dataSet),
    // A zero slope would collapse the image to one value; treat it as absent.
    rescale: {
      slope: slope !== undefined && slope !== 0 ? slope : 1,
      intercept: readNumber(dataSet, 'x00281052') ?? 0,
    },
    windows: readWindows(dataSet),
    voiLutFunction: readVoiLutFunction(dataSet),
    spacing: pickFilmSpacing(readSpacingAttributes(dataSet)),
    burnedInAnnotation: readBurnedInAnnotation(dataSet),
  }
}
