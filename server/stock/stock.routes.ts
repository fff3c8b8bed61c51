import { Router } from 'express';
import * as z from 'zod';
import { replacementSearchSchema, restockSchema, stockListQuerySchema, stockLocationInputSchema, stockRowInputSchema, transferSchema } from '../../shared/schemas/pricebook';
import { partsUsedSchema, stockMovementQuerySchema } from '../../shared/schemas/quotes';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { notFound, parse } from '../http/errors';
import { createLocation, listLevels, listLocations, listMovements, recordPartsUsed, restock, setLevel, transfer } from './stock.service';
import { searchReplacements } from './replacements';
import { partsToLoad } from './parts-to-load';

const idOf = (raw: unknown, what: string): string => {
  const r = z.uuid().safeParse(raw);
  if (!r.success) throw notFound(what);
  return r.data;
};

/** Truck and shop stock: a technician sees their own truck, the office and owner all of it. */
export function stockRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  const staff = requireRole('owner', 'office', 'technician');
  const office = requireRole('owner', 'office');

  r.get('/locations', staff, async (req, res) => {
    res.json(await listLocations(deps, currentUser(req)));
  });
  r.post('/locations', office, async (req, res) => {
    res.status(201).json(await createLocation(deps, parse(stockLocationInputSchema, req.body)));
  });
  r.get('/levels', staff, async (req, res) => {
    res.json(await listLevels(deps, currentUser(req), parse(stockListQuerySchema, req.query)));
  });
  r.put('/levels/:locationId', office, async (req, res) => {
    const id = idOf(req.params.locationId, 'That stock location');
    res.json(await setLevel(deps, id, parse(stockRowInputSchema, req.body), currentUser(req)));
  });
  r.post('/restocks', office, async (req, res) => {
    res.status(201).json(await restock(deps, currentUser(req), parse(restockSchema, req.body)));
  });
  r.post('/transfers', office, async (req, res) => {
    res.status(201).json(await transfer(deps, currentUser(req), parse(transferSchema, req.body)));
  });
  r.get('/movements', staff, async (req, res) => {
    res.json(await listMovements(deps, currentUser(req), parse(stockMovementQuerySchema, req.query)));
  });
  r.post('/visits/:visitId/parts-used', staff, async (req, res) => {
    const id = idOf(req.params.visitId, 'That visit');
    res.status(201).json(await recordPartsUsed(deps, currentUser(req), id, parse(partsUsedSchema, req.body)));
  });
  r.get('/parts-to-load', requireRole('technician'), async (req, res) => {
    res.json(await partsToLoad(deps, currentUser(req)));
  });
  r.post('/replacements', staff, async (req, res) => {
    res.json(await searchReplacements(deps, currentUser(req), parse(replacementSearchSchema, req.body)));
  });
  return r;
}
