import type { RouteRecordInfo } from 'vue-router'

/** A route without params. */
type Plain<Name extends string, Path extends string> = RouteRecordInfo<
  Name,
  Path,
  Record<never, never>,
  Record<never, never>
>

/** A route with one id or token param: given as a number or a string, read back as a string. */
type With<Name extends string, Path extends string, Param extends string> = RouteRecordInfo<
  Name,
  Path,
  Record<Param, string | number>,
  Record<Param, string>
>

/**
 * Every named route of the client with its path and params (vue-router's typed routes, set up
 * by hand: the routes are listed in ./index.ts, not derived from files). Registered in
 * TypesConfig below, so `router.push`, `RouterLink :to` and `useRoute` accept only these names,
 * each with the params it needs: a misspelt name does not compile.
 */
export interface RouteNamedMap {
  'sign-in': Plain<'sign-in', '/sign-in'>
  worklist: Plain<'worklist', '/'>
  invitation: With<'invitation', '/invitation/:token', 'token'>
  'password-reset-request': Plain<'password-reset-request', '/password-reset'>
  'password-reset': With<'password-reset', '/password-reset/:token', 'token'>
  patients: Plain<'patients', '/patients'>
  patient: With<'patient', '/patients/:patientId', 'patientId'>
  'reading-workspace': With<'reading-workspace', '/readings/:readingId', 'readingId'>
  'assignment-workspace': With<'assignment-workspace', '/assignments/:assignmentId', 'assignmentId'>
  'round-results': With<'round-results', '/rounds/:roundId/results', 'roundId'>
  compare: With<'compare', '/patients/:patientId/compare', 'patientId'>
  'compare-print': With<'compare-print', '/patients/:patientId/compare/print', 'patientId'>
  'reading-report': With<'reading-report', '/readings/:readingId/report', 'readingId'>
  'visit-report': With<'visit-report', '/visits/:visitId/report', 'visitId'>
  studies: Plain<'studies', '/studies'>
  study: With<'study', '/studies/:studyId', 'studyId'>
  administration: Plain<'administration', '/administration'>
  mail: Plain<'mail', '/mail'>
  'not-found': RouteRecordInfo<
    'not-found',
    '/:pathMatch(.*)*',
    { pathMatch: string | string[] },
    { pathMatch: string[] }
  >
}

export type RouteName = keyof RouteNamedMap

declare module 'vue-router' {
  interface TypesConfig {
    RouteNamedMap: RouteNamedMap
  }
}
