import { createHmac } from 'node:crypto'
import dcmjs from 'dcmjs'
import {
  PROFILE_ACTIONS,
  RETAINED_PATIENT_CHARACTERISTICS,
  type ProfileAction,
} from './confidentiality-profile'

const { DicomDict, DicomMessage, DicomMetaDictionary } = dcmjs.data

type Element = { vr: string; Value: unknown[] }
type Dataset = Record<string, Element>

/** "(0010,0010)" → "00100010", the key of a denaturalized dataset. */
const tagKey = (tag: string) => tag.replace(/[(),]/g, '').toUpperCase()

/** A keyword's dictionary entry; dcmjs files retired attributes under RETIRED_keyword. */
const entryOf = (keyword: string) =>
  DicomMetaDictionary.nameMap[keyword] ?? DicomMetaDictionary.nameMap[`RETIRED_${keyword}`]

/** Tag key → action, from the keyword table (resolved once through dcmjs's dictionary). */
const ACTIONS_BY_TAG: ReadonlyMap<string, ProfileAction> = new Map(
  [...PROFILE_ACTIONS].flatMap(([keyword, action]) => {
    const entry = entryOf(keyword)
    return entry ? [[tagKey(entry.tag), action] as const] : []
  }),
)

const RETAINED = new Set(
  RETAINED_PATIENT_CHARACTERISTICS.map((keyword) =>
    tagKey(DicomMetaDictionary.nameMap[keyword]!.tag),
  ),
)

/** Keywords of the table that dcmjs's dictionary does not know (a typo would hide here). */
export function unknownProfileKeywords(): string[] {
  return [...PROFILE_ACTIONS.keys()].filter((keyword) => !entryOf(keyword))
}

export class DicomDeidentificationError extends Error {}

export interface DeidentifyOptions {
  /** The patient's pseudonym, written as Patient Name and Patient ID. */
  studyCode: string
  /** Secret that keys the UID mapping, so new UIDs cannot be traced back without it. */
  uidSecret: string
}

/**
 * A new UID for an original one, the same every time for the same original (so the films of one
 * study still share their Study Instance UID), under the 2.25 UUID arc (PS3.5 §B.2): 2.25 and the
 * decimal of 128 bits of HMAC-SHA-256 of the original.
 */
export function replacementUid(original: string, secret: string): string {
  const digest = createHmac('sha256', secret).update(`dicom-uid:${original}`).digest()
  return `2.25.${BigInt(`0x${digest.subarray(0, 16).toString('hex')}`).toString(10)}`
}

/** Class and transfer syntax UIDs of the standard (1.2.840.10008.…) identify nothing. */
const isStandardUid = (uid: string) => uid.startsWith('1.2.840.10008.')

function isPrivate(key: string): boolean {
  return parseInt(key.slice(0, 4), 16) % 2 === 1
}

/** Overlay and curve groups (50xx, 60xx) can carry annotations drawn by hand. */
function isOverlayOrCurve(key: string): boolean {
  const group = parseInt(key.slice(0, 4), 16)
  return (group >= 0x5000 && group <= 0x50ff) || (group >= 0x6000 && group <= 0x60ff)
}

function cleanDataset(dataset: Dataset, options: DeidentifyOptions): void {
  for (const key of Object.keys(dataset)) {
    const element = dataset[key]!
    if (isPrivate(key) || isOverlayOrCurve(key)) {
      delete dataset[key]
      continue
    }
    if (RETAINED.has(key)) continue
    const action = ACTIONS_BY_TAG.get(key) ?? actionByVr(element.vr)
    switch (action) {
      case 'X':
        delete dataset[key]
        break
      case 'Z':
        element.Value = []
        break
      case 'D':
        element.Value = [options.studyCode]
        break
      case 'U':
        element.Value = element.Value.map((uid) =>
          typeof uid === 'string' && uid !== '' && !isStandardUid(uid)
            ? replacementUid(uid, options.uidSecret)
            : uid,
        )
        break
      default:
        if (element.vr === 'SQ') {
          for (const item of element.Value as Dataset[]) cleanDataset(item, options)
        }
    }
  }
}

/**
 * The safety net under the table: every person name and every date, time or date-time is
 * removed, and every UID replaced, whatever attribute holds it.
 */
function actionByVr(vr: string): ProfileAction | 'K' {
  if (vr === 'PN' || vr === 'DA' || vr === 'DT' || vr === 'TM') return 'X'
  if (vr === 'UI') return 'U'
  return 'K'
}

/**
 * A DICOM Part 10 file de-identified per the Basic Application Level Confidentiality Profile of
 * DICOM PS3.15 Annex E, with the Retain Patient Characteristics Option for sex: dcmjs's
 * anonymizer first, then the profile's table, private attributes and overlays removed, UIDs
 * replaced consistently, and the de-identification recorded in the file (Patient Identity
 * Removed, De-identification Method and its codes, PS3.16 CID 7050). Pixel data, pixel spacing
 * and everything else needed to display and measure the film are kept as they are. Burned-in
 * annotation cannot be removed from pixels here: a file that declares it is refused.
 */
export function deidentifyDicom(bytes: Uint8Array, options: DeidentifyOptions): Buffer {
  const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength)
  const file = DicomMessage.readFile(buffer as ArrayBuffer)
  const dict = file.dict as Dataset
  const burnedIn = dict['00280301']?.Value?.[0]
  if (typeof burnedIn === 'string' && burnedIn.trim().toUpperCase() === 'YES') {
    throw new DicomDeidentificationError(
      'The film declares burned-in annotation, which may show identity in the pixels; it cannot be released de-identified.',
    )
  }
  // dcmjs's list empties the patient's sex too; the option keeps it, so it is put back after.
  const retained = [...RETAINED].flatMap((key) =>
    dict[key] ? [[key, structuredClone(dict[key])] as const] : [],
  )
  dcmjs.anonymizer.cleanTags(file.dict, {
    '00100010': options.studyCode,
    '00100020': options.studyCode,
  })
  for (const [key, element] of retained) dict[key] = element
  cleanDataset(dict, options)
  dict['00120062'] = { vr: 'CS', Value: ['YES'] }
  dict['00120063'] = {
    vr: 'LO',
    Value: ['DICOM PS3.15 Annex E Basic Profile; Retain Patient Characteristics Option'],
  }
  dict['00120064'] = {
    vr: 'SQ',
    Value: [
      ['113100', 'Basic Application Confidentiality Profile'],
      ['113108', 'Retain Patient Characteristics Option'],
    ].map(([code, meaning]) => ({
      '00080100': { vr: 'SH', Value: [code] },
      '00080102': { vr: 'SH', Value: ['DCM'] },
      '00080104': { vr: 'LO', Value: [meaning] },
    })),
  }
  dict['00280303'] = { vr: 'CS', Value: ['REMOVED'] }

  const meta = file.meta as Dataset
  for (const key of Object.keys(meta)) {
    if (key === '00020016' || key === '00020017' || key === '00020018' || key === '00020100') {
      // Source, sending and receiving AE titles, private information creator: who and where.
      delete meta[key]
    }
  }
  const sopInstance = dict['00080018']?.Value?.[0]
  if (typeof sopInstance === 'string') meta['00020003'] = { vr: 'UI', Value: [sopInstance] }
  const out = new DicomDict(file.meta)
  out.dict = file.dict
  return Buffer.from(out.write())
}
