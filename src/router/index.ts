import {
  createRouter,
  createWebHistory,
  type RouteLocationRaw,
  type RouteRecordRaw,
} from 'vue-router'
import type { Permission } from '@shared/types/permissions'
import { useSessionStore } from '@/stores/session'

/** Every route name; navigation goes by name so a typo does not compile. */
export type RouteName =
  | 'sign-in'
  | 'worklist'
  | 'patients'
  | 'patient'
  | 'reading-workspace'
  | 'studies'
  | 'study'
  | 'administration'
  | 'mail'
  | 'invitation'
  | 'password-reset-request'
  | 'password-reset'
  | 'not-found'
  | 'compare'
  | 'compare-print'
  | 'reading-report'
  | 'visit-report'

declare module 'vue-router' {
  interface RouteMeta {
    /** Public routes need no session. */
    public?: boolean
    /** The permission a route needs; mirrors the server's checks so menus and links agree. */
    permission?: Permission
    title?: string
  }
}

/** Ids from a query value written "12,15"; anything that is not a positive integer is dropped. */
function idsOf(value: unknown): number[] {
  const text = Array.isArray(value) ? value.join(',') : typeof value === 'string' ? value : ''
  return text
    .split(',')
    .map(Number)
    .filter((id) => Number.isSafeInteger(id) && id > 0)
}

const routes: Array<RouteRecordRaw & { name?: RouteName }> = [
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { public: true, title: 'Sign in' },
  },
  {
    path: '/',
    name: 'worklist',
    component: () => import('@/views/WorklistView.vue'),
    meta: { title: 'Worklist' },
  },
  {
    path: '/invitation/:token',
    name: 'invitation',
    component: () => import('@/views/InvitationView.vue'),
    props: true,
    meta: { public: true, title: 'Invitation' },
  },
  {
    path: '/password-reset',
    name: 'password-reset-request',
    component: () => import('@/views/PasswordResetRequestView.vue'),
    meta: { public: true, title: 'Forgotten password' },
  },
  {
    path: '/password-reset/:token',
    name: 'password-reset',
    component: () => import('@/views/PasswordResetView.vue'),
    props: true,
    meta: { public: true, title: 'New password' },
  },
  {
    path: '/patients',
    name: 'patients',
    component: () => import('@/views/PatientsView.vue'),
    meta: { permission: 'patient:read', title: 'Patients' },
  },
  {
    path: '/patients/:patientId',
    name: 'patient',
    component: () => import('@/views/PatientView.vue'),
    props: (route) => ({ patientId: Number(route.params.patientId) }),
    meta: { permission: 'patient:read', title: 'Patient' },
  },
  {
    path: '/readings/:readingId',
    name: 'reading-workspace',
    component: () => import('@/views/ReadingWorkspaceView.vue'),
    props: (route) => ({ readingId: Number(route.params.readingId) }),
    meta: { permission: 'patient:read', title: 'Reading' },
  },
  {
    path: '/patients/:patientId/compare',
    name: 'compare',
    component: () => import('@/views/CompareView.vue'),
    props: (route) => ({
      patientId: Number(route.params.patientId),
      images: idsOf(route.query.images),
      readings: idsOf(route.query.readings),
    }),
    meta: { permission: 'patient:read', title: 'Compare' },
  },
  {
    path: '/patients/:patientId/compare/print',
    name: 'compare-print',
    component: () => import('@/views/ComparePrintView.vue'),
    props: (route) => ({
      patientId: Number(route.params.patientId),
      images: idsOf(route.query.images),
      readings: idsOf(route.query.readings),
    }),
    meta: { permission: 'patient:read', title: 'Comparison to print' },
  },
  {
    path: '/readings/:readingId/report',
    name: 'reading-report',
    component: () => import('@/views/ReportPrintView.vue'),
    props: (route) => ({ kind: 'reading', id: Number(route.params.readingId) }),
    meta: { permission: 'patient:read', title: 'Reading report' },
  },
  {
    path: '/visits/:visitId/report',
    name: 'visit-report',
    component: () => import('@/views/ReportPrintView.vue'),
    props: (route) => ({ kind: 'visit', id: Number(route.params.visitId) }),
    meta: { permission: 'patient:read', title: 'Visit report' },
  },
  {
    path: '/studies',
    name: 'studies',
    component: () => import('@/views/StudiesView.vue'),
    meta: { permission: 'study:read', title: 'Studies' },
  },
  {
    path: '/studies/:studyId',
    name: 'study',
    component: () => import('@/views/StudyView.vue'),
    props: (route) => ({ studyId: Number(route.params.studyId) }),
    meta: { permission: 'study:read', title: 'Study' },
  },
  {
    path: '/administration',
    name: 'administration',
    component: () => import('@/views/AdministrationView.vue'),
    meta: { permission: 'user:manage', title: 'Administration' },
  },
  {
    path: '/mail',
    name: 'mail',
    component: () => import('@/views/MailView.vue'),
    meta: { permission: 'mail:read', title: 'Mail' },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { public: true, title: 'Not found' },
  },
]

export const router = createRouter({ history: createWebHistory(), routes })

/** Where a role lands after sign-in: every role's first screen is its worklist. */
export function homeFor(_can: (permission: Permission) => boolean): RouteLocationRaw {
  return { name: 'worklist' }
}

router.beforeEach(async (to) => {
  const session = useSessionStore()
  await session.restore().catch(() => undefined)
  if (to.meta.public) {
    if (to.name === 'sign-in' && session.isSignedIn) return homeFor(session.can)
    return true
  }
  if (!session.isSignedIn) return { name: 'sign-in', query: { next: to.fullPath } }
  if (to.meta.permission && !session.can(to.meta.permission)) return homeFor(session.can)
  return true
})

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Endplate` : 'Endplate'
})
