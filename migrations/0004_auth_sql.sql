-- Session store table in connect-pg-simple's own layout, created here so parallel processes
-- never race to create it at start-up.
CREATE TABLE IF NOT EXISTS "session" (
  "sid" varchar NOT NULL COLLATE "default",
  "sess" json NOT NULL,
  "expire" timestamp(6) NOT NULL,
  CONSTRAINT "session_pkey" PRIMARY KEY ("sid")
);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "IDX_session_expire" ON "session" ("expire");
--> statement-breakpoint
-- "Sign out everywhere" finds a user's sessions by the id passport stores.
CREATE INDEX IF NOT EXISTS "session_user_idx" ON "session" ((("sess"::jsonb) -> 'passport' ->> 'user'));
