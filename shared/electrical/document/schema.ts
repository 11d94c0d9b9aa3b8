/**
 * # The diagram document
 *
 * It lives beside the electrical core because the core reads it (compile, analysis, rules, sizing):
 * the document sits below the core, and shared/diagram (parse, templates, BOM, diff, summary) builds
 * on both, so imports run one way — diagram → electrical.
 *
 * The one format the editor draws, a revision stores and a file carries (docs/file-format.md).
 * JSON, SI units throughout (field names end in their unit: `length_m`, `capacity_Ah`, `ambient_C`).
 *
 * ```
 * { formatVersion: 1,
 *   name?: string,
 *   settings: { systemVoltage_V, designMargin, voltageDropLimit_pct, ampacityTable, ambient_C,
 *               maxPostToPost, busbarLengthTolerance_pct, imbalanceThreshold_pct, ruleSet },
 *   parts:   [{ id, type, label, position: { x, y }, rotation: 0|90|180|270, props }],
 *   cables:  [{ id, from: { part, terminal }, to: { part, terminal }, props, label?, waypoints? }],
 *   annotations: [{ id, kind, ... }] }
 * ```
 *
 * - `parts` is a union on `type` (battery, series_string, lug, busbar, fuse, switch, shunt, inverter,
 *   dc_load, charger, note); `props` is that type's schema from shared/electrical/parts. Terminal names
 *   come from the part type (battery pos/neg, fuse a/b, busbar t1..tN …) — see `partTerminals`.
 * - `cables` join two part terminals; `props` is a cable run (conductor size, length, material,
 *   insulation, installation, role 'cable' | 'jumper').
 * - `annotations` is open for a later format feature: each entry needs `id` and `kind`; other fields
 *   are kept as they are.
 * - Ids (parts and cables share one id space) are 1–64 characters of letters, digits, "_" and "-".
 * - Positions are editor canvas units (pixels at zoom 1); rotation in degrees clockwise.
 *
 * Use `parseDiagram` (shared/diagram/parse.ts) to read untrusted JSON; it migrates older versions and
 * reports errors with JSON paths.
 */
import { z } from 'zod';
import { AMPACITY_TABLE_IDS } from '../tables/ampacity';
import {
  batteryPropsSchema, busbarPropsSchema, cableRunPropsSchema, chargerPropsSchema, dcLoadPropsSchema,
  fusePropsSchema, inverterPropsSchema, lugPropsSchema, notePropsSchema, seriesStringPropsSchema,
  shuntPropsSchema, switchPropsSchema,
} from '../parts';
import { PART_TYPES, type PartType } from '../parts/registry';

export const DIAGRAM_FORMAT_VERSION = 1 as const;

/** Rule sets the protection checks can follow (settings.ruleSet). */
export const RULE_SETS = ['general', 'marine'] as const;
export type RuleSet = (typeof RULE_SETS)[number];

export const DIAGRAM_LIMITS = {
  maxParts: 2000,
  maxCables: 5000,
  maxAnnotations: 1000,
  maxWaypoints: 50,
  maxNameLength: 200,
  maxLabelLength: 120,
  maxIdLength: 64,
} as const;

export const idSchema = z
  .string()
  .min(1)
  .max(DIAGRAM_LIMITS.maxIdLength)
  .regex(/^[A-Za-z0-9_-]+$/, 'Ids use letters, digits, "_" and "-" only');

const coordinate = z.number().min(-1e6).max(1e6);
export const positionSchema = z.object({ x: coordinate, y: coordinate });
export const rotationSchema = z.union([z.literal(0), z.literal(90), z.literal(180), z.literal(270)]);

export const settingsSchema = z.object({
  /** The bank's nominal voltage, V. */
  systemVoltage_V: z.number().positive().max(1500),
  /** Factor over each battery's expected current share when sizing its fuse (common practice 1.25–1.5). */
  designMargin: z.number().min(1).max(5).default(1.25),
  /** Allowed voltage drop, % of system voltage (common practice 3 % for critical circuits). */
  voltageDropLimit_pct: z.number().positive().max(50).default(3),
  ampacityTable: z.enum(AMPACITY_TABLE_IDS).default('nec-310.16-75C'),
  /** Ambient around the bank, °C. */
  ambient_C: z.number().min(-60).max(150).default(30),
  /** Most batteries chained post to post before a busbar is advised. */
  maxPostToPost: z.int().min(1).max(64).default(4),
  /** Allowed spread of cable lengths that should be equal, %. */
  busbarLengthTolerance_pct: z.number().min(0).max(100).default(10),
  /** Current-share imbalance that is flagged, %. */
  imbalanceThreshold_pct: z.number().min(0).max(100).default(10),
  /**
   * Which practice the protection checks follow: 'general' (NEC-style, the default) or 'marine'
   * (adds the marine battery rules: battery fuse within 7 in / 175 mm of the post, a battery switch).
   */
  ruleSet: z.enum(RULE_SETS).default('general'),
});
export type DiagramSettings = z.infer<typeof settingsSchema>;

const label = z.string().max(DIAGRAM_LIMITS.maxLabelLength);

function partSchema<T extends PartType, S extends z.ZodType>(type: T, props: S) {
  return z.object({
    id: idSchema,
    type: z.literal(type),
    label: label.default(''),
    position: positionSchema,
    rotation: rotationSchema.default(0),
    props,
  });
}

