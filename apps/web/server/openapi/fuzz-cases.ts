import fc from 'fast-check';
import type { JsonSchema } from './document';

// What the route fuzz tests send: a route's example request with one part corrupted. The places
// to corrupt come from the route's own schemas (their JSON Schema: every property, optional ones
// too) and the example; the values are the kinds of input that once reached a 500.

export type Path = (string | number)[];

export const nulText = fc.constantFrom('\u0000', 'a\u0000', '\u0000b', 'Rowan\u0000Tillery');
export const loneSurrogate = fc.constantFrom('\ud800', '\udfff', 'a\ud83d', '\ude00b', 'x\udbffy');
/** Ids as a careless or hostile client writes them; only canonical digits are ids. */
export const badIdText = fc.constantFrom(
  '0',
  '-1',
  '+2',
  '0x10',
  '1e3',
  ' 2',
  '2 ',
  '2147483648',
  '99999999999',
  '1.5',
  '',
  'abc',
  '٣',
  '0002',
  '1_000',
  'Infinity',
  'NaN',
  'true',
  'null',
  '[1]',
);
export const impossibleDate = fc.constantFrom(
  '2027-02-30',
  '2026-02-31',
  '2026-02-29',
  '2026-13-01',
  '2026-00-10',
  '2026-04-31',
  '1999-12-31',
  '2100-01-01',
  '0000-01-01',
  '2026-1-1',
  '2026-01-01T00:00',
  '20260101',
  '2026-11',
);
export const badMonth = fc.constantFrom(
  '2026-13',
  '2026-00',
  '1999-12',
  '2100-01',
  '2026-1',
  '2026-11.json',
  '2026-11.csv.csv',
  '2026-11-01',
  '+2026-11',
);
export const hugeNumber = fc.constantFrom(
  2_147_483_648,
  1e308,
  -1,
  0,
  1.5,
  Number.MAX_SAFE_INTEGER + 2,
  -2_147_483_649,
  1e-7,
);
export const wrongType = fc.oneof(
  fc.boolean(),
  fc.constant(null),
  fc.integer(),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.string({ maxLength: 12 }),
  fc.string({ unit: 'binary', maxLength: 12 }),
  fc.array(fc.integer(), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 5 }), fc.integer(), { maxKeys: 2 }),
);

/** Values that must be refused wherever they stand: no field takes them. */
export const alwaysRefused = fc.oneof(nulText, loneSurrogate);
/** Query-string and path values: text only. */
export const badText = fc.oneof(
  nulText,
  badIdText,
  impossibleDate,
  badMonth,
  fc.string({ maxLength: 12 }),
  fc.string({ unit: 'binary', maxLength: 12 }),
);
export const badJson = fc.oneof(
  { weight: 3, arbitrary: alwaysRefused },
  { weight: 2, arbitrary: fc.oneof(impossibleDate, badIdText, badMonth) },
  { weight: 2, arbitrary: hugeNumber },
  { weight: 3, arbitrary: wrongType },
);

/** Paths of every value inside an example (objects and arrays included, the root as []). */
export function pathsOf(value: unknown, at: Path = []): Path[] {
  const out: Path[] = [at];
  if (Array.isArray(value)) value.forEach((v, i) => out.push(...pathsOf(v, [...at, i])));
  else if (value && typeof value === 'object')
    for (const [k, v] of Object.entries(value)) out.push(...pathsOf(v, [...at, k]));
  return out;
}

/** Paths of every property a JSON Schema names, optional ones too (array items as index 0). */
export function schemaPaths(schema: JsonSchema | undefined, at: Path = []): Path[] {
  if (!schema) return [];
  const out: Path[] = [];
  for (const branch of schema.anyOf ?? []) out.push(...schemaPaths(branch, at));
  for (const [k, v] of Object.entries(schema.properties ?? {})) {
    out.push([...at, k], ...schemaPaths(v, [...at, k]));
  }
  if (schema.items) out.push([...at, 0], ...schemaPaths(schema.items, [...at, 0]));
  return out;
}

/** A deep copy of `value` with `next` at `path` (objects and arrays made on the way). */
export function setAt(value: unknown, path: Path, next: unknown): unknown {
  if (path.length === 0) return next;
  const [head, ...rest] = path as [string | number, ...Path];
  const base = (
    Array.isArray(value)
      ? [...(value as unknown[])]
      : value && typeof value === 'object'
        ? { ...(value as object) }
        : typeof head === 'number'
          ? []
          : {}
  ) as Record<string | number, unknown>;
  // defineProperty, so that a key such as "__proto__" becomes a field and not a prototype.
  Object.defineProperty(base, head, {
    value: setAt(base[head], rest, next),
    enumerable: true,
    writable: true,
    configurable: true,
  });
  return base;
}

export function getAt(value: unknown, path: Path): unknown {
  let v = value;
  for (const k of path)
    v = v && typeof v === 'object' ? (v as Record<string, unknown>)[k] : undefined;
  return v;
}

