import { Router } from 'express';
import * as z from 'zod';
import { reportNameSchema, reportQuerySchema } from '../../shared/schemas/reports';
import type { AppDeps } from '../deps';
import { requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { assertDatesWithin } from '../http/ranges';
import { reportCsv, runReport } from './reports.service';

const reportNameSchemaObject = z.object({ report: reportNameSchema });
// Reports look back over the years the business has data for, and no further ahead than a year.
const REPORT_RANGE = { before: { years: 10 }, after: { years: 1 }, describe: 'Choose dates from the last ten years up to a year ahead.' };

/** The owner's and office's reports: a chart's numbers as JSON, or the same as CSV. */
export function reportRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireRole('office', 'owner'));
  const read = (req: { params: Record<string, unknown>; query: unknown }) => {
    const { report } = parse(reportNameSchemaObject, { report: req.params.report });
    const q = parse(reportQuerySchema, req.query);
    assertDatesWithin(deps.clock(), REPORT_RANGE, { from: q.from, to: q.to }, { from: 'From', to: 'To' });
    return { report, q };
  };
  router.get('/:report', async (req, res) => {
    const { report, q } = read(req);
    res.json(await runReport(deps, report, q));
  });
  router.get('/:report/export.csv', async (req, res) => {
    const { report, q } = read(req);
    const body = await reportCsv(deps, report, q);
    res.type('text/csv').setHeader('Content-Disposition', `attachment; filename="${report}-${q.from}-to-${q.to}.csv"`);
    res.send(body);
  });
  return router;
}
