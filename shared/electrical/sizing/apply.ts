/**
 * Applying sizing suggestions to a document.
 *
 * A battery's own fuse sits at that battery's post, in series with that battery alone: when a unit has no
 * fuse of its own, a fuse is added and everything that was on the unit's positive post (a post-to-post
 * jumper chain, main leads, the battery cable to a busbar) moves to the fuse's bank side (terminal b); a
 * short conductor joins the post to the fuse's battery side (terminal a). The fuse then carries exactly
 * that unit's current. An existing own fuse is re-rated (or re-classed), and branch cables take the
 * suggested conductor.
 */
import { type DiagramDocument, diagramSchema } from '../document/schema';
import { cableRunDefaults } from '../parts/cable';
import { type FuseProps, fuseDefaults } from '../parts/passive';
import type { BranchSizing } from './suggest';

/** Length assumed for the conductor from a battery post to a fuse the sizing adds there, m. */
export const POST_LINK_LENGTH_M = 0.1;

/** Fuse terminals named for what they face. */
export const FUSE_BATTERY_SIDE = 'a';
export const FUSE_BANK_SIDE = 'b';

function uniqueId(doc: DiagramDocument, base: string): string {
  const used = new Set<string>([...doc.parts.map((p) => p.id), ...doc.cables.map((c) => c.id), ...doc.annotations.map((a) => a.id)]);
  if (!used.has(base)) return base;
  for (let i = 2; ; i++) if (!used.has(`${base}-${i}`)) return `${base}-${i}`;
}

/** Canvas offset of an added fuse from its battery: above the positive post. */
const FUSE_OFFSET = { x: 0, y: -130 };

/** A new document with the suggestions applied (suggestions in conflict are left out). */
export function applySizing(doc: DiagramDocument, suggestion: BranchSizing | BranchSizing[]): DiagramDocument {
  const list = (Array.isArray(suggestion) ? suggestion : [suggestion]).filter((s) => s.status === 'ok');
  const next: DiagramDocument = structuredClone(doc);
  for (const sug of list) {
    const sizes = new Map(sug.cables.map((c) => [c.id, c.conductor]));
    next.cables = next.cables.map((c) => (sizes.has(c.id) ? { ...c, props: { ...c.props, conductor: sizes.get(c.id)! } } : c));
    if (sug.fuse.part) {
      next.parts = next.parts.map((p) => {
        if (p.id !== sug.fuse.part || p.type !== 'fuse') return p;
        const props: FuseProps = p.props.fuseClass === sug.fuse.fuseClass ? { ...p.props, rating_A: sug.fuse.rating_A } : fuseDefaults(sug.fuse.fuseClass, sug.fuse.rating_A);
        delete (props as Partial<FuseProps>).cold_r_ohm;
        return { ...p, props };
      });
      continue;
    }
    const battery = next.parts.find((p) => p.id === sug.source);
    if (!battery) continue;
    const onPost = (e: { part: string; terminal: string }) => e.part === sug.source && e.terminal === 'pos';
    const template = next.cables.find((c) => onPost(c.from) || onPost(c.to));
    const fuseId = uniqueId(next, `fuse-${sug.source}`);
    const linkId = uniqueId(next, `c-${sug.source}-fuse`);
    const label = battery.label || battery.id;
    next.parts.push({
      id: fuseId, type: 'fuse', label: `Fuse ${label}`.trim(),
      position: { x: battery.position.x + FUSE_OFFSET.x, y: battery.position.y + FUSE_OFFSET.y }, rotation: 0,
      props: fuseDefaults(sug.fuse.fuseClass, sug.fuse.rating_A),
    });
    // Everything on the post moves to the fuse's bank side.
    next.cables = next.cables.map((c) => ({
      ...c,
      from: onPost(c.from) ? { part: fuseId, terminal: FUSE_BANK_SIDE } : c.from,
      to: onPost(c.to) ? { part: fuseId, terminal: FUSE_BANK_SIDE } : c.to,
    }));
    const base = template?.props ?? cableRunDefaults();
    next.cables.push({
      id: linkId, from: { part: sug.source, terminal: 'pos' }, to: { part: fuseId, terminal: FUSE_BATTERY_SIDE },
      props: { ...base, conductor: sug.linkConductor, length_m: POST_LINK_LENGTH_M, role: 'cable', lugFrom_ohm: undefined, lugTo_ohm: undefined },
      label: `${label} post to fuse`,
    });
  }
  return diagramSchema.parse(JSON.parse(JSON.stringify(next)));
}
