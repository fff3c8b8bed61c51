// The availability engine's time beside the SQL that loads its visits, both medians of the same
// number of runs on the same data. The one place a benchmark reaches into the booking internals:
// if the engine's input loader moves, only these imports change.
import { DateTime } from 'luxon';
import { performance } from 'node:perf_hooks';
import { loadCompanySettings, loadSchedulingData } from '../../../server/booking/scheduling-input';
import type { Database } from '../../../server/db/client';
import { availableWindows, type AvailabilityInput } from '../../../shared/scheduling';

export interface EngineResult {
  technicians: number;
  booked: number;
  windows: number;
  rows: number;
  engineMs: number;
  sqlMs: number;
  /** engine ÷ SQL */
  ratio: number;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

/** One service-call availability request over `days` local days from `now`, `runs` times each. */
export async function engineVersusSql(database: Database, now: DateTime, days: number, runs: number): Promise<EngineResult> {
  const { pool } = database;
  const from = now.toISODate()!;
  const to = now.plus({ days: days - 1 }).toISODate()!;
  const range = { from: now.startOf('day').minus({ days: 1 }).toJSDate(), to: now.plus({ days }).endOf('day').toJSDate() };
  const company = await loadCompanySettings(database.db);
  const data = await loadSchedulingData(database.db, range);
  const input: AvailabilityInput = {
    settings: company.settings,
    technicians: data.technicians,
    booked: data.booked,
    request: { visitKind: 'service_call', member: false, urgent: false, from, to, now: now.toUTC().toISO()! },
  };
  const sql = `select technician_id, starts_at, ends_at, priority from visits
               where technician_id is not null and status in ('requested','scheduled','on_the_way','on_site')
                 and starts_at < $2 and ends_at > $1`;
  const loaded = await pool.query(sql, [range.from, range.to]);
  // Warmed until the JIT has settled on the engine's hot loops; a cold engine reads as twice as slow.
  for (let i = 0; i < 15; i++) {
    availableWindows(input);
    await pool.query(sql, [range.from, range.to]);
  }
  const engine: number[] = [];
  const query: number[] = [];
  let windows = 0;
  for (let i = 0; i < runs; i++) {
    let t = performance.now();
    windows = availableWindows(input).length;
    engine.push(performance.now() - t);
    t = performance.now();
    await pool.query(sql, [range.from, range.to]);
    query.push(performance.now() - t);
  }
  const engineMs = median(engine);
  const sqlMs = median(query);
  return { technicians: data.technicians.length, booked: data.booked.length, windows, rows: loaded.rowCount ?? 0, engineMs, sqlMs, ratio: engineMs / sqlMs };
}
