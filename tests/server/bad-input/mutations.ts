import type { Role } from '../../../shared/types/domain'
import type { World } from './world'

/** A request body as the generator sends it. */
export type AttemptBody =
  | { kind: 'json'; value: unknown }
  | { kind: 'raw'; contentType: string; bytes: Buffer }
  | { kind: 'none' }

export interface Attempt {
  label: string
  /** Path parameters as they go on the wire (already percent-encoded). */
  params: Record<string, string>
  /** The query string as it goes on the wire, without '?'. */
  query: string
  body: AttemptBody
  /**
   * Why the input is wrong whatever the route's schema says (a 1 MB name, a landmark at 1e308,
   * a row that does not exist). Such an input must be refused; the route's own schema judges the rest.
   */
  mustRefuse?: string
  /** Refused for these roles only (ids of records the role may not see). */
  mustRefuseFor?: Role[]
}

const ONE_MB_STRING = 'x'.repeat(1024 * 1024)
const LONG_ARRAY = Array.from({ length: 100_000 }, () => 1)
const SQL_STRINGS = [
  "1' OR '1'='1",
  "'; DROP TABLE patients; --",
  '1 UNION SELECT password_hash FROM users',
]
const SCRIPT_STRINGS = ['<script>alert(1)</script>', '"><img src=x onerror=alert(1)>']
const TRAVERSAL = [
  '../../../../etc/passwd',
  '..%2F..%2F..%2Fetc%2Fpasswd',
  '..\\..\\windows\\win.ini',
]
const PLACEHOLDER = '\u0000bad-input-placeholder\u0000'

function nested(depth: number): string {
  return `${'['.repeat(depth)}${']'.repeat(depth)}`
}

/** JSON text of `value` with the placeholder string swapped for raw text (NaN, deep nesting). */
function jsonWithRaw(value: unknown, raw: string | Buffer): Buffer {
  const [head, tail] = JSON.stringify(value).split(JSON.stringify(PLACEHOLDER)) as [string, string]
  return Buffer.concat([
    Buffer.from(head),
    Buffer.isBuffer(raw) ? raw : Buffer.from(raw),
    Buffer.from(tail ?? ''),
  ])
}

const json = (value: unknown): AttemptBody => ({ kind: 'json', value })
const rawJson = (bytes: Buffer | string): AttemptBody => ({
  kind: 'raw',
  contentType: 'application/json',
  bytes: Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes),
})

/** Every numeric leaf of a value, as paths of keys. */
function numericLeaves(value: unknown, path: (string | number)[] = []): (string | number)[][] {
  if (typeof value === 'number') return [path]
  if (Array.isArray(value)) return value.flatMap((item, i) => numericLeaves(item, [...path, i]))
  if (value && typeof value === 'object')
    return Object.entries(value).flatMap(([key, item]) => numericLeaves(item, [...path, key]))
  return []
}

function setAt(value: unknown, path: (string | number)[], leaf: unknown): unknown {
  if (path.length === 0) return leaf
  const [head, ...rest] = path as [string | number, ...(string | number)[]]
  const copy = (Array.isArray(value) ? [...value] : { ...(value as object) }) as Record<
    string | number,
    unknown
  >
  copy[head] = setAt(copy[head], rest, leaf)
  return copy
}

function wrongTypeOf(value: unknown): unknown {
  if (typeof value === 'string') return 12345
  if (typeof value === 'number') return String(value)
  if (typeof value === 'boolean') return 'true'
  if (Array.isArray(value)) return { 0: value[0] }
  if (value && typeof value === 'object') return [value]
  return { unexpected: true }
}

/** Which row an `:id` names, from the path segment before it. */
function foreignIdFor(path: string, param: string, w: World): string | undefined {
  const match = new RegExp(`/([a-z-]+)/:${param}(?:/|$)`).exec(path)
  const table = match?.[1]
  if (table === 'patients') return String(w.foreign.patientId)
  if (table === 'visits') return String(w.foreign.visitId)
  if (table === 'images') return String(w.foreign.imageId)
  if (table === 'readings') return String(w.foreign.readingId)
  if (table === 'users') return String(w.users.surgeon.id)
  return undefined
}

