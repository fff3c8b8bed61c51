import { AppError } from './errors';

/**
 * Opaque keyset cursors: the sort key of a page's last row, so the next page starts after it with
 * an index range rather than an OFFSET. Base64url of a JSON array of strings.
 */
export const encodeCursor = (key: string[]): string => Buffer.from(JSON.stringify(key)).toString('base64url');

export function decodeCursor(raw: string | undefined, length: number): string[] | null {
  if (raw === undefined) return null;
  try {
    const key: unknown = JSON.parse(Buffer.from(raw, 'base64url').toString('utf8'));
    if (Array.isArray(key) && key.length === length && key.every((k) => typeof k === 'string' && k.length <= 300)) return key as string[];
  } catch {
    // fall through
  }
  throw new AppError(422, 'invalid_input', 'The page cursor is not valid; start from the first page.', { after: 'Not a cursor from this list.' });
}

/** Takes `limit` rows of `limit + 1` read, and the cursor after the last one kept. */
export function keysetPage<R, T>(rows: R[], limit: number, key: (r: R) => string[], map: (r: R) => T): { items: T[]; next: string | null } {
  const kept = rows.slice(0, limit);
  return { items: kept.map(map), next: rows.length > limit ? encodeCursor(key(kept.at(-1)!)) : null };
}
