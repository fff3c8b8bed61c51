// Which server feature owns each table: by default the schema file it is declared in
// (server/db/schema/<feature>.ts), with the exceptions below where a file holds another
// feature's table. Read once per lint run from the schema sources themselves.
import { readdirSync, readFileSync } from 'node:fs';
import { basename, join } from 'node:path';

export const SCHEMA_DIR = join(import.meta.dirname, '..', '..', 'server', 'db', 'schema');

/** Tables whose owner is not the feature their schema file is named after. */
export const OWNER_OVERRIDES = {
  users: 'auth',
  technicians: 'auth',
  auditEvents: 'audit',
  agreementTerms: 'agreements',
  renewalNotices: 'renewals',
  stripeEvents: 'webhooks',
  calendarFeedTokens: 'schedule',
  bookingSettings: 'settings',
  contacts: 'customers',
  customerNotes: 'customers',
  files: 'uploads',
  visitEvents: 'visits',
};

/**
 * Features that also write a table they do not own, and why that is the design rather than a
 * shortcut. Booking creates visits and sets their time; server/visits/ owns their status.
 */
export const SHARED_WRITERS = {
  visits: ['booking'],
};

/** Server folders that are not features: the schema itself, the demo seed and the CLI, the fakes. */
export const NOT_FEATURES = new Set(['db', 'cli', 'fakes']);

let cached;

/** Map of table export name → owning feature. */
export function tableOwners() {
  if (cached) return cached;
  cached = new Map();
  for (const name of readdirSync(SCHEMA_DIR)) {
    if (!name.endsWith('.ts')) continue;
    const feature = basename(name, '.ts');
    const source = readFileSync(join(SCHEMA_DIR, name), 'utf8');
    for (const m of source.matchAll(/export const (\w+)\s*=\s*pgTable\s*\(/g)) {
      cached.set(m[1], OWNER_OVERRIDES[m[1]] ?? feature);
    }
  }
  return cached;
}
