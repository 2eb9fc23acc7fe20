import { describe, expect, it } from 'vitest'
import { roundStateTag } from '@/utils/round-labels'

describe('roundStateTag', () => {
  it('says a round is in progress while readings are missing', () => {
    expect(roundStateTag({ status: 'open', assignmentsDone: 35, assignmentsTotal: 36 })).toEqual({
      label: 'In progress',
      severity: 'info',
    })
  })

  it('says every reading is in when an open round is complete', () => {
    expect(roundStateTag({ status: 'open', assignmentsDone: 36, assignmentsTotal: 36 })).toEqual({
      label: 'All readings in',
      severity: 'success',
    })
  })

  it('keeps an empty open round in progress rather than complete', () => {
    expect(roundStateTag({ status: 'open', assignmentsDone: 0, assignmentsTotal: 0 }).label).toBe(
      'In progress',
    )
  })

  it('shows a closed round as closed whatever its progress', () => {
    expect(roundStateTag({ status: 'closed', assignmentsDone: 10, assignmentsTotal: 36 })).toEqual({
      label: 'Closed',
      severity: 'secondary',
    })
  })
})