function pathParamAttempts(
  path: string,
  params: Record<string, string>,
  w: World,
): Omit<Attempt, 'query' | 'body'>[] {
  const out: Omit<Attempt, 'query' | 'body'>[] = []
  for (const name of Object.keys(params)) {
    const swap = (value: string) => ({ ...params, [name]: value })
    const values: [string, string][] = [
      ['zero', '0'],
      ['negative', '-1'],
      ['1e308', '1e308'],
      ['NaN', 'NaN'],
      ['Infinity', 'Infinity'],
      ['past INT UNSIGNED', '99999999999999999999'],
      ['8 KB string', 'x'.repeat(8192)],
      ['invalid UTF-8 escape', '%FF%FE'],
      ['empty-looking', '%20'],
      ...SQL_STRINGS.map((s, i): [string, string] => [`SQL ${i + 1}`, encodeURIComponent(s)]),
      ...SCRIPT_STRINGS.map((s, i): [string, string] => [`script ${i + 1}`, encodeURIComponent(s)]),
      ...TRAVERSAL.map((s, i): [string, string] => [`traversal ${i + 1}`, encodeURIComponent(s)]),
    ]
    for (const [label, value] of values)
      out.push({ label: `:${name} ${label}`, params: swap(value) })
    if (name === 'id') {
      out.push({
        label: ':id of no record',
        params: swap('4294967295'),
        mustRefuse: 'no such record',
      })
      const foreign = foreignIdFor(path, name, w)
      if (foreign)
        out.push({
          label: ":id of another user's record",
          params: swap(foreign),
          mustRefuseFor: ['researcher'],
        })
    }
  }
  return out
}

function queryString(query: Record<string, string>): string {
  return new URLSearchParams(query).toString()
}

function queryAttempts(
  query: Record<string, string>,
  keys: string[],
): Omit<Attempt, 'params' | 'body'>[] {
  const out: Omit<Attempt, 'params' | 'body'>[] = [
    { label: 'query: unknown parameter', query: queryString({ ...query, unexpected: '1' }) },
    { label: 'query: __proto__', query: `${queryString(query)}&__proto__=1&constructor=1` },
    { label: 'query: invalid UTF-8 escape', query: `${queryString(query)}&q=%FF%FE` },
  ]
  for (const key of keys) {
    const swap = (value: string) => queryString({ ...query, [key]: value })
    for (const [label, value] of [
      ['empty', ''],
      ['NaN', 'NaN'],
      ['Infinity', 'Infinity'],
      ['1e308', '1e308'],
      ['negative', '-1'],
      ['8 KB string', 'x'.repeat(8192)],
      ['SQL', SQL_STRINGS[0] as string],
      ['script', SCRIPT_STRINGS[0] as string],
    ] as const)
      out.push({ label: `query ${key}: ${label}`, query: swap(value) })
    out.push({
      label: `query ${key}: repeated 500 times`,
      query: `${queryString(query)}${`&${encodeURIComponent(key)}=1`.repeat(500)}`,
    })
  }
  return out
}

