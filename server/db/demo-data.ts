/**
 * Demo data, seeded on the first start of an empty database (no users) unless DEMO=0.
 * An invented scenario: Kestrel Bay Energy Works, a small off-grid and marine DC installer.
 */
import { count } from 'drizzle-orm';
import type { Role } from '../../shared/roles';
import { hashPassword } from '../auth/passwords';
import type { Db, Tx } from './client';
import { demoDiagramContents, demoHouseBankContent, demoRevisionContents } from './demo-diagrams';
import { demoLibraryItems } from './demo-library';
import { activity, diagramRevisions, diagrams, libraryItems, memberships, NOTIFICATION_KINDS, notifications, projects, reviewComments, reviewDecisions, reviewRequests, teams, users } from './schema';
import { excerptOf } from '../services/notifications';
import { newId } from '../ids';
import { contentHash } from '../services/content-hash';
import { computeResultsSummary } from '../services/summaries';

export const DEMO_TEAM_NAME = 'Kestrel Bay Energy Works';

export const DEMO_ACCOUNTS: { email: string; name: string; role: Role }[] = [
  { email: 'owner@demo.test', name: 'Maren Okafor', role: 'owner' },
  { email: 'designer@demo.test', name: 'Tomasz Ilunga', role: 'designer' },
  { email: 'reviewer@demo.test', name: 'Priya Halvorsen', role: 'reviewer' },
  { email: 'trainer@demo.test', name: 'Sione Valdés', role: 'trainer' },
  { email: 'viewer@demo.test', name: 'Ada Kettering', role: 'viewer' },
];

export function demoEmail(role: Role): string {
  return `${role}@demo.test`;
}

