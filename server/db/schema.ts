/**
 * Database schema (Drizzle ORM, PostgreSQL). Migrations in drizzle/ are generated from this file with
 * `npm run db:generate` and applied on start. Keep to SQL that PostgreSQL 15 and PGlite (PG 18) both run.
 *
 * Ids are random text (see newId in ./ids.ts), so an id from a URL never needs a format check: an unknown
 * id simply matches no row.
 */
import { sql } from 'drizzle-orm';
import { type AnyPgColumn, check, integer, index, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex } from 'drizzle-orm/pg-core';
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
    /** The user's own unit system for their screens; null follows each team's setting. */
    unitSystem: text('unit_system', { enum: ['metric', 'us'] }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_unique').on(t.email), check('users_unit_system_check', sql`${t.unitSystem} is null or ${t.unitSystem} in ('metric', 'us')`)],
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
    /** Parts in the working copy, kept by the database (the diagram list shows it without reading every document). */
    partCount: integer('part_count')
      .notNull()
      .generatedAlwaysAs(sql`coalesce(jsonb_array_length(case when jsonb_typeof(content -> 'parts') = 'array' then content -> 'parts' end), 0)`),
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
    /**
     * The account that held the `to` address when the message was captured (null: no account had it).
     * A user reads only the messages captured for them; an invite to an address nobody has yet stays with
     * the team's owners.
     */
    recipientId: text('recipient_id').references(() => users.id, { onDelete: 'cascade' }),
    createdAt: createdAt(),
  },
  (t) => [index('mail_outbox_team_idx').on(t.teamId), index('mail_outbox_recipient_idx').on(t.recipientId)],
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

const REVISION_STATE_CHECK = sql`in ('draft', 'in_review', 'changes_requested', 'approved')`;

/**
 * Immutable snapshots of a diagram. Numbered 1, 2, … per diagram. The content and its hash never change
 * after insert (a trigger in the migrations refuses it); only the review state moves, and an approved
 * revision is frozen entirely. docs/decisions/005-revisions.md.
 */
export const diagramRevisions = pgTable(
  'diagram_revisions',
  {
    id: text('id').primaryKey(),
    diagramId: text('diagram_id')
      .notNull()
      .references(() => diagrams.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
    message: text('message').notNull().default(''),
    content: jsonb('content').notNull(),
    /** SHA-256 (hex) of the content's canonical JSON (keys sorted). */
    contentHash: text('content_hash').notNull(),
    /** Results computed on the server when the revision was saved (server/services/results-summary.ts). */
    resultsSummary: jsonb('results_summary').notNull(),
    /** The revision whose content this one restored, if any. */
    restoredFrom: integer('restored_from'),
    state: text('state', { enum: ['draft', 'in_review', 'changes_requested', 'approved'] }).notNull().default('draft'),
    approvedBy: text('approved_by').references(() => users.id, { onDelete: 'set null' }),
    approvedAt: timestamp('approved_at', { withTimezone: true, mode: 'date' }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('diagram_revisions_number_unique').on(t.diagramId, t.number),
    check('diagram_revisions_number_check', sql`${t.number} >= 1`),
    check('diagram_revisions_state_check', sql`${t.state} ${REVISION_STATE_CHECK}`),
  ],
);

/** Reviewers asked to review a revision. */
export const reviewRequests = pgTable(
  'review_requests',
  {
    revisionId: text('revision_id')
      .notNull()
      .references(() => diagramRevisions.id, { onDelete: 'cascade' }),
    reviewerId: text('reviewer_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    requestedBy: text('requested_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.revisionId, t.reviewerId] }), index('review_requests_reviewer_idx').on(t.reviewerId)],
);

