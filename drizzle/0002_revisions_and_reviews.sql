CREATE TABLE "diagram_revisions" (
	"id" text PRIMARY KEY NOT NULL,
	"diagram_id" text NOT NULL,
	"number" integer NOT NULL,
	"author_id" text,
	"message" text DEFAULT '' NOT NULL,
	"content" jsonb NOT NULL,
	"content_hash" text NOT NULL,
	"results_summary" jsonb NOT NULL,
	"restored_from" integer,
	"state" text DEFAULT 'draft' NOT NULL,
	"approved_by" text,
	"approved_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "diagram_revisions_number_check" CHECK ("diagram_revisions"."number" >= 1),
	CONSTRAINT "diagram_revisions_state_check" CHECK ("diagram_revisions"."state" in ('draft', 'in_review', 'changes_requested', 'approved'))
);
--> statement-breakpoint
CREATE TABLE "review_comments" (
	"id" text PRIMARY KEY NOT NULL,
	"revision_id" text NOT NULL,
	"author_id" text,
	"parent_id" text,
	"part_id" text,
	"body" text NOT NULL,
	"resolved_at" timestamp with time zone,
	"resolved_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "review_decisions" (
	"id" text PRIMARY KEY NOT NULL,
	"revision_id" text NOT NULL,
	"reviewer_id" text,
	"decision" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "review_decisions_decision_check" CHECK ("review_decisions"."decision" in ('approve', 'request_changes'))
);
--> statement-breakpoint
CREATE TABLE "review_requests" (
	"revision_id" text NOT NULL,
	"reviewer_id" text NOT NULL,
	"requested_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "review_requests_revision_id_reviewer_id_pk" PRIMARY KEY("revision_id","reviewer_id")
);
--> statement-breakpoint
ALTER TABLE "diagram_revisions" ADD CONSTRAINT "diagram_revisions_diagram_id_diagrams_id_fk" FOREIGN KEY ("diagram_id") REFERENCES "public"."diagrams"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "diagram_revisions" ADD CONSTRAINT "diagram_revisions_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "diagram_revisions" ADD CONSTRAINT "diagram_revisions_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_revision_id_diagram_revisions_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."diagram_revisions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_parent_id_review_comments_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."review_comments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_comments" ADD CONSTRAINT "review_comments_resolved_by_users_id_fk" FOREIGN KEY ("resolved_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_decisions" ADD CONSTRAINT "review_decisions_revision_id_diagram_revisions_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."diagram_revisions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_decisions" ADD CONSTRAINT "review_decisions_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_requests" ADD CONSTRAINT "review_requests_revision_id_diagram_revisions_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."diagram_revisions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_requests" ADD CONSTRAINT "review_requests_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "review_requests" ADD CONSTRAINT "review_requests_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "diagram_revisions_number_unique" ON "diagram_revisions" USING btree ("diagram_id","number");--> statement-breakpoint
CREATE INDEX "review_comments_revision_idx" ON "review_comments" USING btree ("revision_id");--> statement-breakpoint
CREATE INDEX "review_decisions_revision_idx" ON "review_decisions" USING btree ("revision_id");--> statement-breakpoint
CREATE INDEX "review_requests_reviewer_idx" ON "review_requests" USING btree ("reviewer_id");