/**
 * API bodies for the team parts library (shared/library holds the item schema and the CSV format).
 * The client validates its forms with the same schemas.
 */
import { z } from 'zod';
import { LIBRARY_LIMITS, libraryItemSchema, type LibraryItem, type LibraryKind } from '../library/schema';
import type { LibraryRowErrors } from '../library/csv';

export const LIBRARY_MAX_ITEMS = 2000;
/** A CSV of the whole library at its item limit fits in the 1 MB JSON body. */
export const LIBRARY_CSV_MAX_CHARS = 900_000;

/** A new item: the library item schema; an `id` in the body is ignored (the server assigns ids). */
export const createLibraryItemSchema = libraryItemSchema;
export type CreateLibraryItemInput = z.input<typeof createLibraryItemSchema>;

/**
 * A change to an item: any of name, manufacturer, part number and props (props replace the item's
 * props whole and are checked against the item's kind). The kind never changes.
 */
export const updateLibraryItemSchema = z
  .strictObject({
    name: z.string().trim().min(1, 'A name is required').max(LIBRARY_LIMITS.maxNameLength),
    manufacturer: z.string().trim().max(LIBRARY_LIMITS.maxManufacturerLength),
    partNumber: z.string().trim().max(LIBRARY_LIMITS.maxPartNumberLength),
    props: z.record(z.string(), z.unknown()),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to update' });
export type UpdateLibraryItemInput = z.input<typeof updateLibraryItemSchema>;

export const IMPORT_MODES = ['all_or_nothing', 'valid_rows'] as const;
export type ImportMode = (typeof IMPORT_MODES)[number];

export const importLibrarySchema = z.object({
  csv: z.string({ error: 'csv is required' }).min(1, 'The file is empty').max(LIBRARY_CSV_MAX_CHARS, 'The file is too large for one import; split it'),
  mode: z.enum(IMPORT_MODES, { error: 'mode must be all_or_nothing or valid_rows' }).default('all_or_nothing'),
});
export type ImportLibraryInput = z.input<typeof importLibrarySchema>;

/** A library item as the API returns it. */
export type LibraryRecord = LibraryItem & {
  id: string;
  teamId: string;
  manufacturer: string;
  partNumber: string;
  createdAt: string;
  updatedAt: string;
  updatedBy: { id: string; name: string } | null;
};

export interface ImportResult {
  /** Items created plus items updated. */
  imported: number;
  created: number;
  updated: number;
  /** Rows refused, row by row (empty when every row was imported). */
  rows: LibraryRowErrors[];
}

export const LIBRARY_KIND_LABELS: Record<LibraryKind, string> = { battery: 'Battery', cable: 'Cable', fuse: 'Fuse', busbar: 'Busbar' };
