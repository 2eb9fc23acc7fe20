/** Path of keys from the root of a result tree to one numeric value. */
export type LeafPath = readonly string[]

/**
 * The paths of every number in a result tree of plain objects, in key order (the order the
 * engine builds its results in, so it is the same for every evaluation).
 */
export function numericLeafPaths(tree: unknown): LeafPath[] {
  const paths: LeafPath[] = []
  const walk = (node: unknown, path: string[]): void => {
    if (typeof node === 'number') paths.push(path)
    else if (typeof node === 'object' && node !== null) {
      for (const key of Object.keys(node))
        walk((node as Record<string, unknown>)[key], [...path, key])
    }
  }
  walk(tree, [])
  return paths
}

/** The number at `path`, or NaN when the path is missing or not a finite number there. */
export function numberAtPath(tree: unknown, path: LeafPath): number {
  let node: unknown = tree
  for (const key of path) {
    if (typeof node !== 'object' || node === null) return Number.NaN
    node = (node as Record<string, unknown>)[key]
  }
  return typeof node === 'number' && Number.isFinite(node) ? node : Number.NaN
}

/**
 * A copy of `tree` with the i-th number (in `numericLeafPaths` order) replaced by
 * `replace(value, i)`; other values are copied as they are.
 */
export function mapNumericLeaves(
  tree: unknown,
  replace: (value: number, index: number) => unknown,
): unknown {
  let index = 0
  const walk = (node: unknown): unknown => {
    if (typeof node === 'number') return replace(node, index++)
    if (typeof node !== 'object' || node === null) return node
    const copy: Record<string, unknown> = {}
    for (const key of Object.keys(node)) copy[key] = walk((node as Record<string, unknown>)[key])
    return copy
  }
  return walk(tree)
}