function bodyAttempts(base: unknown): Omit<Attempt, 'params' | 'query'>[] {
  const out: Omit<Attempt, 'params' | 'query'>[] = [
    { label: 'body: array', body: json([]) },
    { label: 'body: string', body: rawJson('"text"'), mustRefuse: 'not an object' },
    { label: 'body: number', body: rawJson('42'), mustRefuse: 'not an object' },
    { label: 'body: null', body: rawJson('null'), mustRefuse: 'not an object' },
    { label: 'body: empty object', body: json({}) },
    { label: 'body: cut short', body: rawJson('{"version": 1, "na'), mustRefuse: 'not JSON' },
    { label: 'body: NaN', body: rawJson('NaN'), mustRefuse: 'not JSON' },
    {
      label: 'body: nested 100 000 deep',
      body: rawJson(nested(100_000)),
      mustRefuse: 'nested too deep',
    },
    { label: 'body: extra field', body: json({ ...(base as object), unexpected: true }) },
    {
      label: 'body: __proto__ field',
      body: rawJson(
        jsonWithRaw({ ...(base as object), x: PLACEHOLDER }, '1, "__proto__": {"role": "admin"}'),
      ),
    },
  ]
  if (!base || typeof base !== 'object' || Array.isArray(base)) return out
  for (const [field, value] of Object.entries(base)) {
    const swap = (next: unknown) => json({ ...base, [field]: next })
    const raw = (text: string | Buffer) =>
      rawJson(jsonWithRaw({ ...base, [field]: PLACEHOLDER }, text))
    const { [field]: _dropped, ...without } = base as Record<string, unknown>
    out.push(
      { label: `${field}: missing`, body: json(without) },
      { label: `${field}: null`, body: swap(null) },
      { label: `${field}: wrong type`, body: swap(wrongTypeOf(value)) },
      { label: `${field}: 1 MB string`, body: swap(ONE_MB_STRING), mustRefuse: 'a 1 MB value' },
      {
        label: `${field}: 100 000 items`,
        body: swap(LONG_ARRAY),
        mustRefuse: 'a 100 000-item array',
      },
      {
        label: `${field}: nested 5 000 deep`,
        body: raw(nested(5000)),
        mustRefuse: 'nested too deep',
      },
      { label: `${field}: NaN`, body: raw('NaN'), mustRefuse: 'not JSON' },
      { label: `${field}: Infinity`, body: raw('Infinity'), mustRefuse: 'not JSON' },
      { label: `${field}: 1e308`, body: swap(1e308), mustRefuse: 'no field takes 1e308' },
      { label: `${field}: 0`, body: swap(0) },
      { label: `${field}: -1`, body: swap(-1) },
      { label: `${field}: SQL`, body: swap(SQL_STRINGS[1]) },
      { label: `${field}: script`, body: swap(SCRIPT_STRINGS[0]) },
      // RFC 8259 §8.1: JSON exchanged between systems is UTF-8; a lone 0xFF is no UTF-8 at all.
      {
        label: `${field}: invalid UTF-8`,
        body: raw(Buffer.from([0x22, 0x61, 0xff, 0xfe, 0xc3, 0x22])),
        mustRefuse: 'not UTF-8',
      },
    )
  }
  // Landmarks, calibration lines and spacing: every number far out of any film.
  for (const leaf of numericLeaves(base)
    .filter((path) => path[0] !== 'version')
    .slice(0, 6)) {
    const where = leaf.join('.')
    out.push(
      {
        label: `${where}: 1e308`,
        body: json(setAt(base, leaf, 1e308)),
        mustRefuse: 'no film is 1e308 px',
      },
      {
        label: `${where}: -1e308`,
        body: json(setAt(base, leaf, -1e308)),
        mustRefuse: 'no film is -1e308 px',
      },
      {
        label: `${where}: NaN`,
        body: rawJson(jsonWithRaw(setAt(base, leaf, PLACEHOLDER), 'NaN')),
        mustRefuse: 'not JSON',
      },
      { label: `${where}: string`, body: json(setAt(base, leaf, '1')) },
    )
  }
  return out
}

const BOUNDARY = 'badinputboundary'
const PNG_HEAD = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13])

