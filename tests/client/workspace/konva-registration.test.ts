import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative } from 'node:path'
import { describe, expect, it } from 'vitest'
import * as vueKonva from 'vue-konva'
import { projectRoot } from '../../../server/project-root'

// Konva's components are registered in each canvas component, not app-wide (the sign-in page
// and the worklist do not download the canvas library). A `<v-…>` tag without its import
// renders nothing in a production build and warns only in development: this check finds one.

function vueFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const path = join(folder, name)
    if (statSync(path).isDirectory()) return vueFiles(path)
    return name.endsWith('.vue') ? [path] : []
  })
}

/** `v-regular-polygon` → `RegularPolygon`, vue-konva's export name. */
function exportNameOf(tag: string): string {
  return tag
    .slice(2)
    .split('-')
    .map((part) => part[0]!.toUpperCase() + part.slice(1))
    .join('')
}

describe('Konva components in the client', () => {
  const files = vueFiles(join(projectRoot, 'src'))
    .map((path) => ({ path, text: readFileSync(path, 'utf8') }))
    .filter(({ text }) => /<v-[a-z]/.test(text))

  it('are used in at least the workspace and Compare canvases', () => {
    expect(files.length).toBeGreaterThanOrEqual(2)
  })

  it('are each imported from vue-konva in the file whose template uses them', () => {
    const missing: string[] = []
    for (const { path, text } of files) {
      const tags = new Set([...text.matchAll(/<(v-[a-z][a-z-]*)/g)].map((match) => match[1]!))
      for (const tag of tags) {
        const name = exportNameOf(tag)
        const imported = new RegExp(`\\b${name} as V${name}\\b`).test(text)
        if (!(name in vueKonva) || !imported)
          missing.push(`${relative(projectRoot, path)}: <${tag}>`)
      }
    }
    expect(missing).toEqual([])
  })
})
