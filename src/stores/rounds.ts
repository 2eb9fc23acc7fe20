import { ref } from 'vue'
import { defineStore } from 'pinia'
import type {
  CreateRoundInput,
  RoundDetail,
  RoundResults,
  RoundStatus,
  RoundSummary,
} from '@shared/types/rounds'
import type { RoundRaterCandidate } from '@shared/types/round-raters'
import type { RoundFilmCandidate } from '@shared/types/round-films'
import {
  createRound,
  getRound,
  getRoundResults,
  listRaterCandidates,
  listRoundFilmCandidates,
  listStudyRounds,
  patchRound,
} from '@/api/rounds'

/** Re-reading rounds: a study's list, the open round's progress and its reliability results. */
export const useRoundsStore = defineStore('rounds', () => {
  const studyId = ref<number | null>(null)
  const list = ref<RoundSummary[]>([])
  const total = ref(0)
  const loading = ref(false)
  const error = ref<string | null>(null)

  const detail = ref<RoundDetail | null>(null)
  const results = ref<RoundResults | null>(null)

  let latestList = 0
  async function loadStudyRounds(id: number): Promise<void> {
    if (studyId.value !== id) list.value = []
    studyId.value = id
    const requestId = ++latestList
    loading.value = true
    error.value = null
    try {
      const page = await listStudyRounds(id, { limit: 100 })
      if (requestId !== latestList) return
      list.value = page.items
      total.value = page.total
    } catch (caught) {
      if (requestId === latestList)
        error.value = caught instanceof Error ? caught.message : String(caught)
    } finally {
      if (requestId === latestList) loading.value = false
    }
  }

  /** Each round's progress per rater, fetched for the rows of the study's list. */
  const progress = ref<Record<number, RoundDetail>>({})
  async function loadProgress(): Promise<void> {
    const details = await Promise.all(list.value.map((round) => getRound(round.id)))
    progress.value = Object.fromEntries(details.map((round) => [round.id, round]))
  }

  async function create(id: number, input: CreateRoundInput): Promise<RoundSummary> {
    const created = await createRound(id, input)
    await loadStudyRounds(id)
    await loadProgress()
    return created
  }

  async function setStatus(round: RoundSummary, status: RoundStatus): Promise<RoundSummary> {
    const saved = await patchRound(round.id, { version: round.version, status })
    list.value = list.value.map((each) => (each.id === saved.id ? saved : each))
    if (detail.value?.id === saved.id) detail.value = await getRound(saved.id)
    return saved
  }

  async function load(id: number): Promise<RoundDetail> {
    if (detail.value?.id !== id) {
      detail.value = null
      results.value = null
    }
    detail.value = await getRound(id)
    return detail.value
  }

  async function loadResults(id: number): Promise<RoundResults> {
    results.value = await getRoundResults(id)
    return results.value
  }

  /** Lateral films of the study's patients, in study-code and visit order. */
  async function filmCandidates(id: number): Promise<RoundFilmCandidate[]> {
    return (await listRoundFilmCandidates(id)).items
  }

  /** Rounds of several studies at once (a researcher's first screen), by study id. */
  const byStudy = ref<Record<number, RoundSummary[]>>({})
  async function loadRoundsOfStudies(ids: number[]): Promise<void> {
    const pages = await Promise.all(ids.map((id) => listStudyRounds(id, { limit: 100 })))
    byStudy.value = Object.fromEntries(ids.map((id, index) => [id, pages[index]?.items ?? []]))
  }

  async function raterCandidates(): Promise<RoundRaterCandidate[]> {
    return (await listRaterCandidates()).items
  }

  return {
    studyId,
    list,
    total,
    loading,
    error,
    progress,
    detail,
    results,
    loadStudyRounds,
    loadProgress,
    create,
    setStatus,
    load,
    loadResults,
    filmCandidates,
    raterCandidates,
    byStudy,
    loadRoundsOfStudies,
  }
})
