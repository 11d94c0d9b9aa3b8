/**
 * Database schema (Drizzle ORM, PostgreSQL). Migrations in drizzle/ are generated from this file with
 * `npm run db:generate` and applied on start. Keep to SQL that PostgreSQL 15 and PGlite (PG 18) both run.
 *
 * Ids are random text (see newId in ./ids.ts), so an id from a URL never needs a format check: an unknown
 * id simply matches no row.
 */
import { sql } from 'drizzle-orm';
import { check, integer, index, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';
import type { Role } from '../../shared/roles';

const createdAt = () => timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow();
const updatedAt = () => timestamp('updated_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow();

export const users = pgTable(
  'users',
  {
    id: text('id').primaryKey(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    passwordHash: text('password_hash').notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_unique').on(t.email)],
);

/** Lucia's session table (id, user_id, expires_at) plus our own attributes. */
export const sessions = pgTable(
  'sessions',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
    createdAt: createdAt(),
    userAgent: text('user_agent').notNull().default(''),
  },
  (t) => [index('sessions_user_idx').on(t.userId)],
);

const ROLE_CHECK = sql`in ('owner', 'designer', 'reviewer', 'trainer', 'viewer')`;

export const teams = pgTable(
  'teams',
  {
    id: text('id').primaryKey(),
    name: text('name').notNull(),
    unitSystem: text('unit_system', { enum: ['metric', 'us'] }).notNull().default('metric'),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [check('teams_unit_system_check', sql`${t.unitSystem} in ('metric', 'us')`)],
);

export const memberships = pgTable(
  'memberships',
  {
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: text('role').$type<Role>().notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.teamId, t.userId] }),
    index('memberships_user_idx').on(t.userId),
    check('memberships_role_check', sql`${t.role} ${ROLE_CHECK}`),
  ],
);

export const invites = pgTable(
  'invites',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    /** SHA-256 (hex) of the token sent by e-mail; the token itself is never stored. */
    tokenHash: text('token_hash').notNull(),
    email: text('email').notNull(),
    role: text('role').$type<Role>().notNull(),
    invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true, mode: 'date' }),
  },
  (t) => [
    uniqueIndex('invites_token_hash_unique').on(t.tokenHash),
    index('invites_team_idx').on(t.teamId),
    check('invites_role_check', sql`${t.role} ${ROLE_CHECK}`),
  ],
);

export const projects = pgTable(
  'projects',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    site: text('site').notNull().default(''),
    description: text('description').notNull().default(''),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index('projects_team_idx').on(t.teamId)],
);

export const diagrams = pgTable(
  'diagrams',
  {
    id: text('id').primaryKey(),
    projectId: text('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    description: text('description').notNull().default(''),
    /** Working copy of the diagram document (shared/diagram). */
    content: jsonb('content').notNull().default(sql`'{}'::jsonb`),
    /** Optimistic concurrency of the working copy: +1 on every save (PUT …/working-copy). */
    workingCopyVersion: integer('working_copy_version').notNull().default(1),
    /** Who last changed the working copy or the diagram's name and description. */
    updatedBy: text('updated_by').references(() => users.id, { onDelete: 'set null' }),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index('diagrams_project_idx').on(t.projectId)],
);

/** Every message the app sends; in outbox mode (no SMTP_URL) this is the only place it goes. */
export const mailOutbox = pgTable(
  'mail_outbox',
  {
    id: text('id').primaryKey(),
    to: text('to').notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html').notNull(),
    teamId: text('team_id').references(() => teams.id, { onDelete: 'cascade' }),
    createdAt: createdAt(),
  },
  (t) => [index('mail_outbox_team_idx').on(t.teamId)],
);

export const activity = pgTable(
  'activity',
  {
    id: text('id').primaryKey(),
    projectId: text('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
    action: text('action').notNull(),
    detail: jsonb('detail').notNull().default(sql`'{}'::jsonb`),
    createdAt: createdAt(),
  },
  (t) => [index('activity_project_idx').on(t.projectId)],
);
