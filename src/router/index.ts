import {
  createRouter,
  createWebHistory,
  type RouteLocationNormalized,
  type RouteLocationRaw,
  type RouteRecordRaw,
} from 'vue-router'
import type { Permission } from '@shared/types/permissions'
import { useSessionStore } from '@/stores/session'

import type { RouteName, RouteNamedMap } from './route-map'

export type { RouteName } from './route-map'

declare module 'vue-router' {
  interface RouteMeta {
    /** Public routes need no session. */
    public?: boolean
    /** The permission a route needs; mirrors the server's checks so menus and links agree. */
    permission?: Permission
    title?: string
  }
}

/**
 * A route's numeric id param. The props functions see every route's params (a union), so the
 * param is named here; the typed map (./route-map.ts) guarantees the route has it.
 */
function idParam(route: RouteLocationNormalized, name: string): number {
  return Number((route.params as Record<string, string | string[] | undefined>)[name])
}

/** Ids from a query value written "12,15"; anything that is not a positive integer is dropped. */
function idsOf(value: unknown): number[] {
  const text = Array.isArray(value) ? value.join(',') : typeof value === 'string' ? value : ''
  return text
    .split(',')
    .map(Number)
    .filter((id) => Number.isSafeInteger(id) && id > 0)
}

/** A record named after one of the typed routes (./route-map.ts), with that route's path. */
type TypedRecord = {
  [Name in RouteName]: RouteRecordRaw & { name: Name; path: RouteNamedMap[Name]['path'] }
}[RouteName]

const routes: TypedRecord[] = [
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
    props: (route) => ({ patientId: idParam(route, 'patientId') }),
    meta: { permission: 'patient:read', title: 'Patient' },
  },
  {
    path: '/readings/:readingId',
    name: 'reading-workspace',
    component: () => import('@/views/ReadingWorkspaceView.vue'),
    props: (route) => ({ readingId: idParam(route, 'readingId') }),
    meta: { permission: 'patient:read', title: 'Reading' },
  },
  {
    path: '/assignments/:assignmentId',
    name: 'assignment-workspace',
    component: () => import('@/views/ReadingWorkspaceView.vue'),
    props: (route) => ({ assignmentId: idParam(route, 'assignmentId') }),
    meta: { permission: 'round:rate', title: 'Blinded reading' },
  },
  {
    path: '/rounds/:roundId/results',
    name: 'round-results',
    component: () => import('@/views/RoundResultsView.vue'),
    props: (route) => ({ roundId: idParam(route, 'roundId') }),
    meta: { permission: 'round:read', title: 'Round results' },
  },
  {
    path: '/patients/:patientId/compare',
    name: 'compare',
    component: () => import('@/views/CompareView.vue'),
    props: (route) => ({
      patientId: idParam(route, 'patientId'),
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
      patientId: idParam(route, 'patientId'),
      images: idsOf(route.query.images),
      readings: idsOf(route.query.readings),
    }),
    meta: { permission: 'patient:read', title: 'Comparison to print' },
  },
  {
    path: '/readings/:readingId/report',
    name: 'reading-report',
    component: () => import('@/views/ReportPrintView.vue'),
    props: (route) => ({ kind: 'reading', id: idParam(route, 'readingId') }),
    meta: { permission: 'patient:read', title: 'Reading report' },
  },
  {
    path: '/visits/:visitId/report',
    name: 'visit-report',
    component: () => import('@/views/ReportPrintView.vue'),
    props: (route) => ({ kind: 'visit', id: idParam(route, 'visitId') }),
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
    props: (route) => ({ studyId: idParam(route, 'studyId') }),
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
