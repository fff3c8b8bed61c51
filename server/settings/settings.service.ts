import { seasonSettingsSchema, type CompanySettings, type CompanySettingsInput } from '../../shared/schemas/settings';
import { recordAudit } from '../audit/audit.service';
import { companyRow, updateCompanyRow, type CompanyRow } from '../company/company';
import type { AppDeps } from '../deps';
import { validationError } from '../http/errors';

/** The owner's view of the company row: every column but the key and the change time. */
function settingsOf(row: CompanyRow): CompanySettings {
  const { id: _id, updatedAt: _updatedAt, ...settings } = row;
  return settings;
}

export async function getCompanySettings(deps: Pick<AppDeps, 'database'>): Promise<CompanySettings> {
  const { db } = deps.database;
  return settingsOf(await companyRow(db));
}

export async function updateCompanySettings(deps: Pick<AppDeps, 'database' | 'clock'>, actorId: string, next: CompanySettingsInput): Promise<CompanySettings> {
  const { db } = deps.database;
  const now = deps.clock();
  return db.transaction(async (tx) => {
    const current = await companyRow(tx);
    // A season month left out stays as it is; the pair is checked together (they must differ).
    const seasons = seasonSettingsSchema.safeParse({
      coolingStartMonth: next.coolingStartMonth ?? current.coolingStartMonth,
      heatingStartMonth: next.heatingStartMonth ?? current.heatingStartMonth,
    });
    if (!seasons.success) throw validationError(seasons.error);
    const row = settingsOf(await updateCompanyRow(tx, { ...next, ...seasons.data }, now));
    await recordAudit(tx, {
      actorUserId: actorId,
      action: 'settings_changed',
      subject: 'company',
      details: { name: next.name, taxRateBps: next.taxRateBps, ...seasons.data },
      at: now,
    });
    return row;
  });
}