export function removeAt(value: unknown, path: Path): unknown {
  if (path.length === 0) return undefined;
  const parent = getAt(value, path.slice(0, -1));
  if (!parent || typeof parent !== 'object' || Array.isArray(parent)) return value;
  const { [path.at(-1)!]: _gone, ...rest } = parent as Record<string, unknown>;
  return setAt(value, path.slice(0, -1), rest);
}

export type Mutation =
  | { kind: 'replace'; path: Path; value: unknown; policy: boolean }
  | { kind: 'unknown-field'; path: Path; key: string }
  | { kind: 'remove'; path: Path }
  | { kind: 'not-json'; text: string };

const unknownKey = fc.oneof(
  fc.constantFrom('isAdmin', 'shopId2', '__proto__', 'constructor', 'id ', 'ID', '\u0000', ''),
  fc.string({ minLength: 1, maxLength: 10 }),
);

/** One corruption of a JSON body: a bad value somewhere, an unknown field, a missing one, or not JSON. */
export function bodyMutation(example: unknown, schema: JsonSchema): fc.Arbitrary<Mutation> {
  const paths = uniquePaths([...pathsOf(example), ...schemaPaths(schema)]);
  const objectPaths = pathsOf(example).filter((p) => {
    const v = getAt(example, p);
    return v !== null && typeof v === 'object' && !Array.isArray(v);
  });
  const leafPaths = paths.filter((p) => p.length > 0);
  const path = fc.constantFrom(...paths);
  return fc.oneof(
    {
      weight: 4,
      arbitrary: fc
        .record({
          path: fc.constantFrom(...(leafPaths.length ? leafPaths : [[]])),
          value: alwaysRefused,
        })
        .map(({ path: p, value }) => {
          // Into an existing string, the NUL or broken half rides along with good text.
          const old = getAt(example, p);
          const text = typeof old === 'string' ? `${old}${value}` : value;
          return { kind: 'replace' as const, path: p, value: text, policy: true };
        }),
    },
    {
      weight: 5,
      arbitrary: fc
        .record({ path, value: badJson })
        .map(({ path: p, value }) => ({ kind: 'replace' as const, path: p, value, policy: false })),
    },
    {
      weight: 2,
      arbitrary: fc
        .record({
          path: fc.constantFrom(...(objectPaths.length ? objectPaths : [[]])),
          key: unknownKey,
        })
        .filter(({ path: p, key }) => {
          const v = getAt(example, p) as Record<string, unknown>;
          return !Object.hasOwn(v, key);
        })
        .map(({ path: p, key }) => ({ kind: 'unknown-field' as const, path: p, key })),
    },
    {
      weight: 1,
      arbitrary: fc
        .constantFrom(...(leafPaths.length ? leafPaths : [[]]))
        .map((p) => ({ kind: 'remove' as const, path: p })),
    },
    {
      weight: 1,
      arbitrary: fc
        .oneof(
          fc.constantFrom('', '{', '{"a":1', 'nul', '{"a":1}x', "{'a':1}", '\u0000', '[1,]'),
          fc.string({ maxLength: 8 }).filter((s) => {
            try {
              JSON.parse(s);
              return false;
            } catch {
              return true;
            }
          }),
        )
        .map((text) => ({ kind: 'not-json' as const, text })),
    },
  );
}

/** One corruption of a path or query: a key set to bad text (NUL, odd ids, impossible dates). */
export function textMutation(
  example: Record<string, string>,
  schema: JsonSchema,
): fc.Arbitrary<Mutation> {
  const keys = [...new Set([...Object.keys(example), ...Object.keys(schema.properties ?? {})])];
  return fc.oneof(
    {
      weight: 2,
      arbitrary: fc
        .record({ key: fc.constantFrom(...keys), value: nulText })
        .map(({ key, value }) => ({
          kind: 'replace' as const,
          path: [key],
          value: `${example[key] ?? ''}${value}`,
          policy: true,
        })),
    },
    {
      weight: 6,
      arbitrary: fc
        .record({ key: fc.constantFrom(...keys), value: badText })
        .map(({ key, value }) => ({ kind: 'replace' as const, path: [key], value, policy: false })),
    },
    {
      weight: 1,
      arbitrary: fc.constantFrom(...keys).map((key) => ({ kind: 'remove' as const, path: [key] })),
    },
  );
}

export function apply(example: unknown, mutation: Mutation): unknown {
  switch (mutation.kind) {
    case 'replace':
      return setAt(example, mutation.path, mutation.value);
    case 'unknown-field':
      return setAt(example, [...mutation.path, mutation.key], 1);
    case 'remove':
      return removeAt(example, mutation.path);
    case 'not-json':
      return undefined;
  }
}

function uniquePaths(paths: Path[]): Path[] {
  const seen = new Map<string, Path>();
  for (const p of paths) seen.set(JSON.stringify(p), p);
  return [...seen.values()];
}
