import fc from 'fast-check'

/** Keys that reach `Object.prototype` or shadow its methods when code copies objects naively. */
export const PROTOTYPE_KEYS = ['__proto__', 'constructor', 'prototype', 'toString', 'valueOf', 'hasOwnProperty', '__defineGetter__'] as const

/** Strings a hostile or broken client sends: number look-alikes, injection, markup, odd unicode, NUL. */
export const NASTY_STRINGS = [
  '',
  ' ',
  '0',
  '-0',
  '1e309',
  '-1e309',
  'NaN',
  'Infinity',
  '-Infinity',
  'null',
  'true',
  '[]',
  '{}',
  "'; DROP TABLE tanks; --",
  "1' OR '1'='1",
  '$1',
  '%s%s%s',
  '${7*7}',
  '{{7*7}}',
  '<img src=x onerror=window.__x=1>',
  '<script>alert(1)</script>',
  '\u0000',
  'a\u0000b',
  '\ud800',
  '\udfff\ud800',
  '\u202e\u2066',
  '\ufeff',
  '\r\n\r\n',
  '😀'.repeat(50),
  'Ωmega ß ǅ İ',
  '__proto__',
  'constructor',
  '2026-02-30T25:61:00Z',
  '2026-12-02T10:00:00',
  '+275760-09-13T00:00:00.000Z',
  '99:99',
  '24:00',
  'x'.repeat(121),
  'x'.repeat(5000),
  'y'.repeat(70_000),
] as const

/**
 * Instants and dates at the edges of what parsers, JavaScript and PostgreSQL agree on: year 0 (no
 * such year in PostgreSQL's calendar), JavaScript's last day (275760), a leap second, the widest
 * real offsets (+14:00, -12:00) and one beyond them, dates before 1970 and far ahead.
 */
export const EDGE_TIMES = [
  '0000-01-01T00:00:00Z',
  '0000-12-31T23:59:59+14:00',
  '-000001-01-01T00:00:00Z',
  '+275760-09-13T00:00:00Z',
  '275760-09-13T00:00:00Z',
  '+275760-09-13T00:00:00.001Z',
  '2016-12-31T23:59:60Z',
  '2026-06-30T23:59:60+14:00',
  '2026-03-01T12:00:00+14:00',
  '2026-03-01T12:00:00-12:00',
  '2026-03-01T12:00:00+23:59',
  '2026-03-01T12:00:00-23:59',
  '2026-03-01T12:00:00+14:01',
  '1969-12-31T23:59:59.999Z',
  '1900-01-01T00:00:00Z',
  '9999-12-31T23:59:59.999999999Z',
  '2199-12-31T23:59:59.999Z',
  '2200-01-01T00:00:00Z',
  '2024-02-29T00:00:00Z',
  '2026-02-29T00:00:00Z',
  '0000-01-01',
  '0100-02-29',
  '1970-01-01',
  '2200-01-01',
  '9999-12-31',
  '275760-09-13',
] as const

export const NASTY_NUMBERS = [
  0,
  -0,
  -1,
  1,
  0.1,
  1e308,
  -1e308,
  5e-324,
  2 ** 31,
  2 ** 31 - 1,
  -(2 ** 31),
  2 ** 53 + 2,
  2 ** 63,
  -(2 ** 63),
  1e21,
  123456789012,
] as const

const scalar: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom<unknown>(...NASTY_STRINGS, ...NASTY_NUMBERS, null, true, false) },
  { weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
  { weight: 1, arbitrary: fc.string({ unit: 'grapheme', maxLength: 30 }) },
  { weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 30 }) },
  { weight: 2, arbitrary: fc.integer() },
  // JSON has no NaN or Infinity: they become null on the wire, which is itself worth sending.
  { weight: 2, arbitrary: fc.double() },
  { weight: 1, arbitrary: fc.date({ noInvalidDate: true }).map((d) => d.toISOString()) },
  { weight: 2, arbitrary: fc.constantFrom<unknown>(...EDGE_TIMES) },
)

const hostileKey = fc.oneof(fc.constantFrom<string>(...PROTOTYPE_KEYS), fc.string({ maxLength: 12 }), fc.constantFrom('', ' ', '\u0000', 'a.b', '0'))

/** Arrays or objects nested far deeper than any body of ours, down to a hostile leaf. */
export const deepNesting = fc.tuple(fc.integer({ min: 30, max: 3000 }), fc.boolean(), scalar).map(([depth, asArray, leaf]) => {
  let value: unknown = leaf
  for (let i = 0; i < depth; i++) value = asArray ? [value] : withOwnKey({}, 'a', value)
  return value
})

/** Sets `key` as an own enumerable property, so even `__proto__` is serialised as a plain key. */
export function withOwnKey<T extends object>(target: T, key: string, value: unknown): T {
  Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true })
  return target
}

