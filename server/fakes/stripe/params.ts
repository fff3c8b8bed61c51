import { invalidParam, missingParam, unknownParam } from './errors';

// Form-encoded bodies arrive as nested strings (`metadata[k]=v`,
// `line_items[0][price_data][unit_amount]=500`); these helpers coerce them.

export type Params = Record<string, unknown>;

export function asParams(value: unknown): Params {
  return value && typeof value === 'object' && !Array.isArray(value) ? (value as Params) : {};
}

/** Refuses parameters the endpoint does not take, as the real API does. */
export function checkKnown(p: Params, allowed: readonly string[], prefix = ''): void {
  for (const key of Object.keys(p)) {
    if (key === 'expand' && prefix === '') continue;
    if (!allowed.includes(key)) throw unknownParam(prefix ? `${prefix}[${key}]` : key);
  }
}

export function str(p: Params, key: string, param = key): string | undefined {
  const v = p[key];
  if (v === undefined || v === '') return undefined;
  if (typeof v !== 'string') throw invalidParam(param, `Invalid string: ${param} must be a string.`);
  return v;
}

export function reqStr(p: Params, key: string, param = key): string {
  const v = str(p, key, param);
  if (v === undefined) throw missingParam(param);
  return v;
}

export function int(p: Params, key: string, param = key): number | undefined {
  const v = p[key];
  if (v === undefined || v === '') return undefined;
  if (typeof v === 'number' && Number.isSafeInteger(v)) return v;
  if (typeof v !== 'string' || !/^-?\d+$/.test(v) || !Number.isSafeInteger(Number(v))) {
    throw invalidParam(param, `Invalid integer: ${typeof v === 'string' ? v : JSON.stringify(v)}`, 'parameter_invalid_integer');
  }
  return Number(v);
}

export function bool(p: Params, key: string, param = key): boolean | undefined {
  const v = p[key];
  if (v === undefined || v === '') return undefined;
  if (v === true || v === 'true') return true;
  if (v === false || v === 'false') return false;
  throw invalidParam(param, `Invalid boolean: ${String(v)}`);
}

export function oneOf<T extends string>(p: Params, key: string, values: readonly T[], param = key): T | undefined {
  const v = str(p, key, param);
  if (v === undefined) return undefined;
  if (!(values as readonly string[]).includes(v)) {
    throw invalidParam(param, `Invalid ${param}: must be one of ${values.join(', ')}`);
  }
  return v as T;
}

export function obj(p: Params, key: string, param = key): Params | undefined {
  const v = p[key];
  if (v === undefined || v === '') return undefined;
  if (!v || typeof v !== 'object') throw invalidParam(param, `Invalid object: ${param} must be a hash.`);
  return v as Params;
}

/** Items of an indexed array param (`items[0][...]`), which may arrive as an array or an object keyed by index. */
export function list(p: Params, key: string): unknown[] | undefined {
  const v = p[key];
  if (v === undefined || v === '') return undefined;
  if (Array.isArray(v)) return v;
  if (v && typeof v === 'object') {
    return Object.keys(v)
      .sort((a, b) => Number(a) - Number(b))
      .map((k) => (v as Params)[k]);
  }
  throw invalidParam(key, `Invalid array: ${key}`);
}

/**
 * Metadata update: keys merge into what is there; a key set to '' is removed,
 * and `metadata=''` clears everything, as the real API does.
 */
export function mergeMetadata(existing: Record<string, string>, value: unknown, param = 'metadata'): Record<string, string> {
  if (value === undefined) return existing;
  if (value === '') return {};
  if (!value || typeof value !== 'object' || Array.isArray(value)) {
    throw invalidParam(param, `Invalid object: ${param} must be a hash of strings.`);
  }
  const out = { ...existing };
  for (const [k, v] of Object.entries(value as Params)) {
    if (typeof v !== 'string') throw invalidParam(`${param}[${k}]`, `Invalid string: ${param}[${k}] must be a string.`);
    if (k.length > 40) throw invalidParam(`${param}[${k}]`, 'Metadata keys can be at most 40 characters.');
    if (v.length > 500) throw invalidParam(`${param}[${k}]`, 'Metadata values can be at most 500 characters.');
    if (v === '') delete out[k];
    else out[k] = v;
  }
  if (Object.keys(out).length > 50) throw invalidParam(param, 'Metadata can have at most 50 keys.');
  return out;
}

export function expandList(p: Params): string[] {
  const v = p['expand'];
  if (v === undefined || v === '') return [];
  const items = Array.isArray(v) ? v : typeof v === 'object' ? Object.values(v as Params) : [v];
  return items.filter((x): x is string => typeof x === 'string');
}