/** Seeds the demo scenario when the database has no users. Returns whether it seeded. */
export async function seedDemo(db: Db, password: string): Promise<boolean> {
  const [{ n }] = await db.select({ n: count() }).from(users);
  if (n > 0) return false;

  // Hash and analyse outside the transaction: argon2 is slow on purpose, the analysis runs in a worker.
  const revisionDocs = demoRevisionContents();
  const [accounts, summaries] = await Promise.all([
    Promise.all(DEMO_ACCOUNTS.map(async (a) => ({ ...a, id: newId(), passwordHash: await hashPassword(password) }))),
    Promise.all(revisionDocs.map((r) => computeResultsSummary(r.content))),
  ]);
  const designer = accounts.find((a) => a.role === 'designer')!;
  const reviewer = accounts.find((a) => a.role === 'reviewer')!;
  const teamId = newId();
  // Explicit, distinct timestamps so lists have a stable, meaningful order.
  const t0 = Date.now() - 60 * 60 * 1000;
  const at = (minutes: number) => new Date(t0 + minutes * 60_000);

  await db.transaction(async (tx) => {
    await tx.insert(users).values(accounts.map(({ id, email, name, passwordHash }, i) => ({ id, email, name, passwordHash, createdAt: at(i) })));
    await tx.insert(teams).values({ id: teamId, name: DEMO_TEAM_NAME, unitSystem: 'metric', createdAt: at(0), updatedAt: at(0) });
    await tx.insert(memberships).values(accounts.map((a, i) => ({ teamId, userId: a.id, role: a.role, createdAt: at(i) })));

    const station = newId();
    const demoProjects = [
      {
        id: newId(),
        name: 'MV Storm Petrel house bank',
        site: 'MV Storm Petrel, survey launch, engine-room battery box',
        description: 'Replacing the 12 V house bank: two AGM batteries in parallel feeding the DC panel and a 2 kW inverter.',
        minute: 10,
      },
      {
        id: newId(),
        name: 'Ridgeback repeater site 7',
        site: 'Ridgeback repeater site 7, equipment shelter',
        description: '48 V telecom DC plant for the radio repeater; battery reserve sized for a 72-hour outage.',
        minute: 20,
      },
      {
        id: station,
        name: 'Gannet Island ranger station',
        site: 'Gannet Island ranger station, battery room',
        description: 'Off-grid solar and battery system for the ranger station. Three bank layouts compared before the refit.',
        minute: 30,
      },
    ];
    await tx.insert(projects).values(
      demoProjects.map((p) => ({
        id: p.id,
        teamId,
        name: p.name,
        site: p.site,
        description: p.description,
        createdBy: designer.id,
        createdAt: at(p.minute),
        updatedAt: at(p.minute + 5),
      })),
    );
    const diagramRows = demoDiagramContents().map((d, i) => ({
      id: newId(),
      projectId: station,
      name: d.name,
      description: d.description,
      // The post-to-post bank's working copy is its latest revision (below).
      content: i === 0 ? revisionDocs[revisionDocs.length - 1].content : d.content,
      createdBy: designer.id,
      updatedBy: designer.id,
      createdAt: at(31 + i),
      updatedAt: at(i === 0 ? 50 : 31 + i),
    }));
    await tx.insert(diagrams).values(diagramRows);
    const houseBank = demoHouseBankContent();
    await tx.insert(diagrams).values({
      id: newId(),
      projectId: demoProjects[0].id,
      name: houseBank.name,
      description: houseBank.description,
      content: houseBank.content,
      createdBy: designer.id,
      updatedBy: designer.id,
      createdAt: at(12),
      updatedAt: at(14),
    });
    await seedDemoReview(tx, { diagram: diagramRows[0], projectId: station, teamId, designer: designer.id, reviewer: reviewer.id, revisionDocs, summaries, at });
    await tx.insert(activity).values(
      demoProjects.map((p) => ({ id: newId(), projectId: p.id, userId: designer.id, action: 'project.created', detail: { name: p.name }, createdAt: at(p.minute) })),
    );
    await tx.insert(libraryItems).values(
      demoLibraryItems().map((item, i) => ({
        id: newId(),
        teamId,
        kind: item.kind,
        name: item.name,
        manufacturer: item.manufacturer ?? '',
        partNumber: item.partNumber ?? '',
        props: item.props,
        createdBy: designer.id,
        updatedBy: designer.id,
        createdAt: at(5 + i),
        updatedAt: at(5 + i),
      })),
    );
  });
  return true;
}

/**
 * The post-to-post bank's history: r1 the first layout (draft), r2 the diagonal take-off reviewed and
 * approved by the reviewer, r3 longer jumpers sent for review, with a comment pinned to battery 4, the
 * designer's threaded reply and a general comment. History, compare (r1→r2, r2→r3) and review all have
 * real content on first start.
 */
