CREATE INDEX "parts_part_number_trgm_idx" ON "parts" USING gin ("part_number" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "parts_maker_trgm_idx" ON "parts" USING gin ("maker" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "parts_tags_trgm_idx" ON "parts" USING gin (parts_tags_text("tags") gin_trgm_ops);