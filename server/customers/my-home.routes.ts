import { Router } from 'express';
import { homeContactSchema, homeNoteSchema } from '../../shared/schemas/customers';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { homeSummary } from '../home/home-summary.service';
import { addMyNote, myHome, updateMyAccess, updateMyContact } from './my-home.service';

/** The homeowner's "My home": only ever their own household, taken from the session. */
export function myHomeRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  r.use(requireRole('homeowner'));

  r.get('/', async (req, res) => {
    res.json(await myHome(deps, currentUser(req)));
  });

  // The portal's first screen: plan, tune-ups left this season, next visit, what is owed.
  r.get('/summary', async (req, res) => {
    res.json(await homeSummary(deps, currentUser(req)));
  });

  r.patch('/contact', async (req, res) => {
    const user = currentUser(req);
    await updateMyContact(deps, user, parse(homeContactSchema, req.body));
    res.json((await myHome(deps, user)).household);
  });

  r.patch('/properties/:id', async (req, res) => {
    res.json(await updateMyAccess(deps, currentUser(req), String(req.params.id), req.body));
  });

  r.post('/notes', async (req, res) => {
    res.status(201).json(await addMyNote(deps, currentUser(req), parse(homeNoteSchema, req.body)));
  });

  return r;
}
