import { ref, type Ref } from 'vue'
import { ApiError } from '@/api/http'

export type SaveState = 'saved' | 'saving' | 'unsaved' | 'offline' | 'conflict' | 'error'

/** Quiet time after the last edit before a draft is sent. */
export const AUTOSAVE_DELAY_MS = 800
/** Waits between retries while the server cannot be reached; the last one repeats. */
export const RETRY_DELAYS_MS = [1000, 2000, 4000, 8000, 15000, 30000] as const

// No answer (0) or a gateway that could not reach the API: the same draft may well go through
// later. Anything else is the server's verdict on the draft and would only be refused again.
const RETRYABLE_STATUSES = new Set([0, 502, 503, 504])

function messageOf(caught: unknown): string {
  return caught instanceof Error ? caught.message : String(caught)
}

export interface AutosaveOptions<T> {
  /** False while there is nothing that may be saved (nothing loaded, or read-only). */
  canSave: () => boolean
  /** Sends the draft as it is now; rejects with an ApiError as src/api does. */
  send: () => Promise<void>
  /** The newer version a save ran into (409); null when there is nothing to ask for. */
  fetchTheirs: () => Promise<T> | null
}

/**
 * Debounced saving of a draft: sent AUTOSAVE_DELAY_MS after the last edit, retried with growing
 * waits while the server cannot be reached, and stopped on a version conflict (409) until the
 * user picks a version, whose other side is kept in `conflict`.
 */
export function useAutosave<T>(options: AutosaveOptions<T>) {
  const saveState = ref<SaveState>('saved')
  const saveMessage = ref<string | null>(null)
  /** The other version when a save met a newer one (409). */
  const conflict = ref<T | null>(null) as Ref<T | null>
  const lastSavedAt = ref<Date | null>(null)
  /** True while the draft differs from what the server last accepted. */
  const dirty = ref(false)

  let editRevision = 0
  let saveTimer: ReturnType<typeof setTimeout> | null = null
  let retryAttempt = 0
  let inFlight: Promise<void> | null = null

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

  function backoffDelay(): number {
    const delay = RETRY_DELAYS_MS[Math.min(retryAttempt, RETRY_DELAYS_MS.length - 1)] as number
    retryAttempt += 1
    return delay
  }

  /** The draft changed: save it once the edits pause. */
  function markEdited(): void {
    editRevision += 1
    dirty.value = true
    if (saveState.value === 'conflict') return
    if (saveState.value !== 'offline' && saveState.value !== 'saving') saveState.value = 'unsaved'
    // While offline the retry timer owns the next attempt.
    if (saveState.value !== 'offline') scheduleSave(AUTOSAVE_DELAY_MS)
  }

  /** Something the saved draft depends on changed elsewhere (a film's scale): save at once. */
  function saveSoon(): void {
    dirty.value = true
    editRevision += 1
    if (saveState.value === 'conflict') return
    saveState.value = 'unsaved'
    scheduleSave(0)
  }

  async function enterConflict(message: string): Promise<void> {
    clearTimer()
    saveState.value = 'conflict'
    saveMessage.value = message
    const theirs = options.fetchTheirs()
    if (theirs === null) return
    try {
      conflict.value = await theirs
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
    // draft stays here and the user can try again.
    saveState.value = 'error'
  }

  /** Sends the draft now (the timer calls this; so do Retry, Submit and leaving). */
  async function save(): Promise<void> {
    if (inFlight) {
      await inFlight
      if (dirty.value && saveState.value === 'unsaved') return save()
      return
    }
    if (!options.canSave() || !dirty.value || saveState.value === 'conflict') return
    clearTimer()
    const revision = editRevision
    saveState.value = 'saving'
    inFlight = (async () => {
      try {
        await options.send()
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

  /** Conflict settled by taking the other version: nothing of ours is left to send. */
  function acceptTheirs(): void {
    conflict.value = null
    dirty.value = false
    saveState.value = 'saved'
    saveMessage.value = null
  }

  /** Conflict settled by keeping ours: saved again at once, on top of the other version. */
  async function keepMine(): Promise<void> {
    conflict.value = null
    dirty.value = true
    saveState.value = 'unsaved'
    saveMessage.value = null
    await save()
  }

  function reset(): void {
    clearTimer()
    saveState.value = 'saved'
    saveMessage.value = null
    conflict.value = null
    lastSavedAt.value = null
    dirty.value = false
    retryAttempt = 0
  }

  return {
    saveState,
    saveMessage,
    conflict,
    lastSavedAt,
    dirty,
    markEdited,
    saveSoon,
    save,
    retryNow,
    enterConflict,
    acceptTheirs,
    keepMine,
    reset,
  }
}
