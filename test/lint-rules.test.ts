// The project's own lint rules: a feature writes only its own tables; server/ never imports src/.
import { resolve } from 'node:path';
import { RuleTester } from 'eslint';
import tseslint from 'typescript-eslint';
import { describe, it } from 'vitest';
// @ts-expect-error plain ESM module without types
import noClientImport from '../scripts/lint/no-client-import.mjs';
// @ts-expect-error plain ESM module without types
import ownTables from '../scripts/lint/own-tables.mjs';

RuleTester.describe = describe;
RuleTester.it = it;

const ROOT = resolve(__dirname, '..');
const at = (path: string) => resolve(ROOT, path);
const tester = new RuleTester({ languageOptions: { parser: tseslint.parser, ecmaVersion: 2022, sourceType: 'module' } });

describe('seasonwell/own-tables', () => {
  tester.run('own-tables', ownTables, {
    valid: [
      // The owner writes its own table.
      { filename: at('server/customers/merge.ts'), code: "import { customers } from '../db/schema'; await db.update(customers).set({});" },
      // Reading and joining another feature's table is allowed.
      { filename: at('server/dispatch/dispatch.service.ts'), code: "import { customers } from '../db/schema'; await db.select().from(customers);" },
      // The owner of a table is the schema file unless an override names another feature.
      { filename: at('server/visits/visit-status.ts'), code: "import { visitEvents } from '../db/schema'; await tx.insert(visitEvents).values({});" },
      // Booking creates visits by design.
      { filename: at('server/booking/booking.service.ts'), code: "import { visits } from '../db/schema'; await tx.insert(visits).values({});" },
      // The demo seed and the fakes are not features.
      { filename: at('server/db/seed/seed.ts'), code: "import { customers } from '../schema'; await db.insert(customers).values({});" },
      // A name that only looks like a table is not one.
      { filename: at('server/dispatch/dispatch.service.ts'), code: 'const customers = []; map.delete(customers);' },
    ],
    invalid: [
      {
        filename: at('server/imports/csv.service.ts'),
        code: "import { customers, equipment as units } from '../db/schema'; await tx.insert(customers).values({}); await tx.insert(units).values({});",
        errors: [
          { messageId: 'foreign', data: { feature: 'imports', table: 'customers', owner: 'customers' } },
          { messageId: 'foreign', data: { feature: 'imports', table: 'equipment', owner: 'equipment' } },
        ],
      },
      {
        filename: at('server/dispatch/dispatch.service.ts'),
        code: "import * as schema from '../db/schema'; await db.delete(schema.technicianTimeOff).where(x);",
        errors: [{ messageId: 'foreign', data: { feature: 'dispatch', table: 'technicianTimeOff', owner: 'booking' } }],
      },
      {
        filename: at('server/field/field.service.ts'),
        code: "import { visits } from '../db/schema/visits'; await db.update(visits).set({});",
        errors: [{ messageId: 'foreign', data: { feature: 'field', table: 'visits', owner: 'visits' } }],
      },
    ],
  });
});

describe('seasonwell/no-client-import', () => {
  tester.run('no-client-import', noClientImport, {
    valid: [
      { filename: at('server/app.ts'), code: "import { formatUsd } from '../shared/money';" },
      // The client may import shared code; the rule watches server/ only.
      { filename: at('src/app/app.config.ts'), code: "import { x } from './core/x';" },
    ],
    invalid: [
      { filename: at('server/app.ts'), code: "import { appConfig } from '../src/app/app.config';", errors: [{ messageId: 'client' }] },
      { filename: at('server/customers/search.ts'), code: "export * from '../../src/app/ui/badge';", errors: [{ messageId: 'client' }] },
      { filename: at('server/customers/search.ts'), code: "const m = await import('../../src/main');", errors: [{ messageId: 'client' }] },
    ],
  });
});
