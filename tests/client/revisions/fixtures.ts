/**
 * Fixtures for the revision, compare and review screens: two versions of the post-to-post template and
 * mocked API answers shaped like the server's.
 */
import { postToPostTemplate, type DiagramDocument } from '@shared/diagram';
import { designer, meWith } from '../helpers';

export const DIAGRAM_ID = 'd-ptp';

/** Four batteries post to post, both main cables off battery 1, plus a note part. */
export function versionA(): DiagramDocument {
  const doc = postToPostTemplate({ count: 4, takeOff: 'same-end', name: 'Pump house bank' });
  return {
    ...doc,
    parts: [...doc.parts, { id: 'note-old', type: 'note', label: 'Old note', position: { x: 0, y: 300 }, rotation: 0, props: { text: 'check torque' } } as DiagramDocument['parts'][number]],
  };
}

/**
 * B, edited by hand from A: the negative take-off moved to battery 4 (diagonal), battery 2 moved 40
 * units right, battery 3's capacity doubled, the old note removed and a new note added.
 */
export function versionB(a: DiagramDocument = versionA()): DiagramDocument {
  return {
    ...a,
    parts: [
      ...a.parts
        .filter((p) => p.id !== 'note-old')
        .map((p) => {
          if (p.id === 'bat2') return { ...p, position: { x: p.position.x + 40, y: p.position.y } };
          if (p.id === 'bat3' && p.type === 'battery') return { ...p, props: { ...p.props, capacity_Ah: p.props.capacity_Ah * 2 } };
          return p;
        }),
      { id: 'note-new', type: 'note', label: 'Take-off note', position: { x: 400, y: 300 }, rotation: 0, props: { text: 'diagonal take-off' } } as DiagramDocument['parts'][number],
    ],
    cables: a.cables.map((c) => (c.id === 'c-main-neg' ? { ...c, from: { part: 'bat4', terminal: 'neg' } } : c)),
  };
}

export const people = {
  designer: { id: 'u-dana', name: 'Dana Whitlock' },
  reviewer: { id: 'u-rui', name: 'Rui Takahashi' },
  owner: { id: 'u-olga', name: 'Olga Brandt' },
};

export function meAs(role: 'designer' | 'reviewer' | 'owner' | 'viewer') {
  const user = role === 'reviewer' ? { ...designer.user, id: people.reviewer.id, name: people.reviewer.name } : designer.user;
  return meWith([{ id: 't-north', name: 'North Shore Off-Grid', role }], user);
}

export function diagramAnswer(role: string, content: DiagramDocument = versionA()) {
  return {
    body: {
      role,
      diagram: {
        id: DIAGRAM_ID, projectId: 'p-cabin', teamId: 't-north', projectName: 'Lakeside cabin', name: 'Pump house bank', description: '',
        content, workingCopyVersion: 7, updatedAt: '2026-11-20T09:00:00Z', updatedBy: people.designer,
      },
    },
  };
}

export function meta(n: number, state: 'draft' | 'in_review' | 'changes_requested' | 'approved', message: string) {
  return {
    number: n, author: people.designer, createdAt: `2026-11-${10 + n}T10:00:00Z`, message, contentHash: `${n}`.repeat(64),
    state, restoredFrom: null, approvedBy: state === 'approved' ? people.reviewer : null, approvedAt: state === 'approved' ? '2026-11-15T12:00:00Z' : null,
    results: { status: 'solved', findingCounts: { error: 0, warning: n, info: 0 } },
  };
}

/** A stored summary with invented figures, for checking what the table shows. */
export function summary(shares: number[], currents: number[], extra: { imbalance_pct: number; drop_pct: number; losses_W: number; findings?: { rule: string; parts: string[]; message: string }[] }) {
  return {
    summaryVersion: 1,
    status: 'solved',
    batteries: shares.map((s, i) => ({ id: `bat${i + 1}`, label: `Battery ${i + 1}`, current_A: currents[i], share: s })),
    imbalance_pct: extra.imbalance_pct,
    loadVoltage_V: 12.1,
    drop_pct: extra.drop_pct,
    losses_W: extra.losses_W,
    findings: (extra.findings ?? []).map((f, i) => ({ id: `${f.rule}-${i + 1}`, severity: 'warning', ...f })),
    findingCounts: { error: 0, warning: extra.findings?.length ?? 0, info: 0 },
    issues: [],
  };
}

export function revisionAnswer(n: number, state: Parameters<typeof meta>[1], content: DiagramDocument, resultsSummary: unknown, review = { reviewers: [] as unknown[], decisions: [] as unknown[] }) {
  return { body: { revision: { ...meta(n, state, `rev ${n}`), content, resultsSummary, review } } };
}
