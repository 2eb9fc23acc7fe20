import dcmjs from 'dcmjs'

const { DicomDict, DicomMetaDictionary } = dcmjs.data

export interface TestDicomOptions {
  width?: number
  height?: number
  /** Stored words, row by row: Uint16Array, or Int16Array for signed data. */
  pixels?: Uint16Array | Int16Array
  attributes?: Record<string, unknown>
}

/**
 * A small DX file written by dcmjs (Explicit VR Little Endian), so the tests read with
 * dicom-parser what a second, independent library wrote.
 */
export function writeTestDicom(options: TestDicomOptions = {}): Buffer {
  const width = options.width ?? 4
  const height = options.height ?? 3
  const pixels = options.pixels ?? new Uint16Array(width * height).map((_, i) => i * 100)
  const sopInstanceUid = DicomMetaDictionary.uid()
  const dataset = {
    _vrMap: { PixelData: 'OW' },
    SOPClassUID: '1.2.840.10008.5.1.4.1.1.1.1',
    SOPInstanceUID: sopInstanceUid,
    StudyInstanceUID: DicomMetaDictionary.uid(),
    SeriesInstanceUID: DicomMetaDictionary.uid(),
    Modality: 'DX',
    PatientName: 'PHANTOM^LUMBAR',
    PatientID: 'PH-TEST-1',
    PatientBirthDate: '19700101',
    PatientSex: 'O',
    StudyDate: '20260102',
    AcquisitionDate: '20260103',
    Rows: height,
    Columns: width,
    SamplesPerPixel: 1,
    PhotometricInterpretation: 'MONOCHROME2',
    BitsAllocated: 16,
    BitsStored: 16,
    HighBit: 15,
    PixelRepresentation: pixels instanceof Int16Array ? 1 : 0,
    ...options.attributes,
    PixelData: [pixels.buffer.slice(pixels.byteOffset, pixels.byteOffset + pixels.byteLength)],
  }
  const meta = {
    FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
    MediaStorageSOPClassUID: dataset.SOPClassUID,
    MediaStorageSOPInstanceUID: sopInstanceUid,
    TransferSyntaxUID: '1.2.840.10008.1.2.1',
    ImplementationClassUID: '2.25.1',
  }
  const dict = new DicomDict(DicomMetaDictionary.denaturalizeDataset(meta))
  dict.dict = DicomMetaDictionary.denaturalizeDataset(dataset)
  return Buffer.from(dict.write())
}
