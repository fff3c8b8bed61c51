import { Router } from 'express';
import {
  contactInputSchema,
  customerCreateSchema,
  customerListQuerySchema,
  customerUpdateSchema,
  mergeSchema,
  noteInputSchema,
  propertyInputSchema,
  propertyUpdateSchema,
} from '../../shared/schemas/customers';
import type { AppDeps } from '../deps';
import { assertCustomerAccess, currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { exportCustomersCsv } from './csv-export';
import { addContact, addNote, createCustomer, getCustomer, removeContact, setCustomerArchived, updateContact, updateCustomer } from './customer-page';
import { addProperty, propertyRow, setPropertyArchived, updateProperty } from './properties';
import { listCustomers } from './search';
import { mergeCustomers } from './merge';
import { toProperty } from './customer-views';

const office = requireRole('office', 'owner');
const staff = requireRole('technician', 'office', 'owner');

/** Households: list and search, records, archive and merge. */
export function customerRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  const { db } = deps.database;

  r.get('/', office, async (req, res) => {
    res.json(await listCustomers(deps, parse(customerListQuerySchema, req.query)));
  });

  r.get('/export.csv', office, async (req, res) => {
    const q = parse(customerListQuerySchema, req.query);
    const csv = await exportCustomersCsv(deps, q);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="households-${deps.clock().toISOString().slice(0, 10)}.csv"`);
    res.send(csv);
  });

  r.post('/', office, async (req, res) => {
    res.status(201).json(await createCustomer(deps, parse(customerCreateSchema, req.body)));
  });

  r.get('/:id', staff, async (req, res) => {
    await assertCustomerAccess(db, currentUser(req), String(req.params.id));
    res.json(await getCustomer(deps, String(req.params.id), { includeArchived: req.query.archived === 'true' }));
  });

  r.patch('/:id', office, async (req, res) => {
    await updateCustomer(deps, String(req.params.id), parse(customerUpdateSchema, req.body));
    res.json(await getCustomer(deps, String(req.params.id)));
  });

  r.post('/:id/archive', office, async (req, res) => {
    await setCustomerArchived(deps, String(req.params.id), true);
    res.json({ id: String(req.params.id), archived: true });
  });

  r.post('/:id/restore', office, async (req, res) => {
    await setCustomerArchived(deps, String(req.params.id), false);
    res.json({ id: String(req.params.id), archived: false });
  });

  r.post('/:id/merge', office, async (req, res) => {
    const { sourceId } = parse(mergeSchema, req.body);
    res.json(await mergeCustomers(deps, String(req.params.id), sourceId, currentUser(req)));
  });

  r.post('/:id/contacts', office, async (req, res) => {
    res.status(201).json(await addContact(deps, String(req.params.id), parse(contactInputSchema, req.body)));
  });

  r.put('/:id/contacts/:contactId', office, async (req, res) => {
    res.json(await updateContact(deps, String(req.params.id), String(req.params.contactId), parse(contactInputSchema, req.body)));
  });

  r.delete('/:id/contacts/:contactId', office, async (req, res) => {
    await removeContact(deps, String(req.params.id), String(req.params.contactId));
    res.status(204).end();
  });

  r.post('/:id/notes', staff, async (req, res) => {
    const user = currentUser(req);
    await assertCustomerAccess(db, user, String(req.params.id));
    res.status(201).json(await addNote(deps, String(req.params.id), user, parse(noteInputSchema, req.body)));
  });

  r.post('/:id/properties', office, async (req, res) => {
    res.status(201).json(await addProperty(deps, String(req.params.id), parse(propertyInputSchema, req.body)));
  });

  return r;
}

/** Properties: edit and archive. Equipment under a property lives in the equipment router. */
export function propertyRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  const { db } = deps.database;

  r.get('/:id', staff, async (req, res) => {
    const p = await propertyRow(db, String(req.params.id));
    await assertCustomerAccess(db, currentUser(req), p.customerId);
    res.json(toProperty(p));
  });

  r.patch('/:id', office, async (req, res) => {
    res.json(await updateProperty(deps, String(req.params.id), parse(propertyUpdateSchema, req.body)));
  });

  r.post('/:id/archive', office, async (req, res) => {
    res.json(await setPropertyArchived(deps, String(req.params.id), true));
  });

  r.post('/:id/restore', office, async (req, res) => {
    res.json(await setPropertyArchived(deps, String(req.params.id), false));
  });

  return r;
}
