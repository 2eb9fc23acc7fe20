/**
 * The invented demo clinic: staff, patients, visits, the hybrid patient's plan and a research
 * cohort. Every name, record number and date is made up.
 */
import type {
  Role,
  Sex,
  VisitKind,
  MotionSegment,
  PlannedTreatment,
} from '../../shared/types/domain'

export interface DemoUser {
  email: string
  displayName: string
  role: Role
  password: string
}

export const DEMO_USERS: DemoUser[] = [
  {
    email: 'dana.whitlock@endplate.example',
    displayName: 'Dana Whitlock',
    role: 'admin',
    password: 'demo-admin',
  },
  {
    email: 'rhea.calloway@endplate.example',
    displayName: 'Dr Rhea Calloway',
    role: 'surgeon',
    password: 'demo-surgeon',
  },
  {
    email: 'anselm.greaves@endplate.example',
    displayName: 'Dr Anselm Greaves',
    role: 'surgeon',
    password: 'demo-surgeon',
  },
  {
    email: 'priya.lindqvist@endplate.example',
    displayName: 'Dr Priya Lindqvist',
    role: 'fellow',
    password: 'demo-fellow',
  },
  {
    email: 'jonah.ferris@endplate.example',
    displayName: 'Dr Jonah Ferris',
    role: 'fellow',
    password: 'demo-fellow',
  },
  {
    email: 'mei.arkwright@endplate.example',
    displayName: 'Mei Arkwright',
    role: 'researcher',
    password: 'demo-researcher',
  },
]

export interface DemoVisit {
  date: string
  kind: VisitKind
  monthsSinceSurgery?: number
  indication: string
}

export interface DemoPlanSegment {
  segment: MotionSegment
  treatment: PlannedTreatment
  parsDefectLeft?: boolean
  parsDefectRight?: boolean
  facetDegeneration?: boolean
  dynamicInstability?: boolean
  implantLordosisDeg?: number
  implantHeightMm?: number
  notes?: string
}

export interface DemoPatient {
  /** Key used by the image seeds to pick the phantom preset of each visit. */
  key: string
  recordNumber: string
  familyName: string
  givenName: string
  birthDate: string
  sex: Sex
  osteoporosis?: boolean
  notes: string
  studyCode: string
  inStudy: boolean
  visits: DemoVisit[]
  plan?: DemoPlanSegment[]
}

