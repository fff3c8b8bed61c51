import { sql } from 'drizzle-orm';
import { check, index, integer, jsonb, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { createdAt, id, tstz } from './columns';
import { users } from './users';

export const LINK_PURPOSES = ['sign_in', 'set_password'] as const;
export type LinkPurpose = (typeof LINK_PURPOSES)[number];

// E-mailed one-time links. Only the sha-256 of the token's jti is kept, so a database read
// does not hand out working links.
export const signInLinks = pgTable(
  'sign_in_links',
  {
    id: id(),
    jtiHash: text().notNull(),
    email: text().notNull(),
    userId: uuid().references(() => users.id, { onDelete: 'cascade' }),
    purpose: text({ enum: LINK_PURPOSES }).notNull(),
    expiresAt: tstz().notNull(),
    usedAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('sign_in_links_jti_key').on(t.jtiHash),
    index('sign_in_links_email_idx').on(t.email),
    check('sign_in_links_purpose', sql`${t.purpose} in ('sign_in', 'set_password')`),
  ],
);

// Who did what to whose account, kept for the owner.
export const auditEvents = pgTable(
  'audit_events',
  {
    id: id(),
    at: tstz().notNull().defaultNow(),
    actorUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
    action: text().notNull(),
    subject: text().notNull().default(''),
    ip: text(),
    details: jsonb().$type<Record<string, unknown>>().notNull().default({}),
  },
  (t) => [index('audit_events_at_idx').on(t.at.desc()), index('audit_events_action_idx').on(t.action)],
);

// Failed password attempts per account and per address, for slow-down and lock-out.
export const authThrottle = pgTable('auth_throttle', {
  key: text().primaryKey(),
  failures: integer().notNull().default(0),
  lastFailureAt: tstz(),
  lockedUntil: tstz(),
});

// Fixed-window counters behind express-rate-limit, shared by every API process.
export const rateLimitHits = pgTable('rate_limit_hits', {
  key: text().primaryKey(),
  hits: integer().notNull().default(0),
  resetAt: tstz().notNull(),
});
