/**
 * Structure-aware mutation of JSON documents for fuzzing: take a valid document and damage it at
 * random places (delete a key or an element, replace a value with a hostile one, duplicate an array
 * entry, retype a value, plant prototype keys), or damage its text (truncate, flip, splice bytes).
 * Deterministic given fast-check's generated choices, so a failure shrinks and replays.
 */
import fc from 'fast-check';

/** FUZZ_SCALE multiplies every fuzz run count (default 1, the npm test share); e.g. FUZZ_SCALE=10 for a long run. */
export const FUZZ_SCALE = Math.max(0.01, Number(process.env.FUZZ_SCALE) || 1);
export const scaled = <T extends Record<string, number>>(runs: T): T =>
  Object.fromEntries(Object.entries(runs).map(([k, v]) => [k, Math.max(1, Math.round(v * FUZZ_SCALE))])) as T;

type Path = (string | number)[];

/** Values that break naive parsers and numeric code (NaN and ±Infinity only reach in-memory inputs). */
export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 3, arbitrary: fc.jsonValue({ maxDepth: 2 }) },
  {
    weight: 3,
    arbitrary: fc.constantFrom<unknown>(
      NaN, Infinity, -Infinity, -0, 0, -1, 1e308, -1e308, 5e-324, 2 ** 53 + 1, 1e21,
      '', ' ', '\u0000', 'NaN', '1e400', '-0', '💥'.repeat(40), 'x'.repeat(5000), '../../etc/passwd', "'; drop table users; --",
      null, true, false, [], {}, [[[[[]]]]], JSON.parse('{"__proto__":{"polluted":true}}'), JSON.parse('{"constructor":{"prototype":{"polluted":true}}}'),
    ),
  },
  { weight: 2, arbitrary: fc.double() },
  { weight: 2, arbitrary: fc.string({ maxLength: 40 }) },
  { weight: 1, arbitrary: fc.integer() },
);

function pathsOf(value: unknown, limit = 4000): Path[] {
  const out: Path[] = [[]];
  const walk = (v: unknown, p: Path) => {
    if (out.length >= limit) return;
    if (Array.isArray(v)) {
      v.forEach((x, i) => {
        out.push([...p, i]);
        walk(x, [...p, i]);
      });
    } else if (v && typeof v === 'object') {
      for (const [k, x] of Object.entries(v)) {
        out.push([...p, k]);
        walk(x, [...p, k]);
      }
    }
  };
  walk(value, []);
  return out;
}

function parentOf(root: unknown, path: Path): unknown {
  let v = root as Record<string | number, unknown>;
  for (const k of path.slice(0, -1)) v = v[k] as Record<string | number, unknown>;
  return v;
}

export interface MutationOp {
  at: number;
  kind: number;
  value: unknown;
  key: string;
}

const opArb: fc.Arbitrary<MutationOp> = fc.record({
  at: fc.nat(),
  kind: fc.integer({ min: 0, max: 6 }),
  value: hostileValue,
  key: fc.oneof(fc.constantFrom('__proto__', 'constructor', 'id', 'type', 'props', 'kind', 'parts', 'elements'), fc.string({ maxLength: 12 })),
});

/** Apply mutation ops to a deep copy of `doc`. */
export function applyOps(doc: unknown, ops: MutationOp[]): unknown {
  let root: unknown = structuredClone(doc);
  for (const op of ops) {
    const paths = pathsOf(root);
    const path = paths[op.at % paths.length];
    if (path.length === 0) {
      if (op.kind === 0) root = op.value; // replace the whole document
      continue;
    }
    const parent = parentOf(root, path) as Record<string | number, unknown> & unknown[];
    const key = path[path.length - 1];
    const current = parent[key];
    switch (op.kind) {
      case 0: // replace with a hostile value
      case 1:
        parent[key] = op.value;
        break;
      case 2: // delete
        if (Array.isArray(parent)) parent.splice(key as number, 1);
        else delete parent[key];
        break;
      case 3: // duplicate an array entry (duplicate ids), or copy the value under a new key
        if (Array.isArray(parent)) parent.splice(key as number, 0, structuredClone(current));
        else Object.defineProperty(parent, op.key, { value: structuredClone(current), enumerable: true, configurable: true, writable: true });
        break;
      case 4: // retype: number <-> string, object -> array
        parent[key] = typeof current === 'number' ? String(current) : typeof current === 'string' ? Number(current) : Array.isArray(current) ? { ...current } : current && typeof current === 'object' ? Object.values(current) : [current];
        break;
      case 5: // plant an extra key (incl. prototype keys) on the nearest object
        if (current && typeof current === 'object' && !Array.isArray(current)) {
          Object.defineProperty(current, op.key, { value: op.value, enumerable: true, configurable: true, writable: true });
        } else parent[key] = op.value;
        break;
      case 6: // scale a number to the edges
        parent[key] = typeof current === 'number' ? current * (op.at % 2 ? 1e300 : -1) : op.value;
        break;
    }
  }
  return root;
}

/** A copy of `doc` damaged by 1–4 structural mutations. */
export function mutatedValue(doc: fc.Arbitrary<unknown>): fc.Arbitrary<unknown> {
  return fc.tuple(doc, fc.array(opArb, { minLength: 1, maxLength: 4 })).map(([d, ops]) => applyOps(d, ops));
}

/** The JSON text of `doc` damaged at the byte level: truncated, a character flipped, or text spliced in. */
export function mutatedText(doc: fc.Arbitrary<unknown>): fc.Arbitrary<string> {
  return fc
    .tuple(doc, fc.nat(), fc.integer({ min: 0, max: 3 }), fc.string({ maxLength: 8 }), fc.integer({ min: 0, max: 0xffff }))
    .map(([d, at, kind, insert, code]) => {
      const text = JSON.stringify(d);
      const i = text.length === 0 ? 0 : at % text.length;
      switch (kind) {
        case 0:
          return text.slice(0, i);
        case 1:
          return text.slice(0, i) + String.fromCharCode(code) + text.slice(i + 1);
        case 2:
          return text.slice(0, i) + insert + text.slice(i);
        default:
          return text.slice(0, i) + text.slice(i + 1 + (at % 7));
      }
    });
}

/** Every number reachable in a value (for "no NaN / Infinity in results" checks). */
export function numbersIn(value: unknown, out: { path: string; value: number }[] = [], path = '$'): { path: string; value: number }[] {
  if (typeof value === 'number') out.push({ path, value });
  else if (Array.isArray(value)) value.forEach((v, i) => numbersIn(v, out, `${path}[${i}]`));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) numbersIn(v, out, `${path}.${k}`);
  return out;
}
