ALTER TABLE "diagrams" ADD COLUMN "working_copy_version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "diagrams" ADD COLUMN "updated_by" text;--> statement-breakpoint
ALTER TABLE "diagrams" ADD CONSTRAINT "diagrams_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;