/**
 * fast-check arbitraries from the API's zod schemas (zod 4): objects, strings (length bounds, e-mail),
 * numbers and integers (bounds), booleans, enums, literals, arrays, unions, records, optional, nullable
 * and defaulted fields. Where a schema asks for something a generator cannot know — an id that must
 * exist, a pattern, a refinement — the field takes the example's value instead (or, half the time, a
 * generated one that will likely be refused). The fuzz suite then mutates what this generates.
 */
import fc from 'fast-check';
import type { z } from 'zod';

type Def = { type: string; [k: string]: unknown };
type Bag = { minimum?: number; maximum?: number; format?: string; patterns?: Set<RegExp> };

const defOf = (s: z.ZodType): Def => (s as unknown as { _zod: { def: Def } })._zod.def;
const bagOf = (s: z.ZodType): Bag => ((s as unknown as { _zod: { bag?: Bag } })._zod.bag ?? {}) as Bag;

/** Text with the characters that break naive code: pairs, combining marks, right-to-left, quotes, controls. */
const trickyText = fc.oneof(
  fc.string({ unit: 'grapheme', maxLength: 30 }),
  fc.string({ unit: 'binary', maxLength: 30 }),
  fc.constantFrom('🔋 Bank ⚡', 'e\u0301', '\u202Eevil', 'O\'Brien "quoted"', '<script>x</script>', '  padded  ', 'Ångström 日本語 עברית'),
);

const emails = fc.oneof(fc.emailAddress(), fc.constantFrom('Crew.Lead@Example.TEST', 'a@b.c', 'not-an-email'));

/** An arbitrary for `schema`; `example` supplies values the schema alone cannot (ids, patterns). */
export function fromZod(schema: z.ZodType, example?: unknown, depth = 0): fc.Arbitrary<unknown> {
  const def = defOf(schema);
  const ex = example !== undefined ? fc.constant(example) : undefined;
  const mix = (gen: fc.Arbitrary<unknown>) => (ex ? fc.oneof({ weight: 1, arbitrary: ex }, { weight: 1, arbitrary: gen }) : gen);
  switch (def.type) {
    case 'object': {
      const shape = def.shape as Record<string, z.ZodType>;
      const ex0 = (example && typeof example === 'object' ? example : {}) as Record<string, unknown>;
      const fields: Record<string, fc.Arbitrary<unknown>> = {};
      for (const [k, s] of Object.entries(shape)) fields[k] = fromZod(s, ex0[k], depth + 1);
      const optional = Object.entries(shape).filter(([, s]) => ['optional', 'default'].includes(defOf(s).type)).map(([k]) => k);
      return fc.record(fields, { requiredKeys: Object.keys(shape).filter((k) => !optional.includes(k)) });
    }
    case 'string': {
      const bag = bagOf(schema);
      if (bag.format === 'email') return mix(emails);
      if (bag.patterns && bag.patterns.size > 0) return mix(trickyText);
      const min = bag.minimum ?? 0;
      const max = Math.min(bag.maximum ?? 60, 200);
      return mix(fc.oneof(fc.string({ unit: 'grapheme', minLength: Math.min(min, max), maxLength: max }), trickyText));
    }
    case 'number':
    case 'int': {
      const bag = bagOf(schema);
      const min = Number.isFinite(bag.minimum) ? bag.minimum! : -1e6;
      const max = Number.isFinite(bag.maximum) ? bag.maximum! : 1e6;
      const int = def.type === 'int' || bag.format === 'safeint' || bag.format === 'int32';
      return mix(int ? fc.integer({ min: Math.max(min, Number.MIN_SAFE_INTEGER), max: Math.min(max, Number.MAX_SAFE_INTEGER) }) : fc.double({ min, max, noNaN: true }));
    }
    case 'boolean':
      return fc.boolean();
    case 'enum':
      return fc.constantFrom(...Object.values(def.entries as Record<string, unknown>));
    case 'literal':
      return fc.constantFrom(...(def.values as unknown[]));
    case 'optional':
    case 'default':
    case 'prefault':
      return fromZod(def.innerType as z.ZodType, example, depth);
    case 'nullable':
      return fc.oneof(fc.constant(null), fromZod(def.innerType as z.ZodType, example, depth));
    case 'array': {
      const bag = bagOf(schema);
      const exArr = Array.isArray(example) ? example : [];
      return mix(fc.array(fromZod(def.element as z.ZodType, exArr[0], depth + 1), { minLength: bag.minimum ?? 0, maxLength: Math.min(bag.maximum ?? 4, 4) }));
    }
    case 'union':
      return fc.oneof(...(def.options as z.ZodType[]).map((o) => fromZod(o, example, depth)));
    case 'pipe':
      return fromZod(def.in as z.ZodType, example, depth);
    case 'record':
      return mix(fc.dictionary(fc.string({ maxLength: 12 }), depth > 3 ? fc.jsonValue({ maxDepth: 1 }) : fromZod(def.valueType as z.ZodType, undefined, depth + 1), { maxKeys: 4 }));
    case 'unknown':
    case 'any':
      return ex ?? fc.jsonValue({ maxDepth: 2 });
    default:
      // transform, lazy, custom, …: the example, or any JSON value.
      return ex ?? fc.jsonValue({ maxDepth: 2 });
  }
}
