import dcmjs from 'dcmjs'
import type { WindowLevel } from '../images/decoded-film'
import { phantomMmPerPixel, type PhantomParams } from './phantom-params'

const { DicomDict, DicomMetaDictionary } = dcmjs.data

// Digital X-Ray Image Storage – For Presentation (PS3.4 Annex B.5).
const DX_FOR_PRESENTATION = '1.2.840.10008.5.1.4.1.1.1.1'
const EXPLICIT_VR_LITTLE_ENDIAN = '1.2.840.10008.1.2.1'
// A UID root under the UUID-derived arc 2.25 (PS3.5 §B.2), so it collides with no registry.
const IMPLEMENTATION_CLASS_UID = '2.25.176110364137302829916342113465236474437'

const SERIES_BY_VIEW: Record<PhantomParams['view'], string> = {
  'lateral-neutral': 'LUMBAR SPINE LAT',
  'lateral-flexion': 'LUMBAR SPINE LAT FLEXION',
  'lateral-extension': 'LUMBAR SPINE LAT EXTENSION',
  'lateral-standing-long': 'WHOLE SPINE LAT STANDING LONG',
  ap: 'LUMBAR SPINE AP',
}

/**
 * A 16-bit MONOCHROME2 DX file of the phantom (Explicit VR Little Endian) written with dcmjs.
 * Pixel Spacing is the spacing at the spine, calibrated by geometry; Imager Pixel Spacing and the
 * magnification factor are the detector's, so each rung of the spacing order can be tested.
 * Patient data is invented.
 */
export function writePhantomDicom(
  pixels: Uint16Array,
  params: PhantomParams,
  window: WindowLevel,
): Buffer {
  const spacing = phantomMmPerPixel(params)
  const sopInstanceUid = DicomMetaDictionary.uid()
  const dataset = {
    _vrMap: { PixelData: 'OW' },
    SOPClassUID: DX_FOR_PRESENTATION,
    SOPInstanceUID: sopInstanceUid,
    StudyInstanceUID: DicomMetaDictionary.uid(),
    SeriesInstanceUID: DicomMetaDictionary.uid(),
    StudyDate: params.studyDate,
    SeriesDate: params.studyDate,
    AcquisitionDate: params.studyDate,
    ContentDate: params.studyDate,
    Modality: 'DX',
    Manufacturer: 'Endplate phantom generator',
    PatientName: params.patient.name,
    PatientID: params.patient.id,
    PatientBirthDate: params.patient.birthDate,
    PatientSex: params.patient.sex,
    BodyPartExamined: 'LSPINE',
    ViewPosition: params.view === 'ap' ? 'AP' : 'LL',
    // Which patient sides the image's edges show (PS3.3 C.7.6.1.1.1); written for AP films.
    ...(params.view === 'ap' && params.frontal.patientOrientation
      ? { PatientOrientation: params.frontal.patientOrientation }
      : {}),
    SeriesDescription: params.seriesDescription || SERIES_BY_VIEW[params.view],
    ImageType: ['DERIVED', 'SECONDARY'],
    PresentationIntentType: 'FOR PRESENTATION',
    BurnedInAnnotation: 'NO',
    SamplesPerPixel: 1,
    PhotometricInterpretation: 'MONOCHROME2',
    Rows: params.heightPx,
    Columns: params.widthPx,
    BitsAllocated: 16,
    BitsStored: 16,
    HighBit: 15,
    PixelRepresentation: 0,
    PixelSpacing: [spacing, spacing],
    PixelSpacingCalibrationType: 'GEOMETRY',
    PixelSpacingCalibrationDescription:
      'Phantom: detector pitch divided by the magnification at the spine',
    ImagerPixelSpacing: [params.detectorPixelMm, params.detectorPixelMm],
    EstimatedRadiographicMagnificationFactor: params.magnification,
    RescaleIntercept: 0,
    RescaleSlope: 1,
    RescaleType: 'US',
    WindowCenter: [Math.round(window.center)],
    WindowWidth: [Math.round(window.width)],
    VOILUTFunction: 'LINEAR',
    PixelData: [pixels.buffer.slice(pixels.byteOffset, pixels.byteOffset + pixels.byteLength)],
  }
  const meta = {
    FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
    MediaStorageSOPClassUID: DX_FOR_PRESENTATION,
    MediaStorageSOPInstanceUID: sopInstanceUid,
    TransferSyntaxUID: EXPLICIT_VR_LITTLE_ENDIAN,
    ImplementationClassUID: IMPLEMENTATION_CLASS_UID,
    ImplementationVersionName: 'ENDPLATE',
  }
  const dict = new DicomDict(DicomMetaDictionary.denaturalizeDataset(meta))
  dict.dict = DicomMetaDictionary.denaturalizeDataset(dataset)
  return Buffer.from(dict.write())
}
