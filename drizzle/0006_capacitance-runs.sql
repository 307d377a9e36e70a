CREATE TABLE "part_capacitance" (
	"part_id" integer PRIMARY KEY NOT NULL,
	"source" text NOT NULL,
	"typical" jsonb NOT NULL,
	"spread" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"samples" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "fits" ADD COLUMN "stray_capacitance_f" double precision;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "measurement" text DEFAULT 'iv' NOT NULL;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "frequency_hz" double precision;--> statement-breakpoint
ALTER TABLE "runs" ADD COLUMN "test_level_v" double precision;--> statement-breakpoint
ALTER TABLE "part_capacitance" ADD CONSTRAINT "part_capacitance_part_id_parts_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."parts"("id") ON DELETE cascade ON UPDATE no action;