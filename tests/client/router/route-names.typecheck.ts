/**
 * Type test, checked by vue-tsc in `npm run typecheck` (not run by vitest): route names and
 * their params are typed through vue-router's TypesConfig (src/router/route-map.ts), so a
 * misspelt name or a wrong param fails to compile. Each `@ts-expect-error` must meet an error,
 * or the typecheck fails: the map cannot silently become untyped.
 */
import type { RouteLocationRaw, Router } from 'vue-router'
import type { RouteName } from '../../../src/router/route-map'

export const known: RouteLocationRaw[] = [
  { name: 'reading-workspace', params: { readingId: 7 } },
  { name: 'patient', params: { patientId: '12' } },
  { name: 'worklist' },
]

// @ts-expect-error a misspelt route name does not compile
export const misspelt: RouteLocationRaw = { name: 'reading-worksapce', params: { readingId: 7 } }

// @ts-expect-error a param the route does not have does not compile
export const wrongParam: RouteLocationRaw = { name: 'patient', params: { readingId: 7 } }

// @ts-expect-error the name list is the map's keys, nothing else
export const notAName: RouteName = 'patient-screen'

export function navigate(router: Router): void {
  void router.push({ name: 'compare', params: { patientId: 3 }, query: { images: '1,2' } })
  // @ts-expect-error router.push refuses a misspelt name as well
  void router.push({ name: 'compares', params: { patientId: 3 } })
}
