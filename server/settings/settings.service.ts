import type { CompanySettings } from '../../shared/schemas/settings';
import { recordAudit } from '../audit/audit.service';
import { companyRow, updateCompanyRow, type CompanyRow } from '../company/company';
import type { AppDeps } from '../deps';

/** The owner's view of the company row: every column but the key and the change time. */
function settingsOf(row: CompanyRow): CompanySettings {
  const { id: _id, updatedAt: _updatedAt, ...settings } = row;
  return settings;
}

export async function getCompanySettings(deps: Pick<AppDeps, 'database'>): Promise<CompanySettings> {
  const { db } = deps.database;
  return settingsOf(await companyRow(db));
}

export async function updateCompanySettings(deps: Pick<AppDeps, 'database' | 'clock'>, actorId: string, next: CompanySettings): Promise<CompanySettings> {
  const { db } = deps.database;
  const now = deps.clock();
  return db.transaction(async (tx) => {
    const row = settingsOf(await updateCompanyRow(tx, next, now));
    await recordAudit(tx, { actorUserId: actorId, action: 'settings_changed', subject: 'company', details: { name: next.name, taxRateBps: next.taxRateBps }, at: now });
    return row;
  });
}
