/** Reading a stored working copy into the editor: validate, migrate, and fill missing settings with defaults. */
import { defaultSettings, parseDiagram, type DiagramDocument, type DiagramIssue } from '@shared/diagram';

export type StoredParse = { ok: true; doc: DiagramDocument; filledDefaults: boolean } | { ok: false; errors: DiagramIssue[] };

export function parseStoredDiagram(content: unknown): StoredParse {
  const first = parseDiagram(content);
  if (first.ok) return { ok: true, doc: first.doc, filledDefaults: false };
  // A copy saved without bank settings (or with some missing) opens with the defaults filled in.
  if (content && typeof content === 'object' && !Array.isArray(content)) {
    const c = content as Record<string, unknown>;
    const settings = c.settings && typeof c.settings === 'object' ? (c.settings as Record<string, unknown>) : {};
    const second = parseDiagram({
      parts: [], cables: [], annotations: [], ...c,
      formatVersion: c.formatVersion ?? 1,
      settings: { ...defaultSettings(), ...settings },
    });
    if (second.ok) return { ok: true, doc: second.doc, filledDefaults: true };
  }
  return { ok: false, errors: first.errors };
}
