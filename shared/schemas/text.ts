/**
 * Input rules that hold for every JSON body the API accepts, whatever its schema (docs/decisions/014):
 *
 * - Text is well-formed Unicode: a lone UTF-16 surrogate (half of a pair, e.g. "\ud83d") is refused.
 *   PostgreSQL's jsonb refuses its escape and text columns would silently turn it into U+FFFD, so it
 *   could never be stored as given.
 * - No NUL (U+0000) in any text or key: PostgreSQL text and jsonb cannot hold it.
 * - Numbers are finite: JSON text such as 1e400 reads as Infinity, which JSON cannot store back.
 * - Nesting at most MAX_JSON_DEPTH levels: serialising a deeper value overflows the stack.
 *
 * `findInputProblems` walks a parsed value with an explicit stack (no recursion, so no depth at which
 * the walk itself gives up) and returns the first problems with the dotted path of each field.
 * OWASP ASVS 5.0 1.2 / 2.2 (input validation on a trusted service layer), OWASP Input Validation Cheat
 * Sheet (validate Unicode as well as structure).
 */

/** Deepest nesting a body may have (the body itself is level 0). Diagram documents need about 6. */
export const MAX_JSON_DEPTH = 100;

export const TEXT_RULE_MESSAGES = {
  nul: 'Text must not contain NUL characters',
  surrogate: 'Text contains an incomplete character (a lone UTF-16 surrogate); retype or paste it again',
  nulKey: 'Field names must not contain NUL characters',
  surrogateKey: 'Field names must not contain incomplete characters (lone UTF-16 surrogates)',
  number: 'Number is out of range (it must be finite)',
  depth: `Nested more than ${MAX_JSON_DEPTH} levels deep`,
} as const;

/** True when `s` has no lone surrogate (String.prototype.isWellFormed where the runtime has it). */
export function isWellFormedText(s: string): boolean {
  const native = (s as { isWellFormed?: () => boolean }).isWellFormed;
  if (typeof native === 'function') return native.call(s);
  // In a /u regex a surrogate class matches only surrogates that are not part of a pair.
  return !/[\uD800-\uDFFF]/u.test(s);
}

/** Problems with one string: NUL, lone surrogate. */
export function textProblem(s: string): string | null {
  if (s.includes('\u0000')) return TEXT_RULE_MESSAGES.nul;
  if (!isWellFormedText(s)) return TEXT_RULE_MESSAGES.surrogate;
  return null;
}

export interface InputProblem {
  /** Dotted path of the field ("" for the body itself), as in `details.fields`. */
  path: string;
  message: string;
}

/** A key as shown in a path: JSON's escapes make a NUL or lone surrogate visible (and the answer well-formed). */
function escapeKey(key: string): string {
  return JSON.stringify(key).slice(1, -1);
}

interface Node {
  v: unknown;
  key: string;
  parent: Node | null;
  depth: number;
}

function pathOf(node: Node): string {
  const keys: string[] = [];
  for (let n: Node | null = node; n && n.parent; n = n.parent) keys.push(n.key);
  return keys.reverse().join('.');
}

/**
 * Every problem in `value` with the input rules above, at most `limit` of them. The walk has no depth
 * limit of its own; below a node nested too deep nothing more is reported, as its depth problem covers it.
 */
export function findInputProblems(value: unknown, limit = 20): InputProblem[] {
  const out: InputProblem[] = [];
  const stack: Node[] = [{ v: value, key: '', parent: null, depth: 0 }];
  while (stack.length > 0 && out.length < limit) {
    const node = stack.pop()!;
    const v = node.v;
    if (typeof v === 'string') {
      const p = textProblem(v);
      if (p) out.push({ path: pathOf(node), message: p });
    } else if (typeof v === 'number') {
      if (!Number.isFinite(v)) out.push({ path: pathOf(node), message: TEXT_RULE_MESSAGES.number });
    } else if (v !== null && typeof v === 'object') {
      if (node.depth >= MAX_JSON_DEPTH) {
        out.push({ path: pathOf(node), message: TEXT_RULE_MESSAGES.depth });
        continue;
      }
      const depth = node.depth + 1;
      if (Array.isArray(v)) {
        for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], key: String(i), parent: node, depth });
      } else {
        const keys = Object.keys(v);
        for (let i = keys.length - 1; i >= 0; i--) {
          const k = keys[i]!;
          const kp = textProblem(k);
          if (kp) {
            const path = pathOf(node);
            out.push({ path: path ? `${path}.${escapeKey(k)}` : escapeKey(k), message: kp === TEXT_RULE_MESSAGES.nul ? TEXT_RULE_MESSAGES.nulKey : TEXT_RULE_MESSAGES.surrogateKey });
            continue;
          }
          stack.push({ v: (v as Record<string, unknown>)[k], key: k, parent: node, depth });
        }
      }
    }
  }
  return out;
}
