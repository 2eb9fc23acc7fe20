import { computed, ref, type Ref } from 'vue'
import { useReadingCommentsStore } from '@/stores/reading-comments'
import { useReadingsStore } from '@/stores/readings'
import { useSessionStore } from '@/stores/session'
import { errorMessage } from '@/utils/error-message'

/**
 * The workspace's lower pane: the results or, for clinicians outside a blinded round, the
 * reading's comment thread, with the number of comments on its switch.
 */
export function useReadingThreadPane(options: { blinded: Ref<boolean> }) {
  const store = useReadingsStore()
  const thread = useReadingCommentsStore()
  const session = useSessionStore()
  const showThread = computed(() => !options.blinded.value && session.can('reading:comment'))
  const lowerPane = ref<'results' | 'comments'>('results')
  const threadError = ref<string | null>(null)

  async function loadThread(): Promise<void> {
    threadError.value = null
    try {
      if (store.reading) await thread.load(store.reading.id)
    } catch (caught) {
      threadError.value = errorMessage(caught)
    }
  }

  const paneOptions = computed(() => [
    { label: 'Results', value: 'results' },
    {
      label:
        thread.comments && thread.comments.length > 0
          ? `Comments (${thread.comments.length})`
          : 'Comments',
      value: 'comments',
    },
  ])

  async function postComment(text: string, done: (error?: unknown) => void): Promise<void> {
    try {
      if (store.reading) await thread.add(store.reading.id, text)
      done()
    } catch (caught) {
      done(caught)
    }
  }

  return { showThread, lowerPane, threadError, loadThread, paneOptions, postComment }
}