const hostileObject = (inner: fc.Arbitrary<unknown>) =>
  fc.array(fc.tuple(hostileKey, inner), { maxLength: 6 }).map((pairs) => pairs.reduce((o, [k, v]) => withOwnKey(o, k, v), {} as object))

/** Any one hostile value: a nasty scalar, an array or object of them, deep nesting, or arbitrary JSON. */
export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 6, arbitrary: scalar },
  { weight: 2, arbitrary: fc.array(scalar, { maxLength: 8 }) },
  { weight: 1, arbitrary: fc.array(scalar, { minLength: 1001, maxLength: 1200 }) },
  { weight: 2, arbitrary: hostileObject(scalar) },
  { weight: 1, arbitrary: deepNesting },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
)

/** Every path into a JSON value (objects and arrays), so a mutation can reach nested fields. */
export function pathsOf(value: unknown, prefix: Array<string | number> = []): Array<Array<string | number>> {
  if (Array.isArray(value)) return value.flatMap((v, i) => [[...prefix, i], ...pathsOf(v, [...prefix, i])])
  if (value && typeof value === 'object') {
    return Object.entries(value).flatMap(([k, v]) => [[...prefix, k], ...pathsOf(v, [...prefix, k])])
  }
  return []
}

const clone = (value: unknown): unknown => (value === undefined ? undefined : JSON.parse(JSON.stringify(value)))

function setAt(root: unknown, path: Array<string | number>, value: unknown, remove: boolean): unknown {
  if (path.length === 0) return remove ? undefined : value
  const copy = clone(root) as Record<string | number, unknown>
  let node = copy
  for (const step of path.slice(0, -1)) {
    // An earlier mutation may have replaced a parent with a scalar: then this one has nowhere to go.
    if (!node || typeof node !== 'object') return copy
    node = node[step] as Record<string | number, unknown>
  }
  if (!node || typeof node !== 'object') return copy
  const last = path[path.length - 1]
  if (remove) {
    if (Array.isArray(node)) node.splice(Number(last), 1)
    else delete node[last]
  } else withOwnKey(node, String(last), value)
  return copy
}

type Mutation = { kind: 'replace' | 'remove'; path: Array<string | number>; value?: unknown } | { kind: 'extra'; key: string; value: unknown }

function mutation(base: unknown): fc.Arbitrary<Mutation> {
  const paths = pathsOf(base)
  const options: Array<fc.Arbitrary<Mutation>> = [fc.record({ kind: fc.constant('extra' as const), key: hostileKey, value: hostileValue })]
  if (paths.length) {
    options.push(
      fc.record({ kind: fc.constant('replace' as const), path: fc.constantFrom(...paths), value: hostileValue }),
      fc.record({ kind: fc.constant('remove' as const), path: fc.constantFrom(...paths) }),
    )
  }
  return fc.oneof(...options)
}

function apply(base: unknown, m: Mutation): unknown {
  if (m.kind === 'extra') return base && typeof base === 'object' && !Array.isArray(base) ? withOwnKey(clone(base) as object, m.key, m.value) : base
  if (m.path.length && (!base || typeof base !== 'object')) return base
  return setAt(base, m.path, m.value, m.kind === 'remove')
}

/** What one fuzz case sends: JSON text (so odd keys survive) and how it was made, for the report. */
export type FuzzBody = { json: string | undefined; how: string }

const describeMutation = (m: Mutation) => (m.kind === 'extra' ? `extra ${JSON.stringify(m.key)}` : `${m.kind} ${m.path.join('.') || '(root)'}`)

/**
 * Hostile bodies around a valid one: most change one to three fields of `base` (replace with a
 * hostile value, remove, add an extra or prototype key); the rest are a whole hostile value, text
 * that is not JSON, or no body at all.
 */
export function hostileBody(base: unknown): fc.Arbitrary<FuzzBody> {
  const mutated = fc.array(mutation(base), { minLength: 1, maxLength: 3 }).map((ms) => {
    const body = ms.reduce((b, m) => apply(b, m), clone(base))
    return { json: body === undefined ? undefined : JSON.stringify(body), how: ms.map(describeMutation).join(', ') }
  })
  const notJson = fc.constantFrom('{', '{"a":', '[1,2', "{'single':'quotes'}", '{"a":1}}', 'NaN', '\u0000', '{"a":NaN}', '{"a":Infinity}', '{"a":1e999999}')
  return fc.oneof(
    { weight: 12, arbitrary: mutated },
    { weight: 2, arbitrary: hostileValue.map((v) => ({ json: JSON.stringify(v) ?? 'null', how: 'whole body hostile' })) },
    { weight: 1, arbitrary: notJson.map((text) => ({ json: text, how: `not JSON ${JSON.stringify(text)}` })) },
    { weight: 1, arbitrary: fc.constant({ json: undefined, how: 'no body' }) },
  )
}
