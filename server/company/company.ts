import { eq } from 'drizzle-orm';
import { dateTimeFormat } from '../../shared/date-formats';
import { keptBy } from '../../shared/kept';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { company } from '../db/schema';
import { AppError } from '../http/errors';
import { oncePerRequest, rememberForRequest } from '../runtime/request-memo';

/**
 * The company: one settings row per installation, its time zone and what "today" is there. Every
 * feature reads them from here; the settings feature changes the row through updateCompanyRow.
 */
export type CompanyRow = typeof company.$inferSelect;
export type CompanyUpdate = Partial<Omit<CompanyRow, 'id' | 'updatedAt'>>;

export const notSetUp = () => new AppError(503, 'not_set_up', 'The company settings have not been set up yet.');

// One read of the company row per request, so services can ask for it wherever they need it.
const readRow = (db: Db | Tx): Promise<CompanyRow | undefined> =>
  oncePerRequest('company', () =>
    db
      .select()
      .from(company)
      .where(eq(company.id, 1))
      .limit(1)
      .then(([row]) => row),
  );

/** The company row; an installation without one answers 503 until it is set up. */
export async function companyRow(db: Db | Tx): Promise<CompanyRow> {
  const row = await readRow(db);
  if (!row) throw notSetUp();
  return row;
}

/** The company's IANA time zone, or null while the installation has no company row yet. */
export async function companyTimeZone(db: Db | Tx): Promise<string | null> {
  return (await readRow(db))?.timeZone ?? null;
}

export async function updateCompanyRow(tx: Db | Tx, next: CompanyUpdate, at: Date): Promise<CompanyRow> {
  const [row] = await tx
    .update(company)
    .set({ ...next, updatedAt: at })
    .where(eq(company.id, 1))
    .returning();
  if (!row) throw notSetUp();
  rememberForRequest('company', row);
  localeKept = null;
  return row;
}

/**
 * The company's addresses are US addresses (two-letter state, ZIP code), so its phone numbers are
 * written for the US: the country the screens format numbers for (ISO 3166-1 alpha-2).
 */
export const COMPANY_COUNTRY = 'US';

export interface CompanyLocale {
  timeZone: string;
  country: string;
}

// How every screen writes dates and numbers, kept per process: the session answer carries it on
// every page load, and it changes only when the owner edits the company (cleared here at once;
// another process sees the change within a minute).
const LOCALE_TTL_MS = 60_000;
let localeKept: { locale: CompanyLocale | null; until: number } | null = null;

export async function companyLocale(db: Db | Tx, now = Date.now()): Promise<CompanyLocale | null> {
  if (localeKept && localeKept.until > now) return localeKept.locale;
  const timeZone = await companyTimeZone(db);
  const locale = timeZone ? { timeZone, country: COMPANY_COUNTRY } : null;
  localeKept = { locale, until: now + LOCALE_TTL_MS };
  return locale;
}

/** The calendar date at `at` in a time zone, as an ISO date (agreement terms and ages are local dates). */
export function localDate(at: Date, timeZone: string): string {
  // Every zone's offset has been whole minutes since 1972, so from then the date is the same for
  // every instant of a minute.
  if (at.getTime() < WHOLE_MINUTE_OFFSETS) return formatLocalDate(at, timeZone);
  return localDateKept(`${timeZone}|${Math.floor(at.getTime() / 60_000)}`, () => formatLocalDate(at, timeZone));
}

const localDateKept = keptBy<string>(10_000);
const WHOLE_MINUTE_OFFSETS = Date.UTC(1973, 0, 1);

function formatLocalDate(at: Date, timeZone: string): string {
  // One cached Intl formatter rather than a luxon zone lookup: lists of visits ask this per row.
  let y = '';
  let m = '';
  let d = '';
  for (const p of dateTimeFormat('en-US', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at)) {
    if (p.type === 'year') y = p.value;
    else if (p.type === 'month') m = p.value;
    else if (p.type === 'day') d = p.value;
  }
  return `${y.padStart(4, '0')}-${m}-${d}`;
}

/** Today where the company works, from the app's clock; pass `tx` to read inside a transaction. */
export async function companyToday(deps: Pick<AppDeps, 'database' | 'clock'>, tx: Db | Tx = deps.database.db): Promise<string> {
  const { timeZone } = await companyRow(tx);
  return localDate(deps.clock(), timeZone);
}
