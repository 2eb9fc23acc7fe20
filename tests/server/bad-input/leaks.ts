/**
 * What an answer must never carry: a stack trace (V8's "    at fn (file:line:col)" frames), the
 * path of a source file, or SQL as Knex writes it (backtick-quoted names) and MariaDB's error
 * codes. Product text never contains these, so a match is a leak.
 */
const LEAK_PATTERNS: [string, RegExp][] = [
  ['stack trace', /\n\s+at .+:\d+:\d+/],
  ['source path', /\/(server|node_modules)\/[\w./-]+\.(ts|js)/],
  ['SQL', /\b(select|insert into|update|delete from)\s+[^"]*`\w+`/i],
  ['MariaDB error', /\bER_[A-Z_]{3,}\b|sqlMessage|SQL syntax/],
]

export function leakIn(body: string): string | null {
  for (const [what, pattern] of LEAK_PATTERNS) if (pattern.test(body)) return what
  return null
}
