// dcmjs ships no types (its TypeScript port was never finished); this declares only the part the
// phantom writer, the de-identifier and the tests use: naturalized datasets in, Part 10 bytes out.
declare module 'dcmjs' {
  type NaturalDataset = Record<string, unknown>
  type DenaturalizedDataset = Record<string, { vr: string; Value: unknown[] }>

  interface DicomDictInstance {
    meta: DenaturalizedDataset
    dict: DenaturalizedDataset
    write(options?: { allowInvalidVRLength?: boolean }): ArrayBuffer
  }

  interface Dcmjs {
    data: {
      DicomDict: new (meta: DenaturalizedDataset) => DicomDictInstance
      DicomMetaDictionary: {
        uid(): string
        /** Keyword → dictionary entry; `tag` is written "(gggg,eeee)". */
        nameMap: Record<string, { tag: string; vr: string; name: string; version: string }>
        naturalizeDataset(dataset: DenaturalizedDataset): NaturalDataset
        denaturalizeDataset(dataset: NaturalDataset): DenaturalizedDataset
      }
      DicomMessage: {
        readFile(buffer: ArrayBuffer): { meta: DenaturalizedDataset; dict: DenaturalizedDataset }
      }
    }
    anonymizer: {
      /** Empties dcmjs's own list of identifying tags; `replacements` maps "ggggeeee" to a value. */
      cleanTags(dict: DenaturalizedDataset, replacements?: Record<string, string>): void
    }
  }

  const dcmjs: Dcmjs
  export = dcmjs
}
