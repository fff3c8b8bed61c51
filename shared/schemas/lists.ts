import * as z from 'zod';

// The pieces every paged, sorted list query shares, so each list states its messages once.

/** A blank form field reads as "not given". */
export const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

/** `page` (from 0) and `pageSize` (1–100, 25 by default), spread into a list's query schema. */
export const pageFields = {
  page: z.coerce.number({ error: 'Page is a number.' }).int('Page is a whole number.').min(0, 'Page starts at 0.').default(0),
  pageSize: z.coerce
    .number({ error: 'Page size is a number.' })
    .int('Page size is a whole number.')
    .min(1, 'Show at least 1 a page.')
    .max(100, 'Show at most 100 a page.')
    .default(25),
};

/** `sort` over the named columns and `dir`, spread into a list's query schema. */
export function sortFields<const S extends readonly [string, ...string[]]>(sorts: S, byDefault: S[number], dir: 'asc' | 'desc' = 'asc') {
  return {
    sort: z.enum(sorts, { error: `Sort by ${sorts.join(', ')}.` }).default(byDefault),
    dir: z.enum(['asc', 'desc'], { error: 'Direction is asc or desc.' }).default(dir),
  };
}