export const DEMO_PATIENTS: DemoPatient[] = [
  {
    key: 'grade-1',
    recordNumber: 'EPD-104211',
    familyName: 'Halvorsen',
    givenName: 'Ingrid',
    birthDate: '1968-03-14',
    sex: 'female',
    notes: 'Degenerative L4-L5 slip, claudication after 200 m.',
    studyCode: 'EP-4K7Q2M',
    inStudy: true,
    visits: [
      {
        date: '2026-09-02',
        kind: 'pre-op',
        indication: 'Neurogenic claudication; standing lateral for slip grading.',
      },
    ],
  },
  {
    key: 'grade-2',
    recordNumber: 'EPD-104388',
    familyName: 'Okonkwo-Reyes',
    givenName: 'Tobias',
    birthDate: '1979-11-30',
    sex: 'male',
    notes: 'Isthmic L5-S1 spondylolisthesis, bilateral pars defects on CT.',
    studyCode: 'EP-8TZ3VW',
    inStudy: true,
    visits: [
      { date: '2026-08-19', kind: 'pre-op', indication: 'Low back pain with L5 radiculopathy.' },
    ],
  },
  {
    key: 'grade-3',
    recordNumber: 'EPD-104502',
    familyName: 'Brannigan',
    givenName: 'Lucia',
    birthDate: '1991-06-07',
    sex: 'female',
    notes: 'High-grade isthmic slip; progression since adolescence.',
    studyCode: 'EP-2HB9XR',
    inStudy: true,
    visits: [
      { date: '2026-07-11', kind: 'pre-op', indication: 'Progressive slip, hamstring tightness.' },
    ],
  },
  {
    key: 'grade-4',
    recordNumber: 'EPD-104617',
    familyName: 'Szabo-Lind',
    givenName: 'Marek',
    birthDate: '1986-01-22',
    sex: 'male',
    notes: 'Dysplastic L5-S1 slip.',
    studyCode: 'EP-6CN4PD',
    inStudy: true,
    visits: [
      { date: '2026-06-30', kind: 'pre-op', indication: 'Referral for reduction and fusion.' },
    ],
  },
  {
    key: 'grade-5',
    recordNumber: 'EPD-104733',
    familyName: 'Achterberg',
    givenName: 'Noor',
    birthDate: '1999-09-09',
    sex: 'female',
    notes: 'Spondyloptosis of L5 on S1.',
    studyCode: 'EP-9RM7KS',
    inStudy: true,
    visits: [
      { date: '2026-05-27', kind: 'pre-op', indication: 'Complete slip; planning discussion.' },
    ],
  },
  {
    key: 'retrolisthesis',
    recordNumber: 'EPD-104859',
    familyName: 'Pellegrino',
    givenName: 'Ansel',
    birthDate: '1958-12-03',
    sex: 'male',
    notes: 'L2-L3 retrolisthesis with low pelvic incidence.',
    studyCode: 'EP-3WF8GT',
    inStudy: true,
    visits: [{ date: '2026-10-06', kind: 'pre-op', indication: 'Mechanical back pain.' }],
  },
  {
    key: 'hybrid',
    recordNumber: 'EPD-103977',
    familyName: 'Marchetti-Vance',
    givenName: 'Sofia',
    birthDate: '1974-04-18',
    sex: 'female',
    notes: 'Two-level degenerative disc disease with L5-S1 isthmic slip: hybrid construct.',
    studyCode: 'EP-7PJ2HN',
    inStudy: true,
    visits: [
      {
        date: '2025-10-14',
        kind: 'pre-op',
        indication: 'Discogenic pain L3-L5, isthmic slip L5-S1.',
      },
      { date: '2025-11-04', kind: 'post-op', indication: 'Day 2 after hybrid construct.' },
      {
        date: '2026-11-03',
        kind: 'follow-up',
        monthsSinceSurgery: 12,
        indication: 'One-year review.',
      },
    ],
    plan: [
      {
        segment: 'L3-L4',
        treatment: 'disc-replacement',
        implantLordosisDeg: 6,
        implantHeightMm: 10,
        notes: 'Facets preserved on MRI.',
      },
      {
        segment: 'L4-L5',
        treatment: 'disc-replacement',
        implantLordosisDeg: 6,
        implantHeightMm: 11,
      },
      {
        segment: 'L5-S1',
        treatment: 'interbody-fusion',
        parsDefectLeft: true,
        parsDefectRight: true,
        implantLordosisDeg: 15,
        implantHeightMm: 13,
      },
    ],
  },
  {
    key: 'dynamic',
    recordNumber: 'EPD-105012',
    familyName: 'Quayle',
    givenName: 'Henrik',
    birthDate: '1965-08-25',
    sex: 'male',
    notes: 'Suspected L4-L5 instability: flexion and extension films.',
    studyCode: 'EP-5DX6QA',
    inStudy: true,
    visits: [
      {
        date: '2026-10-20',
        kind: 'pre-op',
        indication: 'Flexion/extension series for instability.',
      },
    ],
  },
  {
    key: 'normal-1',
    recordNumber: 'EPD-105144',
    familyName: 'Delacroix-Moss',
    givenName: 'Amara',
    birthDate: '1982-02-11',
    sex: 'female',
    notes: 'Disc degeneration L4-L5, candidate for disc replacement.',
    studyCode: 'EP-8MV2ZC',
    inStudy: true,
    visits: [
      { date: '2026-09-15', kind: 'pre-op', indication: 'Discogenic pain; facets normal on MRI.' },
    ],
  },
  {
    key: 'normal-2',
    recordNumber: 'EPD-105260',
    familyName: 'Fitzgerald-Oduya',
    givenName: 'Ronan',
    birthDate: '1970-07-01',
    sex: 'male',
    osteoporosis: true,
    notes: 'Osteoporosis on DXA; L3-L4 degeneration.',
    studyCode: 'EP-4GH9LT',
    inStudy: false,
    visits: [
      { date: '2026-11-10', kind: 'pre-op', indication: 'Back pain, reduced bone density.' },
    ],
  },
  {
    key: 'normal-3',
    recordNumber: 'EPD-105391',
    familyName: 'Wexford',
    givenName: 'Elin',
    birthDate: '1988-10-19',
    sex: 'female',
    notes: 'Post-op review after L4-L5 fusion elsewhere.',
    studyCode: 'EP-2QS5BW',
    inStudy: false,
    visits: [
      {
        date: '2026-04-08',
        kind: 'follow-up',
        monthsSinceSurgery: 6,
        indication: 'Six-month review after fusion.',
      },
    ],
  },
  {
    key: 'normal-4',
    recordNumber: 'EPD-105425',
    familyName: 'Nakamura-Holt',
    givenName: 'Kenji',
    birthDate: '1961-05-05',
    sex: 'male',
    notes: 'Adjacent segment review.',
    studyCode: 'EP-6ZR8EK',
    inStudy: false,
    visits: [
      {
        date: '2026-11-18',
        kind: 'pre-op',
        indication: 'Standing long film for global alignment.',
      },
    ],
  },
]

export const DEMO_STUDY = {
  name: 'Slip progression and sagittal alignment cohort',
  description: 'De-identified cohort for slip grading reliability and alignment after surgery.',
  note: 'Invented demo study. Films are synthetic phantoms; every patient here is invented.',
}