async function seedDemoReview(
  tx: Tx,
  s: {
    diagram: { id: string; name: string };
    projectId: string;
    teamId: string;
    designer: string;
    reviewer: string;
    revisionDocs: ReturnType<typeof demoRevisionContents>;
    summaries: Awaited<ReturnType<typeof computeResultsSummary>>[];
    at: (minutes: number) => Date;
  },
) {
  const { diagram, projectId, designer, reviewer, at } = s;
  const states = ['draft', 'approved', 'in_review'] as const;
  const revIds = s.revisionDocs.map(() => newId());
  await tx.insert(diagramRevisions).values(
    s.revisionDocs.map((r, i) => ({
      id: revIds[i],
      diagramId: diagram.id,
      number: i + 1,
      authorId: designer,
      message: r.message,
      content: r.content,
      contentHash: contentHash(r.content),
      resultsSummary: s.summaries[i],
      state: states[i],
      ...(states[i] === 'approved' ? { approvedBy: reviewer, approvedAt: at(44) } : {}),
      createdAt: at(36 + i * 5),
    })),
  );
  await tx.insert(reviewRequests).values([
    { revisionId: revIds[1], reviewerId: reviewer, requestedBy: designer, createdAt: at(42) },
    { revisionId: revIds[2], reviewerId: reviewer, requestedBy: designer, createdAt: at(47) },
  ]);
  await tx.insert(reviewDecisions).values({
    id: newId(),
    revisionId: revIds[1],
    reviewerId: reviewer,
    decision: 'approve',
    note: 'Diagonal take-off evens out the battery currents. Approved as a design check; confirm torque values on site.',
    createdAt: at(44),
  });
  const pinned = newId();
  const comments = [
    {
      id: pinned,
      authorId: reviewer,
      parentId: null,
      partId: 'bat4',
      body: 'Battery 4 now carries the main negative. There is still no fuse at any battery: a short in one battery is fed by the other three.',
      createdAt: at(48),
    },
    {
      id: newId(),
      authorId: designer,
      parentId: pinned,
      partId: 'bat4',
      body: 'Agreed. I will add a Class T fuse at each battery positive in the next revision and recheck the jumper ampacity.',
      createdAt: at(49),
    },
    {
      id: newId(),
      authorId: reviewer,
      parentId: null,
      partId: null,
      body: 'Longer jumpers add resistance between the batteries; compare the battery shares against revision 2 before we sign this off.',
      createdAt: at(50),
    },
  ];
  await tx.insert(reviewComments).values(comments.map((c) => ({ ...c, revisionId: revIds[2] })));
  // The in-app notices these events stored (server/services/notifications.ts); acting on a revision read one's own
  // notices about it, so only the reviewer's last comment waits unread for the designer.
  const notice = (minute: number, userId: string, actorId: string, kind: (typeof NOTIFICATION_KINDS)[number], revisionNumber: number, extra: { commentId?: string; excerpt?: string; readAt?: Date } = {}) => ({
    id: newId(),
    userId,
    teamId: s.teamId,
    kind,
    actorId,
    diagramId: diagram.id,
    revisionNumber,
    commentId: extra.commentId ?? null,
    excerpt: excerptOf(extra.excerpt ?? ''),
    readAt: extra.readAt ?? null,
    createdAt: at(minute),
  });
  await tx.insert(notifications).values([
    notice(42, reviewer, designer, 'review_requested', 2, { readAt: at(43) }),
    notice(44, designer, reviewer, 'approved', 2, { excerpt: 'Diagonal take-off evens out the battery currents. Approved as a design check; confirm torque values on site.', readAt: at(45) }),
    notice(47, reviewer, designer, 'review_requested', 3, { readAt: at(48) }),
    notice(48, designer, reviewer, 'comment', 3, { commentId: comments[0].id, excerpt: comments[0].body, readAt: at(49) }),
    notice(49, reviewer, designer, 'reply', 3, { commentId: comments[1].id, excerpt: comments[1].body, readAt: at(50) }),
    notice(50, designer, reviewer, 'comment', 3, { commentId: comments[2].id, excerpt: comments[2].body }),
  ]);
  const log = (minute: number, userId: string, action: string, detail: Record<string, unknown>) => ({
    id: newId(),
    projectId,
    userId,
    action,
    detail: { diagramId: diagram.id, name: diagram.name, ...detail },
    createdAt: at(minute),
  });
  await tx.insert(activity).values([
    log(31, designer, 'diagram.created', {}),
    ...s.revisionDocs.map((r, i) => log(36 + i * 5, designer, 'revision.saved', { number: i + 1, message: r.message })),
    log(42, designer, 'review.requested', { number: 2, reviewerIds: [reviewer] }),
    log(44, reviewer, 'review.decided', { number: 2, decision: 'approve' }),
    log(47, designer, 'review.requested', { number: 3, reviewerIds: [reviewer] }),
    ...comments.map((c, i) => log(48 + i, c.authorId, 'review.commented', { number: 3, commentId: c.id, ...(c.partId ? { partId: c.partId } : {}), ...(c.parentId ? { parentId: c.parentId } : {}) })),
  ]);
}
