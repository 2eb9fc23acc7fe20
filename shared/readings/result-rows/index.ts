// The results panel's (and the reports') sections for every template: one file per section,
// their thresholds and shared words beside them.
export { workspaceResultSections, type WorkspaceResultsInput } from './template-sections'
export type { FilmResults, ResultFlag, ResultRow, ResultSection } from './types'
