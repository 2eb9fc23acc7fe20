/**
 * The demo clinic's sign-off: who is each patient's responsible surgeon, and what happens to the
 * fellows' submitted readings (one returned with a comment, one signed and then amended, one
 * with a short thread), so that each demo surgeon signs in to readings waiting. Invented words of
 * invented people.
 */
const RHEA = 'rhea.calloway@endplate.example'
const ANSELM = 'anselm.greaves@endplate.example'
export const DEMO_PRIYA = 'priya.lindqvist@endplate.example'
export const DEMO_JONAH = 'jonah.ferris@endplate.example'
export const DEMO_ADMIN = 'dana.whitlock@endplate.example'

/** Demo patient key → the surgeon who signs that patient's readings. */
export const DEMO_RESPONSIBLE_SURGEONS: Record<string, string> = {
  'grade-1': RHEA,
  'grade-2': ANSELM,
  'grade-3': RHEA,
  'grade-4': ANSELM,
  'grade-5': ANSELM,
  retrolisthesis: ANSELM,
  hybrid: RHEA,
  dynamic: ANSELM,
  'normal-1': RHEA,
  'normal-2': RHEA,
}

export interface DemoReview {
  /** The demo film whose reading is reviewed (its preset name). */
  preset: string
  surgeon: string
  outcome:
    | { kind: 'return'; comment: string }
    | { kind: 'sign'; amendment?: { by: string; reason: string; moveLandmark: string } }
    | { kind: 'thread'; comments: Array<{ by: string; text: string }> }
}

export const DEMO_REVIEWS: DemoReview[] = [
  {
    preset: 'meyerding-2',
    surgeon: ANSELM,
    outcome: {
      kind: 'return',
      comment:
        'The L5 posterior-inferior corner sits on the osteophyte lip. Place it on the cortical corner just behind it and submit again.',
    },
  },
  {
    preset: 'hybrid-post-op',
    surgeon: RHEA,
    outcome: {
      kind: 'sign',
      amendment: {
        by: DEMO_JONAH,
        reason:
          'S1 superior endplate: the anterior corner was placed on the cage edge; re-placed on the endplate itself.',
        moveLandmark: 'S1.as',
      },
    },
  },
  {
    preset: 'meyerding-1',
    surgeon: RHEA,
    outcome: {
      kind: 'thread',
      comments: [
        { by: RHEA, text: 'Is the S1 endplate double-contoured on this film?' },
        {
          by: DEMO_PRIYA,
          text: 'Slightly; I took the upper contour, as we agreed for tilted films.',
        },
      ],
    },
  },
]

/** A pending invitation, so the administrator's worklist and the Mail screen have one. */
export const DEMO_INVITATION = {
  email: 'tobias.renwick@endplate.example',
  displayName: 'Dr Tobias Renwick',
  role: 'fellow' as const,
}