/** Approve / request changes, in order; the latest one sets the revision's state. */
export const reviewDecisions = pgTable(
  'review_decisions',
  {
    id: text('id').primaryKey(),
    revisionId: text('revision_id')
      .notNull()
      .references(() => diagramRevisions.id, { onDelete: 'cascade' }),
    reviewerId: text('reviewer_id').references(() => users.id, { onDelete: 'set null' }),
    decision: text('decision', { enum: ['approve', 'request_changes'] }).notNull(),
    note: text('note').notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [index('review_decisions_revision_idx').on(t.revisionId), check('review_decisions_decision_check', sql`${t.decision} in ('approve', 'request_changes')`)],
);

/** Review comments on a revision: on the diagram, or pinned to a part (or cable) id; threaded by parent. */
export const reviewComments = pgTable(
  'review_comments',
  {
    id: text('id').primaryKey(),
    revisionId: text('revision_id')
      .notNull()
      .references(() => diagramRevisions.id, { onDelete: 'cascade' }),
    authorId: text('author_id').references(() => users.id, { onDelete: 'set null' }),
    /** The thread's first comment; null for a thread's first comment itself. */
    parentId: text('parent_id').references((): AnyPgColumn => reviewComments.id, { onDelete: 'cascade' }),
    partId: text('part_id'),
    body: text('body').notNull(),
    resolvedAt: timestamp('resolved_at', { withTimezone: true, mode: 'date' }),
    resolvedBy: text('resolved_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('review_comments_revision_idx').on(t.revisionId)],
);

/**
 * Files attached to a project: data sheets (PDF) and site photos (JPEG, PNG, WebP). The bytes live in
 * the storage adapter (server/storage) under `key`, a random name that never comes from user input;
 * `file_name` is the sanitized name shown and offered on download. docs/decisions/008-uploads-storage.md.
 */
export const uploads = pgTable(
  'uploads',
  {
    id: text('id').primaryKey(),
    projectId: text('project_id')
      .notNull()
      .references(() => projects.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    fileName: text('file_name').notNull(),
    /** Sniffed from the bytes on upload (never the client's claim). */
    contentType: text('content_type').notNull(),
    size: integer('size').notNull(),
    /** Pixel dimensions of an image, from its header; null for PDFs. */
    width: integer('width'),
    height: integer('height'),
    uploadedBy: text('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('uploads_project_idx').on(t.projectId),
    uniqueIndex('uploads_key_unique').on(t.key),
    check('uploads_size_check', sql`${t.size} >= 0`),
    check('uploads_content_type_check', sql`${t.contentType} in ('application/pdf', 'image/jpeg', 'image/png', 'image/webp')`),
  ],
);

/**
 * The team parts library (shared/library): presets of batteries, cables, fuses and busbars. `props` is
 * validated with libraryItemSchema on every write.
 */
export const libraryItems = pgTable(
  'library_items',
  {
    id: text('id').primaryKey(),
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['battery', 'cable', 'fuse', 'busbar'] }).notNull(),
    name: text('name').notNull(),
    manufacturer: text('manufacturer').notNull().default(''),
    partNumber: text('part_number').notNull().default(''),
    props: jsonb('props').notNull(),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    updatedBy: text('updated_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index('library_items_team_idx').on(t.teamId, t.kind), check('library_items_kind_check', sql`${t.kind} in ('battery', 'cable', 'fuse', 'busbar')`)],
);

export const NOTIFICATION_KINDS = ['review_requested', 'changes_requested', 'approved', 'comment', 'reply'] as const;

/**
 * In-app notices of the review flow, one row per recipient: the same events the e-mails go out for, so a
 * team without a mail server still reaches everyone. `readAt` null means unread.
 */
export const notifications = pgTable(
  'notifications',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    teamId: text('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: NOTIFICATION_KINDS }).notNull(),
    actorId: text('actor_id').references(() => users.id, { onDelete: 'set null' }),
    diagramId: text('diagram_id')
      .notNull()
      .references(() => diagrams.id, { onDelete: 'cascade' }),
    revisionNumber: integer('revision_number').notNull(),
    /** Comment id for comment and reply notices. */
    commentId: text('comment_id').references(() => reviewComments.id, { onDelete: 'cascade' }),
    /** A short excerpt of the comment or decision note. */
    excerpt: text('excerpt').notNull().default(''),
    readAt: timestamp('read_at', { withTimezone: true, mode: 'date' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('notifications_user_idx').on(t.userId, t.createdAt),
    check('notifications_kind_check', sql`${t.kind} in ('review_requested', 'changes_requested', 'approved', 'comment', 'reply')`),
  ],
);
