import { ref, type Ref } from 'vue'
import { useRouter } from 'vue-router'
import { useConfirm } from 'primevue/useconfirm'
import { useToast } from 'primevue/usetoast'
import { useReadingsStore } from '@/stores/readings'
import { errorMessage } from '@/utils/error-message'

/**
 * The reading's way to a signature: the rater submits it (to sign-off, or to its round when
 * blinded); a surgeon signs it after a confirmation, or returns it with a comment; a signed
 * reading is amended with a reason, which opens the amendment.
 */
export function useReadingReview(options: { blinded: Ref<boolean> }) {
  const store = useReadingsStore()
  const router = useRouter()
  const toast = useToast()
  const confirm = useConfirm()
  const reviewing = ref(false)
  const noteDialog = ref<'return' | 'amend' | null>(null)
  const noteError = ref<string | null>(null)
  const raterName = () => store.reading?.raterName ?? 'The rater'

  async function submit(): Promise<void> {
    try {
      await store.submit()
      if (store.reading?.status !== 'submitted') return
      toast.add(
        options.blinded.value
          ? {
              severity: 'success',
              summary: 'Submitted to the round',
              detail: 'The reading is now read-only and counts in the round.',
              life: 4000,
            }
          : {
              severity: 'success',
              summary: 'Submitted for sign-off',
              detail: 'The reading is now read-only.',
              life: 4000,
            },
      )
    } catch (caught) {
      toast.add({
        severity: 'error',
        summary: 'Not submitted',
        detail: errorMessage(caught),
        life: 6000,
      })
    }
  }

  async function sign(): Promise<void> {
    reviewing.value = true
    try {
      await store.sign()
      toast.add({
        severity: 'success',
        summary: 'Signed',
        detail: `${raterName()} is told by mail.`,
        life: 4000,
      })
    } catch (caught) {
      toast.add({
        severity: 'error',
        summary: 'Not signed',
        detail: errorMessage(caught),
        life: 7000,
      })
    } finally {
      reviewing.value = false
    }
  }

  function askSign(): void {
    confirm.require({
      header: 'Sign this reading?',
      message:
        'Signed, the reading and its results no longer change; a correction is then made as an amendment.',
      acceptProps: { label: 'Sign', icon: 'pi pi-verified' },
      rejectProps: { label: 'Not yet', severity: 'secondary', text: true },
      accept: () => void sign(),
    })
  }

  /** The note dialog's text: the comment of a return, or the reason of an amendment. */
  async function submitNote(text: string): Promise<void> {
    reviewing.value = true
    noteError.value = null
    try {
      if (noteDialog.value === 'return') {
        await store.returnToRater(text)
        noteDialog.value = null
        toast.add({
          severity: 'success',
          summary: 'Returned to the rater',
          detail: `${raterName()} is told by mail; the comment waits in the reading.`,
          life: 4000,
        })
      } else if (noteDialog.value === 'amend') {
        const id = await store.amend(text)
        noteDialog.value = null
        if (id !== null) await router.push({ name: 'reading-workspace', params: { readingId: id } })
      }
    } catch (caught) {
      noteError.value = errorMessage(caught)
    } finally {
      reviewing.value = false
    }
  }

  return { reviewing, noteDialog, noteError, submit, askSign, submitNote }
}
