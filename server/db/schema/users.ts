import { sql } from 'drizzle-orm';
import { check, index, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { ROLES } from '../../../shared/roles';
import { createdAt, id, inList, tstz } from './columns';
import { customers } from './customers';

export const users = pgTable(
  'users',
  {
    id: id(),
    email: text().notNull(),
    name: text().notNull(),
    role: text({ enum: ROLES }).notNull(),
    passwordHash: text(),
    // A homeowner belongs to one household.
    customerId: uuid().references(() => customers.id, { onDelete: 'restrict' }),
    disabledAt: tstz(),
    lastSignInAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('users_email_key').on(t.email),
    index('users_customer_idx').on(t.customerId),
    check('users_email_lower', sql`${t.email} = lower(${t.email})`),
    check('users_role', sql.raw(`role in (${inList(ROLES)})`)),
    check('users_homeowner_household', sql`${t.role} <> 'homeowner' or ${t.customerId} is not null`),
  ],
);
