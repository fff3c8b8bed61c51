import { Router } from 'express';
import { filterChangedSchema, reminderPreferencesSchema } from '../../shared/schemas/campaigns';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { markFilterChanged, myReminders, savePreferences } from './my-reminders.service';

/** The homeowner's reminders: only ever their own household, taken from the session. */
export function myReminderRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  r.use(requireRole('homeowner'));

  r.get('/', async (req, res) => {
    res.json(await myReminders(deps, currentUser(req)));
  });

  r.post('/filter-changed', async (req, res) => {
    const { equipmentId } = parse(filterChangedSchema, req.body);
    res.json(await markFilterChanged(deps, currentUser(req), equipmentId));
  });

  r.put('/preferences', async (req, res) => {
    res.json(await savePreferences(deps, currentUser(req), parse(reminderPreferencesSchema, req.body)));
  });

  return r;
}
