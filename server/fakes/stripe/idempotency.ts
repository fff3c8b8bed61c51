// Stripe keeps an idempotent result for at least 24 hours: the same key with
// the same request replays it; with a different request it is refused.

export const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;

export interface StoredResponse {
  fingerprint: string;
  method: string;
  path: string;
  status: number;
  body: unknown;
  storedAt: number;
}

/** A stable text for a request, independent of parameter order. */
export function fingerprint(method: string, path: string, params: unknown): string {
  const canon = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(canon);
    if (v && typeof v === 'object') {
      return Object.fromEntries(
        Object.keys(v as object)
          .sort()
          .map((k) => [k, canon((v as Record<string, unknown>)[k])]),
      );
    }
    return v;
  };
  return JSON.stringify([method, path, canon(params)]);
}

export class IdempotencyStore {
  private readonly entries = new Map<string, StoredResponse>();

  constructor(
    private readonly clock: () => number,
    private readonly ttlMs = IDEMPOTENCY_TTL_MS,
  ) {}

  private id(apiKey: string, key: string): string {
    return `${apiKey}\u0000${key}`;
  }

  get(apiKey: string, key: string): StoredResponse | undefined {
    const id = this.id(apiKey, key);
    const e = this.entries.get(id);
    if (e && this.clock() - e.storedAt >= this.ttlMs) {
      this.entries.delete(id);
      return undefined;
    }
    return e;
  }

  put(apiKey: string, key: string, entry: Omit<StoredResponse, 'storedAt'>): void {
    this.entries.set(this.id(apiKey, key), { ...entry, storedAt: this.clock() });
  }

  clear(): void {
    this.entries.clear();
  }
}
