import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import Aura from '@primeuix/themes/aura'
import { auraComponents } from '@/theme/aura-components'
import { projectRoot } from '../../../server/project-root'

const nodeModules = join(projectRoot, 'node_modules')

function sourceFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const path = join(folder, name)
    if (statSync(path).isDirectory()) return sourceFiles(path)
    return /\.(ts|vue)$/.test(name) ? [path] : []
  })
}

/** PrimeVue modules named in a text: `from 'primevue/x'` and `import('primevue/x')`. */
function primeVueModules(text: string): string[] {
  return [...text.matchAll(/(?:from\s*|import\(\s*)["']primevue\/([a-z]+)["']/g)].map(
    (match) => match[1]!,
  )
}

/** The PrimeVue components the client renders: its own imports and what those render inside. */
function renderedComponents(): Set<string> {
  const found = new Set<string>()
  const visit = (name: string): void => {
    if (found.has(name)) return
    found.add(name)
    const built = join(nodeModules, 'primevue', name, 'index.mjs')
    if (existsSync(built)) primeVueModules(readFileSync(built, 'utf8')).forEach(visit)
  }
  for (const file of sourceFiles(join(projectRoot, 'src'))) {
    primeVueModules(readFileSync(file, 'utf8')).forEach(visit)
  }
  return found
}

describe('Aura tokens for the components the client uses', () => {
  // Source: the installed @primeuix/themes package; its Aura preset is the full reference set.
  const aura = Aura as unknown as { components: Record<string, unknown> }

  it('covers every PrimeVue component imported under src/ and the ones they render', () => {
    const themed = [...renderedComponents()].filter((name) => name in aura.components)
    expect(themed.length).toBeGreaterThan(10)
    const missing = themed.filter((name) => !(name in auraComponents))
    expect(missing).toEqual([])
  })

  it("holds Aura's own tokens, unchanged, for each component it lists", () => {
    const fromAura = Object.fromEntries(
      Object.keys(auraComponents).map((name) => [name, aura.components[name]]),
    )
    expect(auraComponents).toStrictEqual(fromAura)
  })
})
