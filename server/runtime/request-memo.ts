import { AsyncLocalStorage } from 'node:async_hooks';
import type { RequestHandler } from 'express';

/**
 * Reads that one request would otherwise repeat (the company row, booking settings), kept for the
 * request's lifetime only: a change made elsewhere is seen by the next request.
 */
const memo = new AsyncLocalStorage<Map<string, Promise<unknown>>>();

/** Express middleware: everything the request runs after it shares one memo. */
export const memoPerRequest: RequestHandler = (_req, _res, next) => memo.run(new Map(), next);

/** `load()` once per request under `key`; outside a request it simply loads. A failed load is not kept. */
export function oncePerRequest<T>(key: string, load: () => Promise<T>): Promise<T> {
  const store = memo.getStore();
  if (!store) return load();
  let p = store.get(key) as Promise<T> | undefined;
  if (!p) {
    p = load().catch((err: unknown) => {
      store.delete(key);
      throw err;
    });
    store.set(key, p);
  }
  return p;
}

/** Whether the request has already loaded (or is loading) `key`. */
export function loadedForRequest(key: string): boolean {
  return memo.getStore()?.has(key) ?? false;
}

/** Replaces what the request has memoised under `key` (after the request itself changed it). */
export function rememberForRequest<T>(key: string, value: T): void {
  memo.getStore()?.set(key, Promise.resolve(value));
}
