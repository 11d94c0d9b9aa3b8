/**
 * The briefing sheet's geometry, in CSS pixels at pixel ratio 1 (docs/file-format.md does not cover
 * images; these numbers are the sheet's own):
 *
 *   sheet width  = SHEET_MARGIN + diagram width + COLUMN_GAP + SIDE_COLUMN_WIDTH + SHEET_MARGIN
 *   sheet height = SHEET_MARGIN + max(diagram height, MIN_BODY_HEIGHT, side column) + SHEET_MARGIN
 *   diagram width/height = the drawing's bounds (parts, plus annotations when included) + 2 × DIAGRAM_PADDING
 *
 * An exported PNG is the sheet times the pixel ratio (1, 2 or 4).
 */
export const SHEET_MARGIN = 24;
export const COLUMN_GAP = 16;
export const SIDE_COLUMN_WIDTH = 340;
export const MIN_BODY_HEIGHT = 760;
export const DIAGRAM_PADDING = 40;
/** Chromium's largest canvas side, px. */
export const MAX_CANVAS_SIDE = 16384;
export const PIXEL_RATIOS = [1, 2, 4] as const;
export type PixelRatio = (typeof PIXEL_RATIOS)[number];

export function sheetSize(diagram: { width: number; height: number }) {
  return {
    width: SHEET_MARGIN * 2 + diagram.width + COLUMN_GAP + SIDE_COLUMN_WIDTH,
    height: SHEET_MARGIN * 2 + Math.max(diagram.height, MIN_BODY_HEIGHT),
  };
}
