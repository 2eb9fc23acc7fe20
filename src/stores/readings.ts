import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { ImageRecord, SessionUser, Visit } from '@shared/types/api'
import type { PixelPoint } from '@shared/types/landmarks'
import type {
  Reading,
  ReadingComment,
  SuggestionAcceptance,
  SuggestionUse,
} from '@shared/types/readings'
import { templateLandmarks, templateNeedsPairedImage } from '@shared/readings/templates'
import { readingActionRefusal, type ReadingAction } from '@shared/readings/reading-status'
import { missingRequiredLandmarks, submitRefusal } from '@shared/readings/reading-rules'
import {
  addReadingComment,
  amendReading,
  getReading,
  listReadingComments,
  patchReading,
  returnReading,
  signReading,
  submitReading,
} from '@/api/readings'
import { getVisit } from '@/api/visits'
import { calibrateImage, getImage } from '@/api/images'
import { getAssignmentFilm } from '@/api/assignments'
import { ApiError } from '@/api/http'
import { blindedFilmRecord } from '@/utils/blinded-film'

export type SaveState = 'saved' | 'saving' | 'unsaved' | 'offline' | 'conflict' | 'error'
/** Which film of the reading: the image, or the paired (extension) image of a motion pair. */
export type FilmSide = 'primary' | 'paired'
export type PointMap = Record<string, PixelPoint>

/** A reading opened from a re-reading assignment: what the blinded workspace shows instead. */
export interface BlindContext {
  assignmentId: number
  blindCode: string
  roundName: string
  /** False: no results, on the panel or the film, until the reading is submitted. */
  showResultsBeforeSubmit: boolean
}

interface Snapshot {
  points: PointMap
  pairedPoints: PointMap
  accepted: SuggestionAcceptance
  pairedAccepted: SuggestionAcceptance
}

/** A corner the image suggests for a placed landmark, waiting for the rater's Enter or Escape. */
export interface PendingSuggestion {
  name: string
  side: FilmSide
  /** Where the rater put the landmark (the suggestion stands only while it is still there). */
  from: PixelPoint
  /** The suggested corner, image px. */
  at: PixelPoint
}

/** Quiet time after the last edit before a draft is sent. */
export const AUTOSAVE_DELAY_MS = 800
/** Waits between retries while the server cannot be reached; the last one repeats. */
export const RETRY_DELAYS_MS = [1000, 2000, 4000, 8000, 15000, 30000] as const

const RETRYABLE_STATUSES = new Set([0, 502, 503, 504])

function copyPoints(points: PointMap): PointMap {
  const copy: PointMap = {}
  for (const [name, [x, y]] of Object.entries(points)) copy[name] = [x, y]
  return copy
}

function samePoints(a: PointMap, b: PointMap): boolean {
  const names = Object.keys(a)
  if (names.length !== Object.keys(b).length) return false
  return names.every((name) => {
    const other = b[name]
    const mine = a[name] as PixelPoint
    return other !== undefined && other[0] === mine[0] && other[1] === mine[1]
  })
}

function sameAcceptance(a: SuggestionAcceptance, b: SuggestionAcceptance): boolean {
  const names = Object.keys(a)
  return names.length === Object.keys(b).length && names.every((name) => a[name] === b[name])
}

function messageOf(caught: unknown): string {
  return caught instanceof Error ? caught.message : String(caught)
}

