import { sql } from 'drizzle-orm';
import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit, type IncrementResponse, type Options, type Store } from 'express-rate-limit';
import type { z } from 'zod';
import { forgotPasswordSchema, linkRequestSchema, staffSignInSchema } from '../../shared/schemas/auth';
import type { AppDeps } from '../deps';
import { rateLimitHits } from '../db/schema';
import { AppError } from '../http/errors';

/**
 * Fixed-window counters in PostgreSQL, so every API process sees the same count. One upsert
 * per hit; a window that has ended starts again at 1.
 */
export class PostgresRateStore implements Store {
  windowMs = 60_000;
  readonly localKeys = false;
  constructor(
    private readonly deps: AppDeps,
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  async increment(key: string): Promise<IncrementResponse> {
    const now = this.deps.clock();
    const resetAt = new Date(now.getTime() + this.windowMs).toISOString();
    const over = sql`${rateLimitHits.resetAt} <= ${now.toISOString()}::timestamptz`;
    const [row] = await this.deps.database.db
      .insert(rateLimitHits)
      .values({ key: this.prefix + key, hits: 1, resetAt: new Date(resetAt) })
      .onConflictDoUpdate({
        target: rateLimitHits.key,
        set: {
          hits: sql`case when ${over} then 1 else ${rateLimitHits.hits} + 1 end`,
          resetAt: sql`case when ${over} then ${resetAt}::timestamptz else ${rateLimitHits.resetAt} end`,
        },
      })
      .returning({ hits: rateLimitHits.hits, resetAt: rateLimitHits.resetAt });
    return { totalHits: row.hits, resetTime: row.resetAt };
  }

  async decrement(key: string): Promise<void> {
    await this.deps.database.db.execute(sql`update ${rateLimitHits} set hits = greatest(hits - 1, 0) where key = ${this.prefix + key}`);
  }

  async resetKey(key: string): Promise<void> {
    await this.deps.database.db.execute(sql`delete from ${rateLimitHits} where key = ${this.prefix + key}`);
  }
}

const ipOf = (req: Request) => ipKeyGenerator(req.ip ?? 'unknown');

// One parse per request and schema, shared by the skip test and the key.
const parsed = new WeakMap<Request, Map<z.ZodType, { ok: boolean; email: string }>>();
function bodyOf(req: Request, schema: z.ZodType): { ok: boolean; email: string } {
  let perSchema = parsed.get(req);
  if (!perSchema) parsed.set(req, (perSchema = new Map()));
  let hit = perSchema.get(schema);
  if (!hit) {
    const r = schema.safeParse(req.body);
    const email = r.success ? (r.data as { email?: unknown }).email : undefined;
    hit = { ok: r.success, email: typeof email === 'string' ? email : '' };
    perSchema.set(schema, hit);
  }
  return hit;
}

interface LimitSpec {
  name: string;
  windowMinutes: number;
  limit: number;
  by: 'ip' | 'email';
  /**
   * The route's own body schema. A body it refuses is not counted: the route answers 422 and
   * nothing reaches the store, so no unchecked value (a huge or broken address) is ever a key.
   */
  schema: z.ZodType;
  /** Count only refused attempts (password sign-in), so normal use never trips it. */
  failuresOnly?: boolean;
  message: string;
}

export function limiter(deps: AppDeps, spec: LimitSpec): RequestHandler {
  return rateLimit({
    windowMs: spec.windowMinutes * 60_000,
    limit: spec.limit * deps.config.AUTH_LIMIT_SCALE,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: spec.failuresOnly ?? false,
    store: new PostgresRateStore(deps, `${spec.name}:`),
    skip: (req) => !bodyOf(req, spec.schema).ok,
    keyGenerator: (req) => (spec.by === 'ip' ? ipOf(req) : bodyOf(req, spec.schema).email || ipOf(req)),
    handler: (_req, _res, next) => next(new AppError(429, 'rate_limited', spec.message)),
  });
}

const WAIT = 'Please wait a few minutes and try again.';
export const authLimits = (deps: AppDeps) => ({
  linkByEmail: limiter(deps, {
    name: 'link-email',
    schema: linkRequestSchema,
    windowMinutes: 15,
    limit: 5,
    by: 'email',
    message: `We have already sent several links to this address. ${WAIT}`,
  }),
  linkByIp: limiter(deps, {
    name: 'link-ip',
    schema: linkRequestSchema,
    windowMinutes: 15,
    limit: 30,
    by: 'ip',
    message: `Too many sign-in link requests from this network. ${WAIT}`,
  }),
  passwordByIp: limiter(deps, {
    name: 'password-ip',
    schema: staffSignInSchema,
    windowMinutes: 15,
    limit: 40,
    by: 'ip',
    failuresOnly: true,
    message: `Too many sign-in attempts from this network. ${WAIT}`,
  }),
  resetByEmail: limiter(deps, {
    name: 'reset-email',
    schema: forgotPasswordSchema,
    windowMinutes: 15,
    limit: 3,
    by: 'email',
    message: `We have already sent several links to this address. ${WAIT}`,
  }),
  resetByIp: limiter(deps, {
    name: 'reset-ip',
    schema: forgotPasswordSchema,
    windowMinutes: 15,
    limit: 20,
    by: 'ip',
    message: `Too many password reset requests from this network. ${WAIT}`,
  }),
});
