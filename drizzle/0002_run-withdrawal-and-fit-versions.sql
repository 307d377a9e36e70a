DROP INDEX "fits_run_idx";--> statement-breakpoint
ALTER TABLE "fits" ADD COLUMN "version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "fits" ADD COLUMN "cause" text DEFAULT 'upload' NOT NULL;--> statement-breakpoint
ALTER TABLE "fits" ADD COLUMN "note" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "fits" ADD COLUMN "superseded_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "state" text DEFAULT 'active' NOT NULL;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "revision" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "withdrawn_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "withdrawn_by" text;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "withdrawn_reason" text;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_withdrawn_by_users_id_fk" FOREIGN KEY ("withdrawn_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "fits_run_version_idx" ON "fits" USING btree ("run_id","version");--> statement-breakpoint
CREATE UNIQUE INDEX "fits_run_current_idx" ON "fits" USING btree ("run_id") WHERE "fits"."superseded_at" is null;