function multipart(
  parts: { name: string; filename?: string; bytes: Buffer }[],
  close = true,
): Buffer {
  const chunks: Buffer[] = []
  for (const part of parts) {
    const disposition = `form-data; name="${part.name}"${part.filename === undefined ? '' : `; filename="${part.filename}"`}`
    const type = part.filename === undefined ? '' : 'Content-Type: image/png\r\n'
    chunks.push(
      Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: ${disposition}\r\n${type}\r\n`),
      part.bytes,
      Buffer.from('\r\n'),
    )
  }
  if (close) chunks.push(Buffer.from(`--${BOUNDARY}--\r\n`))
  return Buffer.concat(chunks)
}

function multipartAttempts(): Omit<Attempt, 'params' | 'query'>[] {
  const form = (bytes: Buffer, boundary = BOUNDARY): AttemptBody => ({
    kind: 'raw',
    contentType: `multipart/form-data; boundary=${boundary}`,
    bytes,
  })
  const refuse = 'no whole film in it'
  return [
    {
      label: 'multipart: no file',
      body: form(multipart([{ name: 'view', bytes: Buffer.from('lateral') }])),
      mustRefuse: refuse,
    },
    {
      label: 'multipart: cut short',
      body: form(multipart([{ name: 'file', filename: 'a.png', bytes: PNG_HEAD }], false)),
      mustRefuse: refuse,
    },
    {
      label: 'multipart: wrong boundary',
      body: form(multipart([{ name: 'file', filename: 'a.png', bytes: PNG_HEAD }]), 'other'),
      mustRefuse: refuse,
    },
    {
      label: 'multipart: no boundary',
      body: { kind: 'raw', contentType: 'multipart/form-data', bytes: Buffer.from('garbage') },
      mustRefuse: refuse,
    },
    {
      label: 'multipart: truncated PNG',
      body: form(multipart([{ name: 'file', filename: 'a.png', bytes: PNG_HEAD }])),
      mustRefuse: refuse,
    },
    ...TRAVERSAL.map((name, i) => ({
      label: `multipart: traversal file name ${i + 1}`,
      body: form(multipart([{ name: 'file', filename: name, bytes: PNG_HEAD }])),
      mustRefuse: refuse,
    })),
    {
      label: 'multipart: script file name',
      body: form(
        multipart([{ name: 'file', filename: SCRIPT_STRINGS[1] as string, bytes: PNG_HEAD }]),
      ),
      mustRefuse: refuse,
    },
    {
      label: 'multipart: other field name',
      body: form(multipart([{ name: 'upload', filename: 'a.png', bytes: PNG_HEAD }])),
      mustRefuse: refuse,
    },
    {
      label: 'multipart: SQL view',
      body: form(
        multipart([
          { name: 'view', bytes: Buffer.from(SQL_STRINGS[0] as string) },
          { name: 'file', filename: 'a.png', bytes: PNG_HEAD },
        ]),
      ),
      mustRefuse: refuse,
    },
    {
      label: 'multipart: 1 MB view',
      body: form(
        multipart([
          { name: 'view', bytes: Buffer.from(ONE_MB_STRING) },
          { name: 'file', filename: 'a.png', bytes: PNG_HEAD },
        ]),
      ),
      mustRefuse: refuse,
    },
    { label: 'multipart: JSON instead', body: json({ file: 'a.png' }), mustRefuse: refuse },
  ]
}

export interface Baseline {
  path: string
  params: Record<string, string>
  query: Record<string, string>
  queryKeys: string[]
  body: unknown
  multipart: boolean
  hasBody: boolean
}

/** The baseline itself, then each way of breaking it. */
export function attemptsFor(baseline: Baseline, w: World): Attempt[] {
  const params = Object.fromEntries(
    Object.entries(baseline.params).map(([k, v]) => [k, encodeURIComponent(v)]),
  )
  const query = queryString(baseline.query)
  const body: AttemptBody = baseline.hasBody ? json(baseline.body) : { kind: 'none' }
  const valid: Attempt = { label: 'as listed', params, query, body }
  if (baseline.multipart) valid.mustRefuse = 'no whole film in it'
  return [
    valid,
    ...pathParamAttempts(baseline.path, baseline.params, w).map((a) => ({
      ...a,
      params: a.params,
      query,
      body,
    })),
    ...queryAttempts(baseline.query, baseline.queryKeys).map((a) => ({ ...a, params, body })),
    ...(baseline.multipart
      ? multipartAttempts()
      : baseline.hasBody
        ? bodyAttempts(baseline.body)
        : []
    ).map((a) => ({ ...a, params, query })),
  ]
}
