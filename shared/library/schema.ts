/**
 * The team parts library: team-wide presets of batteries, cables, fuses and busbars (docs/parts-library.md).
 *
 * An item is `{ id?, kind, name, manufacturer?, partNumber?, props }` where `props` is the part props
 * schema of its kind from shared/electrical/parts:
 * - battery: the battery props (a library battery is stored full, state of charge 1, so placing it is a copy),
 *   with its current limits: maximum continuous, and maximum pulse current with the pulse's duration;
 * - cable: conductor, material, stranding and insulation rating — what is on the reel. Length,
 *   installation and role belong to each run in a diagram, not to the preset;
 * - fuse: the fuse props; busbar: the busbar props.
 * Manufacturer and part number are free text.
 */
import { z } from 'zod';
import { batteryPropsSchema, busbarPropsSchema, cableRunPropsSchema, fusePropsSchema } from '../electrical/parts';

export const LIBRARY_KINDS = ['battery', 'cable', 'fuse', 'busbar'] as const;
export type LibraryKind = (typeof LIBRARY_KINDS)[number];

export const LIBRARY_LIMITS = { maxNameLength: 120, maxManufacturerLength: 120, maxPartNumberLength: 60, maxIdLength: 64 } as const;

/** A cable preset: what is on the reel (a cable run's props without length, installation and role). */
export const cablePresetPropsSchema = cableRunPropsSchema.pick({ conductor: true, material: true, stranding: true, insulation_C: true });
export type CablePresetProps = z.infer<typeof cablePresetPropsSchema>;

const base = {
  id: z.string().trim().min(1).max(LIBRARY_LIMITS.maxIdLength).optional(),
  name: z.string().trim().min(1, 'A name is required').max(LIBRARY_LIMITS.maxNameLength),
  manufacturer: z.string().trim().max(LIBRARY_LIMITS.maxManufacturerLength).optional(),
  partNumber: z.string().trim().max(LIBRARY_LIMITS.maxPartNumberLength).optional(),
};

export const libraryItemSchema = z.discriminatedUnion('kind', [
  z.object({ ...base, kind: z.literal('battery'), props: batteryPropsSchema }),
  z.object({ ...base, kind: z.literal('cable'), props: cablePresetPropsSchema }),
  z.object({ ...base, kind: z.literal('fuse'), props: fusePropsSchema }),
  z.object({ ...base, kind: z.literal('busbar'), props: busbarPropsSchema }),
]);
export type LibraryItem = z.infer<typeof libraryItemSchema>;
export type LibraryItemInput = z.input<typeof libraryItemSchema>;
export type LibraryItemOf<K extends LibraryKind> = Extract<LibraryItem, { kind: K }>;
