/**
 * The network file (JSON, see docs/cli.md): zod schema and parser. Unknown fields are ignored. A parsed
 * network is also validated (ids, values, node references, floating nodes, loops of ideal sources).
 */
import { z } from 'zod';
import type { Network, SolveError } from './types';
import { solveError, validateNetwork } from './validate';

// Any JSON number, including a huge literal that parses to Infinity, so validateNetwork can name the
// element and field instead of a schema message.
const num = z.custom<number>((v) => typeof v === 'number', { message: 'expected a number' });
const name = z.string().min(1, 'expected a non-empty string');
const base = { id: name, role: z.string().optional() };

export const networkElementSchema = z.discriminatedUnion('kind', [
  z.object({ ...base, kind: z.literal('battery'), pos: name, neg: name, ocv_V: num, r_ohm: num }),
  z.object({ ...base, kind: z.literal('resistor'), a: name, b: name, r_ohm: num }),
  z.object({ ...base, kind: z.literal('load_resistor'), a: name, b: name, r_ohm: num }),
  z.object({ ...base, kind: z.literal('current_source'), from: name, to: name, amps: num }),
  z.object({ ...base, kind: z.literal('constant_power'), pos: name, neg: name, watts: num, v_min_V: num.optional() }),
  z.object({
    ...base,
    kind: z.literal('voltage_source'),
    pos: name,
    neg: name,
    volts: num,
    i_max_A: num.optional(),
    r_ohm: num.optional(),
  }),
]);

export const networkSchema = z.object({
  ground: name,
  nodes: z.array(name).optional(),
  elements: z.array(networkElementSchema),
});

export type ParseOutcome = { ok: true; network: Network } | SolveError;

/** Validates an already-decoded JSON value as a network. */
export function parseNetwork(value: unknown): ParseOutcome {
  const parsed = networkSchema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const path = issue.path;
    let where = path.length ? path.join('.') : 'network';
    const elements: string[] = [];
    if (path[0] === 'elements' && typeof path[1] === 'number') {
      const raw = (value as { elements?: unknown[] }).elements?.[path[1]] as { id?: unknown } | undefined;
      const id = raw && typeof raw.id === 'string' ? raw.id : undefined;
      const field = path.slice(2).join('.') || 'kind';
      where = id ? `element '${id}' (elements[${path[1]}]) ${field}` : `elements[${path[1]}] ${field}`;
      if (id) elements.push(id);
    }
    const message =
      issue.code === 'invalid_union' && path.length === 2
        ? 'kind must be one of battery, resistor, load_resistor, current_source, constant_power, voltage_source'
        : issue.message;
    return solveError('malformed_network', `${where}: ${message}`, { elements });
  }
  const network = parsed.data as Network;
  const checked = validateNetwork(network);
  if (!checked.ok) return checked;
  return { ok: true, network };
}

/** Parses the text of a network file. */
export function parseNetworkJson(text: string): ParseOutcome {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    return solveError('malformed_network', `not valid JSON: ${(e as Error).message}`);
  }
  return parseNetwork(value);
}
