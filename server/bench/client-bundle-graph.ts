// The JavaScript a page of the built client downloads before it can run: the entry script and
// module preloads that dist/index.html names, plus, for a lazily loaded route, the route's chunk
// and every chunk it imports statically (what Vite's preload helper fetches before the route
// renders). Read from the HTML and Vite's build manifest (.vite/manifest.json).

/** One record of Vite's build manifest, as far as the graph needs it. */
export interface ManifestChunk {
  file: string
  src?: string
  isEntry?: boolean
  imports?: string[]
  dynamicImports?: string[]
}

export type Manifest = Record<string, ManifestChunk>

/** The script and module-preload URLs of an HTML page, in document order, relative to dist/. */
export function initialScriptFiles(html: string): string[] {
  const files: string[] = []
  const tag = /<(script|link)\b([^>]*)>/gi
  for (const match of html.matchAll(tag)) {
    const [, name, attributes = ''] = match
    const isModuleScript =
      name!.toLowerCase() === 'script' && /\btype=["']module["']/i.test(attributes)
    const isPreload =
      name!.toLowerCase() === 'link' && /\brel=["']modulepreload["']/i.test(attributes)
    if (!isModuleScript && !isPreload) continue
    const url = /\b(?:src|href)=["']([^"']+)["']/i.exec(attributes)?.[1]
    if (url && !/^[a-z]+:\/\//i.test(url)) files.push(url.replace(/^\//, ''))
  }
  return files
}

/** A manifest key and every chunk it imports statically, as output file names. */
export function staticClosureFiles(manifest: Manifest, key: string): string[] {
  const seen = new Set<string>()
  const files: string[] = []
  const visit = (current: string): void => {
    if (seen.has(current)) return
    seen.add(current)
    const chunk = manifest[current]
    if (!chunk) throw new Error(`the build manifest has no chunk ${current}`)
    files.push(chunk.file)
    for (const imported of chunk.imports ?? []) visit(imported)
  }
  visit(key)
  return files
}
