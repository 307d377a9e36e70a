-- Catalogue search matches any part of a part number, maker or tag (ILIKE '%…%'): trigram
-- indexes let PostgreSQL find those parts without reading every row. pg_trgm ships with
-- PostgreSQL and is a trusted extension (any role that may create in the database may add it).
CREATE EXTENSION IF NOT EXISTS pg_trgm;
--> statement-breakpoint
-- An index needs an immutable expression, and array_to_string is only stable (for element
-- types whose text form could change); for text[] it is fixed, so this wrapper may say so.
CREATE OR REPLACE FUNCTION parts_tags_text(tags text[]) RETURNS text
	LANGUAGE sql IMMUTABLE PARALLEL SAFE STRICT
	AS $$ SELECT array_to_string(tags, chr(31)) $$;
