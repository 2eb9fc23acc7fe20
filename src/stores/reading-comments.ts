import { ref } from 'vue'
import { defineStore } from 'pinia'
import type { ReadingComment } from '@shared/types/readings'
import { addReadingComment, listReadingComments } from '@/api/readings'

/** The comment thread of the reading open in the workspace (a resource of its own on the API). */
export const useReadingCommentsStore = defineStore('reading-comments', () => {
  /** Whose thread this is: an answer for a reading no longer open is dropped. */
  const readingId = ref<number | null>(null)
  /** The reading's thread, oldest first (null until loaded, and for roles that see none). */
  const comments = ref<ReadingComment[] | null>(null)

  async function load(id: number): Promise<void> {
    readingId.value = id
    const loaded = await listReadingComments(id)
    if (readingId.value === id) comments.value = loaded
  }

  async function add(id: number, text: string): Promise<void> {
    readingId.value = id
    const created = await addReadingComment(id, { text })
    if (readingId.value === id) comments.value = [...(comments.value ?? []), created]
  }

  function reset(): void {
    readingId.value = null
    comments.value = null
  }

  return { readingId, comments, load, add, reset }
})
