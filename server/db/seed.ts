/**
 * Demo data, seeded on the first start of an empty database (no users) unless DEMO=0.
 * An invented scenario: Kestrel Bay Energy Works, a small off-grid and marine DC installer.
 */
import { count } from 'drizzle-orm';
import type { Role } from '../../shared/roles';
import { hashPassword } from '../auth/passwords';
import type { Db } from './client';
import { demoDiagramContents } from './demo-diagrams';
import { activity, diagrams, memberships, projects, teams, users } from './schema';
import { newId } from '../ids';

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

  // Hash outside the transaction: argon2 is slow on purpose.
  const accounts = await Promise.all(
    DEMO_ACCOUNTS.map(async (a) => ({ ...a, id: newId(), passwordHash: await hashPassword(password) })),
  );
  const designer = accounts.find((a) => a.role === 'designer')!;
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
    await tx.insert(diagrams).values(
      demoDiagramContents().map((d, i) => ({
        id: newId(),
        projectId: station,
        name: d.name,
        description: d.description,
        content: d.content,
        createdBy: designer.id,
        createdAt: at(31 + i),
        updatedAt: at(31 + i),
      })),
    );
    await tx.insert(activity).values(
      demoProjects.map((p) => ({ id: newId(), projectId: p.id, userId: designer.id, action: 'project.created', detail: { name: p.name }, createdAt: at(p.minute) })),
    );
  });
  return true;
}