export const batteryPartSchema = partSchema('battery', batteryPropsSchema);
export const seriesStringPartSchema = partSchema('series_string', seriesStringPropsSchema);
export const lugPartSchema = partSchema('lug', lugPropsSchema);
export const busbarPartSchema = partSchema('busbar', busbarPropsSchema);
export const fusePartSchema = partSchema('fuse', fusePropsSchema);
export const switchPartSchema = partSchema('switch', switchPropsSchema);
export const shuntPartSchema = partSchema('shunt', shuntPropsSchema);
export const inverterPartSchema = partSchema('inverter', inverterPropsSchema);
export const dcLoadPartSchema = partSchema('dc_load', dcLoadPropsSchema);
export const chargerPartSchema = partSchema('charger', chargerPropsSchema);
export const notePartSchema = partSchema('note', notePropsSchema);

export const partSchemaUnion = z.discriminatedUnion('type', [
  batteryPartSchema, seriesStringPartSchema, lugPartSchema, busbarPartSchema, fusePartSchema, switchPartSchema,
  shuntPartSchema, inverterPartSchema, dcLoadPartSchema, chargerPartSchema, notePartSchema,
]);
export type DiagramPart = z.infer<typeof partSchemaUnion>;
export type DiagramPartOf<T extends PartType> = Extract<DiagramPart, { type: T }>;

export const terminalRefSchema = z.object({ part: idSchema, terminal: z.string().min(1).max(16) });
export type TerminalRef = z.infer<typeof terminalRefSchema>;

export const cableSchema = z.object({
  id: idSchema,
  from: terminalRefSchema,
  to: terminalRefSchema,
  props: cableRunPropsSchema,
  label: label.optional(),
  /** Bend points for the editor's drawing, canvas units. */
  waypoints: z.array(positionSchema).max(DIAGRAM_LIMITS.maxWaypoints).optional(),
});
export type DiagramCable = z.infer<typeof cableSchema>;

/** Open for a later format feature: `id` and `kind` required, everything else kept as given. */
export const annotationSchema = z.looseObject({ id: idSchema, kind: z.string().min(1).max(40) });
export type DiagramAnnotation = z.infer<typeof annotationSchema>;

/** Terminal names of a diagram part. */
export function terminalsOf(part: DiagramPart): readonly string[] {
  return (PART_TYPES[part.type].terminals as (p: unknown) => readonly string[])(part.props);
}

export const diagramSchema = z
  .object({
    formatVersion: z.literal(DIAGRAM_FORMAT_VERSION),
    name: z.string().max(DIAGRAM_LIMITS.maxNameLength).optional(),
    settings: settingsSchema,
    parts: z.array(partSchemaUnion).max(DIAGRAM_LIMITS.maxParts),
    cables: z.array(cableSchema).max(DIAGRAM_LIMITS.maxCables),
    annotations: z.array(annotationSchema).max(DIAGRAM_LIMITS.maxAnnotations).default([]),
  })
  .superRefine((doc, ctx) => {
    // One id space for parts, cables and annotations.
    const seen = new Map<string, string>();
    const claim = (id: string, path: (string | number)[]) => {
      const first = seen.get(id);
      if (first) ctx.addIssue({ code: 'custom', path, message: `Duplicate id "${id}" (also used at ${first})` });
      else seen.set(id, path.join('.'));
    };
    doc.parts.forEach((p, i) => claim(p.id, ['parts', i, 'id']));
    doc.cables.forEach((c, i) => claim(c.id, ['cables', i, 'id']));
    doc.annotations.forEach((a, i) => claim(a.id, ['annotations', i, 'id']));

    const parts = new Map(doc.parts.map((p) => [p.id, p]));
    // A part whose props already failed validation has no trustworthy terminal list (a busbar with an
    // absurd tapCount would build billions of names): its props error stands, its cables are not checked.
    const propsValid = new Map<string, boolean>();
    const validProps = (part: DiagramPart) => {
      let ok = propsValid.get(part.id);
      if (ok === undefined) {
        ok = PART_TYPES[part.type].schema.safeParse(part.props).success;
        propsValid.set(part.id, ok);
      }
      return ok;
    };
    doc.cables.forEach((c, i) => {
      for (const end of ['from', 'to'] as const) {
        const ref = c[end];
        const part = parts.get(ref.part);
        if (!part) {
          ctx.addIssue({ code: 'custom', path: ['cables', i, end, 'part'], message: `No part with id "${ref.part}"` });
          continue;
        }
        if (!validProps(part)) continue;
        const terminals = terminalsOf(part);
        if (!terminals.includes(ref.terminal)) {
          ctx.addIssue({
            code: 'custom',
            path: ['cables', i, end, 'terminal'],
            message: terminals.length
              ? `Part "${ref.part}" (${part.type}) has no terminal "${ref.terminal}"; it has ${terminals.join(', ')}`
              : `Part "${ref.part}" (${part.type}) has no terminals`,
          });
        }
      }
      if (c.from.part === c.to.part && c.from.terminal === c.to.terminal) {
        ctx.addIssue({ code: 'custom', path: ['cables', i, 'to'], message: 'A cable cannot start and end on the same terminal' });
      }
    });
  });

/** A valid diagram document (defaults filled in). */
export type DiagramDocument = z.infer<typeof diagramSchema>;
/** A diagram document as written in a file (defaults may be missing). */
export type DiagramDocumentInput = z.input<typeof diagramSchema>;

/** Default settings for a new diagram at a system voltage. */
export function defaultSettings(systemVoltage_V = 12): DiagramSettings {
  return settingsSchema.parse({ systemVoltage_V });
}

/** An empty diagram document. */
export function emptyDiagram(name?: string, systemVoltage_V = 12): DiagramDocument {
  return { formatVersion: DIAGRAM_FORMAT_VERSION, ...(name ? { name } : {}), settings: defaultSettings(systemVoltage_V), parts: [], cables: [], annotations: [] };
}
