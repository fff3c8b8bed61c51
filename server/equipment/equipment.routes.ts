import { Router } from 'express';
import * as z from 'zod';
import { equipmentInputSchema, equipmentUpdateSchema } from '../../shared/schemas/equipment';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { createEquipment, getEquipment, listPropertyEquipment, setEquipmentArchived, updateEquipment } from './equipment.service';

const staff = requireRole('technician', 'office', 'owner');
const office = requireRole('office', 'owner');
export const propertyRef = z.object({ propertyId: z.uuid({ error: 'Choose the property this equipment is at.' }) });

/**
 * Equipment at a property. Technicians record what they find on site (for households they
 * visit); archiving is for the office.
 */
export function equipmentRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });

  r.get('/', staff, async (req, res) => {
    const propertyId = typeof req.query.propertyId === 'string' ? req.query.propertyId : '';
    const id = parse(propertyRef, { propertyId }).propertyId;
    res.json(await listPropertyEquipment(deps, currentUser(req), id, req.query.archived === 'true'));
  });

  r.post('/', staff, async (req, res) => {
    const { propertyId } = parse(propertyRef, { propertyId: req.body?.propertyId });
    res.status(201).json(await createEquipment(deps, currentUser(req), propertyId, parse(equipmentInputSchema, req.body)));
  });

  r.get('/:id', staff, async (req, res) => {
    res.json(await getEquipment(deps, currentUser(req), String(req.params.id)));
  });

  r.patch('/:id', staff, async (req, res) => {
    res.json(await updateEquipment(deps, currentUser(req), String(req.params.id), parse(equipmentUpdateSchema, req.body)));
  });

  r.post('/:id/archive', office, async (req, res) => {
    res.json(await setEquipmentArchived(deps, currentUser(req), String(req.params.id), true));
  });

  r.post('/:id/restore', office, async (req, res) => {
    res.json(await setEquipmentArchived(deps, currentUser(req), String(req.params.id), false));
  });

  return r;
}
