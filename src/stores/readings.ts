import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { ImageRecord, SessionUser, Visit } from '@shared/types/api'
import type { Reading } from '@shared/types/readings'
import { templateLandmarks, templateNeedsPairedImage } from '@shared/readings/templates'
import { readingActionRefusal, type ReadingAction } from '@shared/readings/reading-status'
import {
  amendReading,
  getReading,
  patchReading,
  returnReading,
  signReading,
  submitReading,
} from '@/api/readings'
import { getVisit } from '@/api/visits'
import { calibrateImage } from '@/api/images'
import { ApiError } from '@/api/http'
import { useAutosave } from '@/composables/use-autosave'
import { openReading, type BlindContext } from '@/utils/open-reading'
import type { FilmSide } from '@/utils/landmark-snapshot'
import { useReadingEditorStore } from './reading-editor'
import { useReadingCommentsStore } from './reading-comments'

function messageOf(caught: unknown): string {
  return caught instanceof Error ? caught.message : String(caught)
}

/**
 * The reading open in the workspace as the server holds it: the reading with its films, who may
 * do what with it, its autosave, submission, sign-off and the readings an amendment links. The
 * landmarks being edited live in `reading-editor`, which changes on every pointer move; this
 * store changes only when the server answers, and saves what the editor holds.
 */
