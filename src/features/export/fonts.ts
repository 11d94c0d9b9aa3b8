/**
 * The shipped font (IBM Plex, self-hosted through @fontsource) as CSS with the font files inlined, for
 * html-to-image's `fontEmbedCSS`. Computed once per page with `getFontEmbedCSS`, then cut down to the
 * subsets a briefing uses (Latin and Latin Extended; Cyrillic, Greek and Vietnamese faces dropped) so each export stays small.
 */
import { getFontEmbedCSS } from 'html-to-image';

let cached: Promise<string> | null = null;

/** Subsets left out, by the first code point of their unicode-range (browsers may drop leading zeros). */
const DROPPED_SUBSETS = /unicode-range:\s*U\+0*(301|460|370|1F00|102-0*103)\b/i;

export function fontEmbedCss(node: HTMLElement): Promise<string> {
  cached ??= getFontEmbedCSS(node)
    .then((css) => {
      const faces = css.split(/(?=@font-face)/).filter((face) => face.trim() && !DROPPED_SUBSETS.test(face));
      return faces.join('\n');
    })
    .catch((err) => {
      cached = null;
      throw err;
    });
  return cached;
}
