-- Extensions the schema relies on: gist for the visit overlap constraint, trigram search.
CREATE EXTENSION IF NOT EXISTS btree_gist;
--> statement-breakpoint
CREATE EXTENSION IF NOT EXISTS pg_trgm;
