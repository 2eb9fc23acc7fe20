/**
 * De-identification of a DICOM film per DICOM PS3.15 Annex E (Basic Application Level
 * Confidentiality Profile): a phantom film with invented identity written into the attributes
 * the profile names (and a private one) comes out with none of it in any byte, and still parses
 * and decodes to the same pixels and spacing.
 */
import { beforeAll, describe, expect, it } from 'vitest'
import dcmjs from 'dcmjs'
import dicomParser from 'dicom-parser'
import { generatePhantom, phantomDicom } from '../../../../server/phantom/generate-phantom'
import { decodeDicom } from '../../../../server/images/dicom/decode-dicom'
import {
  deidentifyDicom,
  replacementUid,
  unknownProfileKeywords,
} from '../../../../server/images/dicom/deidentify-dicom'

const { DicomDict, DicomMessage, DicomMetaDictionary } = dcmjs.data

const IDENTITY = {
  name: 'QUENNEVILLE^OTTOLINE',
  id: 'MRN-778812',
  birthDate: '19610423',
  studyDate: '20260110',
  institution: 'Harrowgate Infirmary',
  referrer: 'FARTHINGALE^DESMOND',
  operator: 'PELLINGTON^RUE',
  accession: 'ACC-55102',
  otherId: 'NHS-9931177',
  privateNote: 'Quenneville bed 12',
}

let original: Buffer
let originalUids: string[]

/** The phantom's DICOM with identifying attributes added where hospitals put them. */
async function identifiedFilm(burnedIn = 'NO'): Promise<Buffer> {
  const film = await generatePhantom({
    widthPx: 375,
    heightPx: 420,
    detectorPixelMm: 1.2,
    patient: { name: IDENTITY.name, id: IDENTITY.id, birthDate: IDENTITY.birthDate, sex: 'F' },
    studyDate: IDENTITY.studyDate,
  })
  const bytes = phantomDicom(film)
  const file = DicomMessage.readFile(
    bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer,
  )
  const dataset = DicomMetaDictionary.naturalizeDataset(file.dict)
  Object.assign(dataset, {
    InstitutionName: IDENTITY.institution,
    InstitutionAddress: `${IDENTITY.institution}, Lower Wharf Road`,
    ReferringPhysicianName: IDENTITY.referrer,
    OperatorsName: IDENTITY.operator,
    AccessionNumber: IDENTITY.accession,
    OtherPatientIDs: IDENTITY.otherId,
    PatientAge: '065Y',
    PatientAddress: '4 Gullet Lane',
    StudyDescription: `Lumbar film for ${IDENTITY.name}`,
    ImageComments: `Patient ${IDENTITY.id} could not stand`,
    StudyTime: '101502',
    BurnedInAnnotation: burnedIn,
    ReferencedImageSequence: [
      {
        ReferencedSOPClassUID: '1.2.840.10008.5.1.4.1.1.1.1',
        ReferencedSOPInstanceUID: '1.2.3.4.5.6.7.8.9',
      },
    ],
  })
  file.dict = DicomMetaDictionary.denaturalizeDataset(dataset)
  // A private block, where vendors keep what they like.
  file.dict['00090010'] = { vr: 'LO', Value: ['ACME_PRIVATE'] }
  file.dict['00091001'] = { vr: 'LO', Value: [IDENTITY.privateNote] }
  const out = new DicomDict(file.meta)
  out.dict = file.dict
  return Buffer.from(out.write())
}

const studyCode = 'EP-7QX4KD'
const secret = 'test-secret-for-uids'

beforeAll(async () => {
  original = await identifiedFilm()
  const parsed = dicomParser.parseDicom(new Uint8Array(original))
  originalUids = ['x0020000d', 'x0020000e', 'x00080018'].map((tag) => parsed.string(tag)!)
}, 60_000)

describe('deidentifyDicom (DICOM PS3.15 Annex E basic profile)', () => {
  it('leaves no byte of the identity: name, record number, birth date, dates, staff, institution, private data, UIDs', () => {
    const text = deidentifyDicom(original, { studyCode, uidSecret: secret }).toString('latin1')
    const needles = [
      'QUENNEVILLE',
      'Quenneville',
      'OTTOLINE',
      IDENTITY.id,
      IDENTITY.birthDate,
      '1961-04-23',
      IDENTITY.studyDate,
      IDENTITY.institution,
      'Lower Wharf',
      'FARTHINGALE',
      'PELLINGTON',
      IDENTITY.accession,
      IDENTITY.otherId,
      'Gullet',
      '065Y',
      '101502',
      'ACME_PRIVATE',
      '1.2.3.4.5.6.7.8.9',
      ...originalUids,
    ]
    for (const needle of needles) expect(text).not.toContain(needle)
    // Checked against the unprocessed file, so the search itself is known to work.
    const before = original.toString('latin1')
    for (const needle of ['QUENNEVILLE', IDENTITY.id, IDENTITY.birthDate, IDENTITY.privateNote]) {
      expect(before).toContain(needle)
    }
  })

  it('still parses and decodes to the same pixels and spacing', async () => {
    const cleaned = deidentifyDicom(original, { studyCode, uidSecret: secret })
    const [before, after] = await Promise.all([decodeDicom(original), decodeDicom(cleaned)])
    expect(after.width).toBe(before.width)
    expect(after.height).toBe(before.height)
    expect(Buffer.from(after.pixels.buffer).equals(Buffer.from(before.pixels.buffer))).toBe(true)
    expect(after.header?.spacing).toEqual(before.header?.spacing)
    // An independent parser agrees on what the file now says.
    const parsed = dicomParser.parseDicom(new Uint8Array(cleaned))
    expect(parsed.string('x00100010')).toBe(studyCode)
    expect(parsed.string('x00100020')).toBe(studyCode)
    expect(parsed.string('x00100040')).toBe('F')
    expect(parsed.string('x00120062')).toBe('YES')
    expect(parsed.string('x00080016')).toBe('1.2.840.10008.5.1.4.1.1.1.1')
    expect(parsed.string('x00020003')).toBe(parsed.string('x00080018'))
    expect(parsed.elements.x00100030?.length ?? 0).toBe(0)
    expect(parsed.elements.x00091001).toBeUndefined()
  })

  it('replaces UIDs consistently under 2.25, so films of one study still belong together', () => {
    const a = dicomParser.parseDicom(
      new Uint8Array(deidentifyDicom(original, { studyCode, uidSecret: secret })),
    )
    const b = dicomParser.parseDicom(
      new Uint8Array(deidentifyDicom(original, { studyCode, uidSecret: secret })),
    )
    const study = a.string('x0020000d')!
    expect(study).toBe(replacementUid(originalUids[0]!, secret))
    expect(b.string('x0020000d')).toBe(study)
    expect(study).toMatch(/^2\.25\.\d{1,39}$/)
    expect(replacementUid(originalUids[0]!, 'another secret')).not.toBe(study)
  })

  it('refuses a film that declares burned-in annotation', async () => {
    const burned = await identifiedFilm('YES')
    expect(() => deidentifyDicom(burned, { studyCode, uidSecret: secret })).toThrow(/burned-in/)
  })

  it("names only attributes dcmjs's dictionary knows", () => {
    expect(unknownProfileKeywords()).toEqual([])
  })
})