export const useReadingsStore = defineStore('readings', () => {
  const reading = ref<Reading | null>(null)
  const film = ref<ImageRecord | null>(null)
  const pairedFilm = ref<ImageRecord | null>(null)
  const visit = ref<Visit | null>(null)
  const loadError = ref<string | null>(null)
  /** Set while the reading is one of a blinded round's: no patient, visit or date is fetched. */
  const blind = ref<BlindContext | null>(null)

  const points = ref<PointMap>({})
  const pairedPoints = ref<PointMap>({})
  const activeSide = ref<FilmSide>('primary')
  const selectedName = ref<string | null>(null)
  /** False after Escape: clicks on the film no longer place the next landmark. */
  const placing = ref(true)
  /** A row picked in the checklist (or by Tab): the next click on the film re-places it. */
  const replacing = ref<string | null>(null)
  /** Per landmark: accepted the image's suggestion (true) or kept their own point beside one. */
  const accepted = ref<SuggestionAcceptance>({})
  const pairedAccepted = ref<SuggestionAcceptance>({})
  const suggestion = ref<PendingSuggestion | null>(null)
  const undoStack = ref<Snapshot[]>([])
  const redoStack = ref<Snapshot[]>([])

  const saveState = ref<SaveState>('saved')
  const saveMessage = ref<string | null>(null)
  /** The other version when a save met a newer one (409). */
  const conflict = ref<Reading | null>(null)
  const lastSavedAt = ref<Date | null>(null)
  /** True while local landmarks differ from what the server last accepted. */
  const dirty = ref(false)
  /** True between pointer-down and pointer-up on a landmark. */
  const dragging = ref(false)

  let editRevision = 0
  let saveTimer: ReturnType<typeof setTimeout> | null = null
  let retryAttempt = 0
  let inFlight: Promise<void> | null = null
  let dragStart: Snapshot | null = null

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
  /** The reading's thread, oldest first (null until loaded, and for roles that see none). */
  const comments = ref<ReadingComment[] | null>(null)
  /** For an amended reading: the amendment that replaces (or will replace) it. */
  const amendment = ref<Reading | null>(null)
  /** For an amendment: the signed reading it amends. */
  const amended = ref<Reading | null>(null)
  const sidePoints = (side: FilmSide) => (side === 'primary' ? points : pairedPoints)
  const activePoints = computed(() => sidePoints(activeSide.value).value)
  /** The first landmark of the checklist not yet placed on the active film. */
  const nextName = computed(
    () => specs.value.find((spec) => !(spec.name in activePoints.value))?.name ?? null,
  )
  /** The reading as the shared rules see it (shared/readings/reading-rules, as the server). */
  const ruleInput = computed(() =>
    reading.value
      ? {
          template: reading.value.template,
          options: reading.value.options,
          points: points.value,
          pairedPoints: isPair.value ? pairedPoints.value : null,
        }
      : null,
  )
  const missingRequired = computed(() =>
    ruleInput.value ? missingRequiredLandmarks(ruleInput.value).map((item) => item.name) : [],
  )
  /** Why Submit is refused now, in the server's words; null when it may be submitted. */
  const submitBlocked = computed(() =>
    ruleInput.value ? (submitRefusal(ruleInput.value)?.message ?? null) : null,
  )
  const canSubmit = computed(
    () => !readOnly.value && submitBlocked.value === null && saveState.value !== 'conflict',
  )
  const canUndo = computed(() => !readOnly.value && undoStack.value.length > 0)
  const canRedo = computed(() => !readOnly.value && redoStack.value.length > 0)

  function clearTimer(): void {
    if (saveTimer !== null) clearTimeout(saveTimer)
    saveTimer = null
  }

  function scheduleSave(delayMs: number): void {
    clearTimer()
    saveTimer = setTimeout(() => {
      saveTimer = null
      void save()
    }, delayMs)
  }

  function adopt(loaded: Reading): void {
    reading.value = loaded
    points.value = copyPoints(loaded.landmarks.points)
    pairedPoints.value = copyPoints(loaded.pairedLandmarks?.points ?? {})
    accepted.value = { ...loaded.suggestionUse.points }
    pairedAccepted.value = { ...(loaded.suggestionUse.pairedPoints ?? {}) }
    suggestion.value = null
  }

  async function load(readingId: number, blindContext: BlindContext | null = null): Promise<void> {
    reset()
    try {
      const loaded = await getReading(readingId)
      if (loaded.blinded) {
        if (!blindContext) {
          // Opened by its address rather than from the assignment: the film would come through
          // the clinical routes, so the reading is shown only from the worklist.
          loadError.value =
            'This reading belongs to a blinded re-reading round: open it from your worklist.'
          return
        }
        const blindFilm = await getAssignmentFilm(blindContext.assignmentId)
        blind.value = blindContext
        adopt(loaded)
        film.value = blindedFilmRecord(loaded.imageId, blindFilm)
        return
      }
      const [image, paired] = await Promise.all([
        getImage(loaded.imageId),
        loaded.pairedImageId === null ? Promise.resolve(null) : getImage(loaded.pairedImageId),
      ])
      adopt(loaded)
      film.value = image
      pairedFilm.value = paired
      void loadRelated(loaded)
      // The patient context is a courtesy: it arrives when it arrives, and the film does not wait.
      void getVisit(image.visitId)
        .then((found) => {
          if (reading.value?.id === loaded.id) visit.value = found
        })
        .catch(() => undefined)
    } catch (caught) {
      loadError.value =
        caught instanceof ApiError && caught.status === 404
          ? 'This reading does not exist or is not in your studies.'
          : messageOf(caught)
    }
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

  async function loadComments(): Promise<void> {
    const id = reading.value?.id
    if (id === undefined) return
    const loaded = await listReadingComments(id)
    if (reading.value?.id === id) comments.value = loaded
  }

  async function addComment(text: string): Promise<void> {
    const id = reading.value?.id
    if (id === undefined) return
    const created = await addReadingComment(id, { text })
    if (reading.value?.id === id) comments.value = [...(comments.value ?? []), created]
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
    await loadComments().catch(() => undefined)
  }

  /** Starts an amendment of the signed reading; answers the new draft's id. */
  async function amend(reason: string): Promise<number | null> {
    const current = reading.value
    if (!current) return null
    return (await amendReading(current.id, { reason })).id
  }

  function snapshot(): Snapshot {
    return {
      points: copyPoints(points.value),
      pairedPoints: copyPoints(pairedPoints.value),
      accepted: { ...accepted.value },
      pairedAccepted: { ...pairedAccepted.value },
    }
  }

  function restore(state: Snapshot): void {
    points.value = copyPoints(state.points)
    pairedPoints.value = copyPoints(state.pairedPoints)
    accepted.value = { ...state.accepted }
    pairedAccepted.value = { ...state.pairedAccepted }
    suggestion.value = null
  }

  const sideAccepted = (side: FilmSide) => (side === 'primary' ? accepted : pairedAccepted)

  /** A landmark placed anew has no suggestion history until one is offered for it. */
  function forgetSuggestion(name: string, side: FilmSide): void {
    if (suggestion.value?.name === name && suggestion.value.side === side) suggestion.value = null
    if (name in sideAccepted(side).value) {
      const next = { ...sideAccepted(side).value }
      delete next[name]
      sideAccepted(side).value = next
    }
  }

  /**
   * The image's answer for a landmark just placed or dropped: shown only while the landmark is
   * still where it was when asked, and recorded as "own point kept" until the rater accepts.
   */
  function offerSuggestion(offer: PendingSuggestion): void {
    if (readOnly.value) return
    const current = sidePoints(offer.side).value[offer.name]
    if (!current || current[0] !== offer.from[0] || current[1] !== offer.from[1]) return
    suggestion.value = offer
    sideAccepted(offer.side).value = { ...sideAccepted(offer.side).value, [offer.name]: false }
    markEdited()
  }

  /** Enter, or a click on the mark: the landmark moves to the suggestion (one Undo step). */
  function acceptSuggestion(): void {
    const offer = suggestion.value
    if (!offer || readOnly.value) return
    const before = snapshot()
    sidePoints(offer.side).value[offer.name] = [offer.at[0], offer.at[1]]
    sideAccepted(offer.side).value = { ...sideAccepted(offer.side).value, [offer.name]: true }
    suggestion.value = null
    selectedName.value = offer.name
    commitFrom(before)
  }

  /** Escape: the rater's own point stays, as it does when they simply go on. */
  function declineSuggestion(): void {
    suggestion.value = null
  }

  function markEdited(): void {
    editRevision += 1
    dirty.value = true
    if (saveState.value === 'conflict') return
    if (saveState.value !== 'offline' && saveState.value !== 'saving') saveState.value = 'unsaved'
    // While offline the retry timer owns the next attempt.
    if (saveState.value !== 'offline') scheduleSave(AUTOSAVE_DELAY_MS)
  }

  /** One history step from `before` to now; nothing when nothing changed. */
  function commitFrom(before: Snapshot): void {
    if (
      samePoints(before.points, points.value) &&
      samePoints(before.pairedPoints, pairedPoints.value) &&
      sameAcceptance(before.accepted, accepted.value) &&
      sameAcceptance(before.pairedAccepted, pairedAccepted.value)
    )
      return
    undoStack.value.push(before)
    redoStack.value = []
    markEdited()
  }

  function placePoint(name: string, pointPx: PixelPoint, side: FilmSide = activeSide.value): void {
    if (readOnly.value) return
    const before = snapshot()
    suggestion.value = null
    sidePoints(side).value[name] = [pointPx[0], pointPx[1]]
    forgetSuggestion(name, side)
    selectedName.value = name
    replacing.value = null
    commitFrom(before)
  }

  /** Pointer-down on a landmark: remembers where the history step starts. */
  function beginDrag(): void {
    if (readOnly.value) return
    dragStart = snapshot()
    suggestion.value = null
    dragging.value = true
  }

  /** Every pointer move: updates the point (results follow) without a history step. */
  function dragPoint(name: string, pointPx: PixelPoint, side: FilmSide = activeSide.value): void {
    if (readOnly.value || dragStart === null) return
    sidePoints(side).value[name] = [pointPx[0], pointPx[1]]
  }

  /** Pointer-up: one history step for the whole drag. */
  function endDrag(name?: string, side: FilmSide = activeSide.value): void {
    if (dragStart !== null && name !== undefined) {
      const start = side === 'primary' ? dragStart.points[name] : dragStart.pairedPoints[name]
      const now = sidePoints(side).value[name]
      if (!start || !now || start[0] !== now[0] || start[1] !== now[1]) forgetSuggestion(name, side)
    }
    if (dragStart !== null) commitFrom(dragStart)
    dragStart = null
    dragging.value = false
  }

  function removePoint(name: string, side: FilmSide = activeSide.value): void {
    if (readOnly.value || !(name in sidePoints(side).value)) return
    const before = snapshot()
    const next = { ...sidePoints(side).value }
    delete next[name]
    sidePoints(side).value = next
    forgetSuggestion(name, side)
    commitFrom(before)
  }

  function undo(): void {
    const previous = undoStack.value.pop()
    if (!previous || readOnly.value) return
    redoStack.value.push(snapshot())
    restore(previous)
    markEdited()
  }

  function redo(): void {
    const next = redoStack.value.pop()
    if (!next || readOnly.value) return
    undoStack.value.push(snapshot())
    restore(next)
    markEdited()
  }

  /** Selects a landmark (clicking it on the film): a click elsewhere then places the next one. */
  function select(name: string | null, side: FilmSide = activeSide.value): void {
    if (suggestion.value && (suggestion.value.name !== name || suggestion.value.side !== side))
      suggestion.value = null
    selectedName.value = name
    activeSide.value = side
    replacing.value = null
    if (name !== null) placing.value = true
  }

  /** Picks a checklist row: the next click on the film puts that landmark there. */
  function pick(name: string, side: FilmSide = activeSide.value): void {
    select(name, side)
    replacing.value = name
  }

  /** Tab / Shift-Tab: the next or previous checklist row, wrapping round. */
  function selectStep(step: 1 | -1): void {
    const names = specs.value.map((spec) => spec.name)
    if (names.length === 0) return
    const current = selectedName.value === null ? -1 : names.indexOf(selectedName.value)
    const index =
      current === -1
        ? step === 1
          ? 0
          : names.length - 1
        : (current + step + names.length) % names.length
    const name = names[index]
    if (name !== undefined) pick(name)
  }

  /**
   * The landmark a click places: the row the user picked (to place or re-place it), the
   * selected one while it is still unplaced, else the next unplaced one.
   */
  function targetForClick(): string | null {
    if (!placing.value || readOnly.value) return null
    if (replacing.value !== null) return replacing.value
    if (selectedName.value !== null && !(selectedName.value in activePoints.value))
      return selectedName.value
    return nextName.value
  }

  function stopPlacing(): void {
    suggestion.value = null
    placing.value = false
    selectedName.value = null
    replacing.value = null
  }

  function backoffDelay(): number {
    const delay = RETRY_DELAYS_MS[Math.min(retryAttempt, RETRY_DELAYS_MS.length - 1)] as number
    retryAttempt += 1
    return delay
  }

  async function enterConflict(message: string): Promise<void> {
    clearTimer()
    saveState.value = 'conflict'
    saveMessage.value = message
    const id = reading.value?.id
    if (id === undefined) return
    try {
      conflict.value = await getReading(id)
    } catch (caught) {
      saveMessage.value = `${message} The other version could not be loaded: ${messageOf(caught)}`
    }
  }

  async function handleSaveError(caught: unknown): Promise<void> {
    const error = caught instanceof ApiError ? caught : null
    if (error?.status === 409) {
      await enterConflict('Someone else saved this reading after you opened it.')
      return
    }
    saveMessage.value = messageOf(caught)
    if (error !== null && RETRYABLE_STATUSES.has(error.status)) {
      saveState.value = error.status === 0 ? 'offline' : 'error'
      scheduleSave(backoffDelay())
      return
    }
    // Validation, permission or a status change elsewhere: retrying would not help; the
    // landmarks stay here and the user can try again.
    saveState.value = 'error'
  }

  /** Sends the draft now (autosave calls this; so do Retry and leaving). */
  async function save(): Promise<void> {
    if (inFlight) {
      await inFlight
      if (dirty.value && saveState.value === 'unsaved') return save()
      return
    }
    const current = reading.value
    if (!current || readOnly.value || !dirty.value || saveState.value === 'conflict') return
    clearTimer()
    const revision = editRevision
    saveState.value = 'saving'
    const suggestionUse: SuggestionUse = {
      points: { ...accepted.value },
      ...(isPair.value ? { pairedPoints: { ...pairedAccepted.value } } : {}),
    }
    const body = {
      points: copyPoints(points.value),
      ...(isPair.value ? { pairedPoints: copyPoints(pairedPoints.value) } : {}),
      suggestionUse,
      version: current.version,
    }
    inFlight = (async () => {
      try {
        const updated = await patchReading(current.id, body)
        reading.value = updated
        retryAttempt = 0
        saveMessage.value = null
        if (editRevision === revision) {
          dirty.value = false
          saveState.value = 'saved'
          lastSavedAt.value = new Date()
        } else {
          saveState.value = 'unsaved'
          scheduleSave(AUTOSAVE_DELAY_MS)
        }
      } catch (caught) {
        await handleSaveError(caught)
      } finally {
        inFlight = null
      }
    })()
    await inFlight
  }

  /** Retry at once (the Retry button, or the browser coming back online). */
  function retryNow(): void {
    if (saveState.value === 'offline' || saveState.value === 'error') {
      saveState.value = 'unsaved'
      void save()
    }
  }

  /** Conflict: take the other version; ours stays one Undo away. */
  function loadTheirs(): void {
    const theirs = conflict.value
    if (!theirs) return
    undoStack.value.push(snapshot())
    redoStack.value = []
    adopt(theirs)
    conflict.value = null
    dirty.value = false
    saveState.value = 'saved'
    saveMessage.value = null
  }

  /** Conflict: keep our landmarks and save them on top of the other version. */
  async function overwriteTheirs(): Promise<void> {
    const theirs = conflict.value
    if (!theirs || !reading.value) return
    reading.value = { ...theirs }
    conflict.value = null
    dirty.value = true
    saveState.value = 'unsaved'
    saveMessage.value = null
    await save()
  }

  async function submit(): Promise<void> {
    if (!canSubmit.value || !reading.value) return
    if (dirty.value) await save()
    if (dirty.value || saveState.value !== 'saved' || !reading.value) return
    try {
      reading.value = await submitReading(reading.value.id, reading.value.version)
    } catch (caught) {
      if (caught instanceof ApiError && caught.status === 409) {
        await enterConflict('The reading changed before it could be submitted.')
        return
      }
      saveMessage.value = messageOf(caught)
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
    if (!readOnly.value) {
      dirty.value = true
      editRevision += 1
      if (saveState.value !== 'conflict') {
        saveState.value = 'unsaved'
        scheduleSave(0)
      }
    }
  }

  function reset(): void {
    clearTimer()
    reading.value = null
    film.value = null
    pairedFilm.value = null
    visit.value = null
    blind.value = null
    loadError.value = null
    points.value = {}
    pairedPoints.value = {}
    accepted.value = {}
    pairedAccepted.value = {}
    suggestion.value = null
    activeSide.value = 'primary'
    selectedName.value = null
    placing.value = true
    replacing.value = null
    undoStack.value = []
    redoStack.value = []
    saveState.value = 'saved'
    saveMessage.value = null
    conflict.value = null
    lastSavedAt.value = null
    dirty.value = false
    retryAttempt = 0
    dragStart = null
    dragging.value = false
    comments.value = null
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
    points,
    pairedPoints,
    accepted,
    pairedAccepted,
    suggestion,
    activeSide,
    selectedName,
    placing,
    replacing,
    undoStack,
    redoStack,
    saveState,
    saveMessage,
    conflict,
    lastSavedAt,
    dirty,
    dragging,
    viewer,
    canSign,
    canReturn,
    canAmend,
    comments,
    amendment,
    amended,
    specs,
    isPair,
    readOnly,
    activePoints,
    nextName,
    missingRequired,
    submitBlocked,
    canSubmit,
    canUndo,
    canRedo,
    load,
    placePoint,
    beginDrag,
    dragPoint,
    endDrag,
    offerSuggestion,
    acceptSuggestion,
    declineSuggestion,
    removePoint,
    undo,
    redo,
    select,
    pick,
    selectStep,
    targetForClick,
    stopPlacing,
    save,
    retryNow,
    loadTheirs,
    overwriteTheirs,
    submit,
    sign,
    returnToRater,
    amend,
    loadComments,
    addComment,
    calibrate,
    reset,
  }
})
