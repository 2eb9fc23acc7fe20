// Entry of the export worker threads (export-row-pool.ts). Worker threads do not inherit the
// TypeScript loader of the thread that starts them, so this plain module registers tsx first.
import { register } from 'tsx/esm/api'

register()
export const { exportRows, warm } = await import('./export-row-task.ts')
