/**
 * Invalid request parts made from a route's zod schemas, for the route fuzz test. Each case
 * breaks at least one field for sure (a value of the wrong type or outside the schema's bounds)
 * and fills the others with hostile values: wrong types, huge strings, unicode edge cases, NUL,
 * lone surrogates, impossible dates, another household's id; bodies also carry extra fields a
 * caller must never be able to set (role, customerId, __proto__).
 */
import fc from 'fast-check';
import * as z from 'zod';

interface Prop {
  type?: string | string[];
  format?: string;
  enum?: unknown[];
  maxLength?: number;
  maximum?: number;
  items?: Prop;
  properties?: Record<string, Prop>;
  anyOf?: Prop[];
  allOf?: Prop[];
}

/** The fields an object schema names (intersections and unions merged). */
export function fieldsOf(schema: z.ZodType): Record<string, Prop> {
  const root = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Prop;
  const out: Record<string, Prop> = {};
  const walk = (p: Prop) => {
    Object.assign(out, p.properties ?? {});
    for (const q of [...(p.allOf ?? []), ...(p.anyOf ?? [])]) walk(q);
  };
  walk(root);
  return out;
}

const typeOf = (p: Prop): string => {
  if (p.enum) return 'enum';
  const t = Array.isArray(p.type) ? p.type.find((x) => x !== 'null') : p.type;
  if (t) return t;
  const inner = p.anyOf?.find((q) => q.type !== 'null');
  return inner ? typeOf(inner) : 'any';
};

/** One value that the field's schema refuses, whatever else is sent. */
function surelyBad(p: Prop, asText: boolean): fc.Arbitrary<unknown> {
  const t = typeOf(p);
  const text: string[] = ['\u0000', 'x\uD800y'];
  if (t === 'enum') text.push('not-one-of-the-choices');
  if (p.format === 'uuid') text.push('not-a-uuid', '00000000-0000-4000-8000-00000000000g');
  if (p.maxLength !== undefined) text.push('x'.repeat(p.maxLength + 1));
  if (t === 'integer' || t === 'number') text.push('abc', '1e999', ...(p.maximum !== undefined && p.maximum < 1e15 ? [String(p.maximum * 10 + 1)] : []));
  if (t === 'boolean') text.push('maybe');
  if (p.format === 'date' || p.format === 'date-time') text.push('2031-02-30', '9999-99-99');
  if (asText) return fc.constantFrom(...text);
  const typed: unknown[] = t === 'string' || t === 'enum' ? [12345, true, [], {}] : t === 'array' ? ['not-a-list', 7] : t === 'object' ? [42, 'text'] : ['text', [], {}];
  return fc.constantFrom(...typed, ...text.filter((s) => s !== 'abc' || t !== 'string'));
}

export const OTHER_HOUSEHOLD = { id: '' };

const loneSurrogate = fc.integer({ min: 0xd800, max: 0xdfff }).map((c) => `a${String.fromCharCode(c)}b`);
const hostileText = fc.oneof(
  fc.constantFrom(
    '',
    ' ',
    '\u0000',
    'a\u0000b',
    '\u202Eevil',
    '\uFEFF',
    'e\u0301\u0301\u0301',
    '𝒳😀👩‍👩‍👧',
    "' or 1=1 --",
    '<script>alert(1)</script>',
    '../../etc/passwd',
    '2031-02-30',
    '9999-12-31T23:59:59Z',
    '-000001-01-01',
    '1e999',
    '0x10',
    'NaN',
    '-0',
  ),
  fc.constant(null).map(() => 'x'.repeat(100_000)),
  fc.constant(null).map(() => OTHER_HOUSEHOLD.id),
  loneSurrogate,
  fc.string({ unit: fc.integer({ min: 0, max: 0xffff }).map((c) => String.fromCharCode(c)), maxLength: 40 }),
);
const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  hostileText,
  fc.constantFrom(0, -1, 2 ** 53, -(2 ** 31) - 1, 1e308, 0.1, true, false, null, [], {}, [null], { $gt: '' }),
  fc.double({ noNaN: true }),
  fc.array(hostileText, { maxLength: 3 }),
);

/** Fields no request may set for itself. */
const EXTRAS = (): fc.Arbitrary<Record<string, unknown>> =>
  fc.subarray(['role', 'customerId', 'userId', 'isAdmin', 'status', 'paidAt', 'priceCents', '__proto__'], { maxLength: 4 }).map((keys) => {
    const o: Record<string, unknown> = {};
    // An own "__proto__" key, as JSON.parse makes one, not the prototype.
    for (const k of keys)
      Object.defineProperty(o, k, {
        enumerable: true,
        configurable: true,
        writable: true,
        value: k === 'role' ? 'owner' : k === 'customerId' ? OTHER_HOUSEHOLD.id : k === '__proto__' ? { admin: true } : k === 'isAdmin' ? true : 'done',
      });
    return o;
  });

/**
 * An object for a schema: one field surely broken, others hostile or left out. `asText` makes
 * every value a string (query strings and path parameters carry only text).
 */
export function invalidObject(schema: z.ZodType, asText: boolean, extras = !asText): fc.Arbitrary<Record<string, unknown>> {
  const fields = fieldsOf(schema);
  const names = Object.keys(fields);
  // Node refuses a request line past 16 KB itself (431, before the app), so text stays shorter.
  const other = (v: unknown) => (asText ? (typeof v === 'string' ? v : (JSON.stringify(v) ?? '')).slice(0, 2000) : v);
  if (!names.length) return fc.record({ junk: hostileValue.map(other) });
  return fc
    .tuple(
      fc.constantFrom(...names).chain((target) => surelyBad(fields[target]!, asText).map((bad) => [target, bad] as const)),
      fc.record(Object.fromEntries(names.map((n) => [n, hostileValue.map(other)])), { requiredKeys: [] }),
      extras ? EXTRAS() : fc.constant({}),
    )
    .map(([[target, bad], rest, more]) => ({ ...more, ...rest, [target]: bad }));
}

/** A path segment that is no id: not a uuid, a NUL, a broken %-escape, a huge one. */
export const badSegment = fc.constantFrom('not-an-id', '%00', '%ED%A0%80', '%E0%A4%A', 'x'.repeat(5000), '..%2F..%2Fetc', '%F0%9F%98%80', '0', '-1', 'null');