export const useReadingsStore = defineStore('readings', () => {
  const editor = useReadingEditorStore()
  const thread = useReadingCommentsStore()

  const reading = ref<Reading | null>(null)
  const film = ref<ImageRecord | null>(null)
  const pairedFilm = ref<ImageRecord | null>(null)
  const visit = ref<Visit | null>(null)
  const loadError = ref<string | null>(null)
  /** Set while the reading is one of a blinded round's: no patient, visit or date is fetched. */
  const blind = ref<BlindContext | null>(null)
  /** For an amended reading: the amendment that replaces (or will replace) it. */
  const amendment = ref<Reading | null>(null)
  /** For an amendment: the signed reading it amends. */
  const amended = ref<Reading | null>(null)

  const specs = computed(() =>
    reading.value ? templateLandmarks(reading.value.template, reading.value.options) : [],
  )
  const isPair = computed(() =>
    reading.value ? templateNeedsPairedImage(reading.value.template) : false,
  )
  /** Who looks at the reading: what they may do follows the shared rules the server enforces. */
  const viewer = ref<Pick<SessionUser, 'id' | 'role'> | null>(null)
  function allows(action: ReadingAction): boolean {
    return (
      reading.value !== null &&
      viewer.value !== null &&
      readingActionRefusal(action, reading.value, viewer.value) === null
    )
  }
  /** Only the rater changes landmarks, and only while the reading is a draft or returned. */
  const readOnly = computed(() => !allows('edit'))
  const canSign = computed(() => allows('sign'))
  const canReturn = computed(() => allows('return'))
  const canAmend = computed(() => allows('amend'))

  const autosave = useAutosave<Reading>({
    canSave: () => reading.value !== null && !readOnly.value,
    send: async () => {
      const current = reading.value as Reading
      const body = { ...editor.draft(), version: current.version }
      reading.value = await patchReading(current.id, body)
    },
    fetchTheirs: () => (reading.value ? getReading(reading.value.id) : null),
  })
  const canSubmit = computed(
    () =>
      !readOnly.value && editor.submitBlocked === null && autosave.saveState.value !== 'conflict',
  )

  /** The editor changed the landmarks: autosave them. */
  function noteEdit(): void {
    autosave.markEdited()
  }

  function adopt(loaded: Reading): void {
    reading.value = loaded
    editor.hydrate(loaded)
  }

  async function load(readingId: number, blindContext: BlindContext | null = null): Promise<void> {
    reset()
    const opened = await openReading(readingId, blindContext)
    if ('error' in opened) {
      loadError.value = opened.error
      return
    }
    const loaded = opened.reading
    blind.value = opened.blind
    adopt(loaded)
    film.value = opened.film
    pairedFilm.value = opened.pairedFilm
    if (opened.blind) return
    void loadRelated(loaded)
    // The patient context is a courtesy: it arrives when it arrives, and the film does not wait.
    void getVisit(opened.film.visitId)
      .then((found) => {
        if (reading.value?.id === loaded.id) visit.value = found
      })
      .catch(() => undefined)
  }

  /** The other end of an amendment, so both readings say what replaced what, and why. */
  async function loadRelated(loaded: Reading): Promise<void> {
    const [next, previous] = await Promise.all([
      loaded.supersededById === null ? null : getReading(loaded.supersededById).catch(() => null),
      loaded.supersedesId === null ? null : getReading(loaded.supersedesId).catch(() => null),
    ])
    if (reading.value?.id !== loaded.id) return
    amendment.value = next
    amended.value = previous
  }

  /**
   * Sign-off calls: on success the reading is the server's answer; a 409 (changed meanwhile)
   * loads the current reading before the message reaches the caller.
   */
  async function review(call: (current: Reading) => Promise<Reading>): Promise<void> {
    const current = reading.value
    if (!current) return
    try {
      const updated = await call(current)
      adopt(updated)
      void loadRelated(updated)
    } catch (caught) {
      if (caught instanceof ApiError && caught.status === 409) {
        const fresh = await getReading(current.id).catch(() => null)
        if (fresh && reading.value?.id === current.id) adopt(fresh)
      }
      throw caught
    }
  }

  const sign = () => review((current) => signReading(current.id, current.version))

  async function returnToRater(comment: string): Promise<void> {
    await review((current) => returnReading(current.id, { version: current.version, comment }))
    // The comment the reviewer left now heads the thread.
    if (reading.value) await thread.load(reading.value.id).catch(() => undefined)
  }

  /** Starts an amendment of the signed reading; answers the new draft's id. */
  async function amend(reason: string): Promise<number | null> {
    const current = reading.value
    if (!current) return null
    return (await amendReading(current.id, { reason })).id
  }

  /** Conflict: take the other version; ours stays one Undo away. */
  function loadTheirs(): void {
    const theirs = autosave.conflict.value
    if (!theirs) return
    editor.keepForUndo()
    adopt(theirs)
    autosave.acceptTheirs()
  }

  /** Conflict: keep our landmarks and save them on top of the other version. */
  async function overwriteTheirs(): Promise<void> {
    const theirs = autosave.conflict.value
    if (!theirs || !reading.value) return
    reading.value = { ...theirs }
    await autosave.keepMine()
  }

  async function submit(): Promise<void> {
    if (!canSubmit.value || !reading.value) return
    if (autosave.dirty.value) await autosave.save()
    if (autosave.dirty.value || autosave.saveState.value !== 'saved' || !reading.value) return
    try {
      reading.value = await submitReading(reading.value.id, reading.value.version)
    } catch (caught) {
      if (caught instanceof ApiError && caught.status === 409) {
        await autosave.enterConflict('The reading changed before it could be submitted.')
        return
      }
      autosave.saveMessage.value = messageOf(caught)
      throw caught
    }
  }

  /** Manual calibration of one film; the new spacing reaches the results at once. */
  async function calibrate(
    side: FilmSide,
    line: [[number, number], [number, number]],
    lengthMm: number,
  ): Promise<void> {
    const target = side === 'primary' ? film : pairedFilm
    if (!target.value) return
    target.value = await calibrateImage(target.value.id, {
      line,
      lengthMm,
      version: target.value.version,
    })
    // The server computes the stored results with the film's spacing: save again to refresh them.
    if (!readOnly.value) autosave.saveSoon()
  }

  function reset(): void {
    autosave.reset()
    editor.reset()
    thread.reset()
    reading.value = null
    film.value = null
    pairedFilm.value = null
    visit.value = null
    blind.value = null
    loadError.value = null
    amendment.value = null
    amended.value = null
  }

  return {
    reading,
    film,
    pairedFilm,
    visit,
    blind,
    loadError,
    amendment,
    amended,
    viewer,
    specs,
    isPair,
    readOnly,
    canSign,
    canReturn,
    canAmend,
    canSubmit,
    saveState: autosave.saveState,
    saveMessage: autosave.saveMessage,
    conflict: autosave.conflict,
    lastSavedAt: autosave.lastSavedAt,
    dirty: autosave.dirty,
    noteEdit,
    load,
    save: autosave.save,
    retryNow: autosave.retryNow,
    loadTheirs,
    overwriteTheirs,
    submit,
    sign,
    returnToRater,
    amend,
    calibrate,
    reset,
  }
})
