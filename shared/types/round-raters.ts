/** Someone who may be asked to rate in a re-reading round (`GET /api/rounds/rater-candidates`). */
export interface RoundRaterCandidate {
  id: number
  displayName: string
  role: 'fellow' | 'surgeon'
}
