import { boolean, jsonb, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { createdAt, id } from './columns';
import { users } from './users';

/** Weekly working hours per ISO weekday, local clock "HH:MM"; missing = off. */
export type WeeklyHours = Partial<Record<'1' | '2' | '3' | '4' | '5' | '6' | '7', { start: string; end: string }>>;

export const technicians = pgTable(
  'technicians',
  {
    id: id(),
    userId: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    skills: text().array().notNull().default([]),
    weeklyHours: jsonb().$type<WeeklyHours>().notNull(),
    truck: text().notNull().default(''),
    active: boolean().notNull().default(true),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('technicians_user_key').on(t.userId)],
);
