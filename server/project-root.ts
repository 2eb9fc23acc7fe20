import { fileURLToPath } from 'node:url'

/** Absolute path of the repository root, whatever the working directory. */
export const projectRoot = fileURLToPath(new URL('..', import.meta.url)).replace(/\/$/, '')
