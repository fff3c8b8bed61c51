import express, { type Request, type Response } from 'express';
import { randomBytes } from 'node:crypto';
import { listCharges, retrieveCharge } from './charges';
import { createCheckoutSession, expireCheckoutSession, listCheckoutLineItems, listCheckoutSessions, retrieveCheckoutSession } from './checkout-sessions';
import { createCustomer, deleteCustomer, listCustomers, retrieveCustomer, updateCustomer } from './customers';
import { FAKE_API_VERSION, type Engine, type RequestInfo } from './engine';
import { errorTypeForStatus, FakeStripeError } from './errors';
import { fingerprint, IdempotencyStore } from './idempotency';
import { listEvents, retrieveEvent } from './events';
import { asParams, type Params } from './params';
import {
  cancelPaymentIntent,
  capturePaymentIntent,
  confirmPaymentIntent,
  createPaymentIntent,
  listPaymentIntents,
  retrievePaymentIntent,
  updatePaymentIntent,
} from './payment-intents';
import { attachPaymentMethod, createPaymentMethod, detachPaymentMethod, listPaymentMethods, retrievePaymentMethod } from './payment-methods';
import { createRefund, listRefunds, retrieveRefund } from './refunds';
import { cancelSetupIntent, confirmSetupIntent, createSetupIntent, retrieveSetupIntent } from './setup-intents';

export interface Fault {
  /** Path prefix, e.g. `/v1/payment_intents`. */
  path: string;
  method?: string;
  status: number;
  /** How many matching requests to fail; they store nothing. */
  times: number;
}

export interface LoggedRequest {
  method: string;
  path: string;
  idempotencyKey: string | null;
  status: number;
  replayed: boolean;
}

export interface ApiDeps {
  /** Every API request and the status it got, oldest first (no bodies: they may hold card data). */
  log: LoggedRequest[];
  engine: Engine;
  idempotency: IdempotencyStore;
  faults: Fault[];
  apiKeys?: readonly string[];
  publicUrl: (req: Request) => string;
}

/** Returns the response body: a wire object or list. */
type Handler = (req: Request, info: RequestInfo, p: Params) => unknown;

const TEST_KEY = /^(sk|rk)_test_[A-Za-z0-9_]{4,}$/;

function sendError(res: Response, err: FakeStripeError): void {
  res.status(err.status).json({ error: err.body });
}

function apiKeyOf(req: Request, deps: ApiDeps): string {
  const header = req.get('authorization') ?? '';
  const m = /^Bearer\s+(\S+)$/i.exec(header);
  const basic = /^Basic\s+(\S+)$/i.exec(header);
  const key = m ? m[1]! : basic ? Buffer.from(basic[1]!, 'base64').toString('utf8').split(':')[0]! : '';
  if (!key) {
    throw new FakeStripeError(401, {
      type: 'authentication_error',
      message: 'You did not provide an API key. Provide it in the Authorization header as "Bearer sk_test_...".',
    });
  }
  if (!TEST_KEY.test(key) || (deps.apiKeys && !deps.apiKeys.includes(key))) {
    throw new FakeStripeError(401, {
      type: 'authentication_error',
      code: 'api_key_invalid',
      message: `Invalid API Key provided: ${key.slice(0, 8)}${'*'.repeat(Math.max(0, key.length - 12))}${key.slice(-4)}`,
    });
  }
  return key;
}

function takeFault(req: Request, faults: Fault[]): Fault | undefined {
  const i = faults.findIndex((f) => f.times > 0 && req.originalUrl.split('?')[0]!.startsWith(f.path) && (!f.method || f.method.toUpperCase() === req.method));
  if (i < 0) return undefined;
  const f = faults[i]!;
  f.times--;
  if (f.times <= 0) faults.splice(i, 1);
  return f;
}

/** The `/v1` API: auth, fault switch, idempotency, then the handler. */
export function createApiRouter(deps: ApiDeps): express.Router {
  const { engine: e } = deps;
  const router = express.Router();
  router.use(express.urlencoded({ extended: true, limit: '1mb' }));

  const run =
    (handler: Handler) =>
    (req: Request, res: Response): void => {
      const requestId = `req_${randomBytes(7).toString('hex')}`;
      res.set('Request-Id', requestId);
      res.on('finish', () => {
        deps.log.push({
          method: req.method,
          path: req.baseUrl + req.path,
          idempotencyKey: req.get('idempotency-key') ?? null,
          status: res.statusCode,
          replayed: res.get('Idempotent-Replayed') === 'true',
        });
      });
      let apiKey: string;
      try {
        apiKey = apiKeyOf(req, deps);
      } catch (e) {
        sendError(res, e as FakeStripeError);
        return;
      }
      const fault = takeFault(req, deps.faults);
      if (fault) {
        sendError(
          res,
          new FakeStripeError(fault.status, {
            type: errorTypeForStatus(fault.status),
            ...(fault.status === 429 ? { code: 'rate_limit' } : {}),
            message: `Injected fault: this request failed with ${fault.status} and stored nothing.`,
          }),
        );
        return;
      }
      const params = asParams(req.method === 'GET' || req.method === 'DELETE' ? req.query : req.body);
      const apiVersion = req.get('stripe-version') ?? FAKE_API_VERSION;
      res.set('Stripe-Version', apiVersion);
      const key = req.method === 'POST' ? (req.get('idempotency-key') ?? null) : null;
      const path = req.baseUrl + req.path;
      const print = key ? fingerprint(req.method, path, params) : '';
      if (key) {
        res.set('Idempotency-Key', key);
        if (key.length > 255) {
          sendError(res, new FakeStripeError(400, { type: 'invalid_request_error', message: 'Idempotency keys can be at most 255 characters long.' }));
          return;
        }
        const prior = deps.idempotency.get(apiKey, key);
        if (prior) {
          if (prior.fingerprint !== print) {
            const samePath = prior.method === req.method && prior.path === path;
            sendError(
              res,
              new FakeStripeError(400, {
                type: 'idempotency_error',
                message: samePath
                  ? `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`
                  : `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${prior.method} ${prior.path}'). Try using a key other than '${key}' if you meant to execute a different request.`,
              }),
            );
            return;
          }
          res.set('Idempotent-Replayed', 'true');
          res.status(prior.status).json(prior.body);
          return;
        }
      }
      const info: RequestInfo = { requestId, idempotencyKey: key, apiVersion, publicUrl: deps.publicUrl(req) };
      let status = 200;
      let body: unknown;
      try {
        body = handler(req, info, params);
      } catch (e) {
        if (!(e instanceof FakeStripeError)) throw e;
        status = e.status;
        body = { error: e.body };
      }
      // As with Stripe, a result is kept once the endpoint ran: successes and
      // card declines. Requests refused by validation are not kept.
      if (key && (status === 200 || status === 402)) {
        deps.idempotency.put(apiKey, key, { fingerprint: print, method: req.method, path, status, body });
      }
      res.status(status).json(body);
    };

  const id = (req: Request, name = 'id') => String(req.params[name]);

  router.post(
    '/customers',
    run((_r, _i, p) => createCustomer(e, p)),
  );
  router.get(
    '/customers',
    run((_r, _i, p) => listCustomers(e, p)),
  );
  router.get(
    '/customers/:id',
    run((r, _i, p) => retrieveCustomer(e, id(r), p)),
  );
  router.post(
    '/customers/:id',
    run((r, _i, p) => updateCustomer(e, id(r), p)),
  );
  router.delete(
    '/customers/:id',
    run((r) => deleteCustomer(e, id(r))),
  );
  router.get(
    '/customers/:id/payment_methods',
    run((r, _i, p) => listPaymentMethods(e, p, id(r))),
  );

  router.post(
    '/payment_methods',
    run((_r, _i, p) => createPaymentMethod(e, p)),
  );
  router.get(
    '/payment_methods',
    run((_r, _i, p) => listPaymentMethods(e, p)),
  );
  router.get(
    '/payment_methods/:id',
    run((r) => retrievePaymentMethod(e, id(r))),
  );
  router.post(
    '/payment_methods/:id/attach',
    run((r, _i, p) => attachPaymentMethod(e, id(r), p)),
  );
  router.post(
    '/payment_methods/:id/detach',
    run((r) => detachPaymentMethod(e, id(r))),
  );

  router.post(
    '/setup_intents',
    run((_r, i, p) => createSetupIntent(e, p, i)),
  );
  router.get(
    '/setup_intents/:id',
    run((r, _i, p) => retrieveSetupIntent(e, id(r), p)),
  );
  router.post(
    '/setup_intents/:id/confirm',
    run((r, i, p) => confirmSetupIntent(e, id(r), p, i)),
  );
  router.post(
    '/setup_intents/:id/cancel',
    run((r, _i, p) => cancelSetupIntent(e, id(r), p)),
  );

  router.post(
    '/payment_intents',
    run((_r, i, p) => createPaymentIntent(e, p, i)),
  );
  router.get(
    '/payment_intents',
    run((_r, _i, p) => listPaymentIntents(e, p)),
  );
  router.get(
    '/payment_intents/:id',
    run((r, _i, p) => retrievePaymentIntent(e, id(r), p)),
  );
  router.post(
    '/payment_intents/:id',
    run((r, _i, p) => updatePaymentIntent(e, id(r), p)),
  );
  router.post(
    '/payment_intents/:id/confirm',
    run((r, i, p) => confirmPaymentIntent(e, id(r), p, i)),
  );
  router.post(
    '/payment_intents/:id/capture',
    run((r, i, p) => capturePaymentIntent(e, id(r), p, i)),
  );
  router.post(
    '/payment_intents/:id/cancel',
    run((r, i, p) => cancelPaymentIntent(e, id(r), p, i)),
  );

  router.get(
    '/charges',
    run((_r, _i, p) => listCharges(e, p)),
  );
  router.get(
    '/charges/:id',
    run((r, _i, p) => retrieveCharge(e, id(r), p)),
  );

  router.post(
    '/refunds',
    run((_r, i, p) => createRefund(e, p, i)),
  );
  router.get(
    '/refunds',
    run((_r, _i, p) => listRefunds(e, p)),
  );
  router.get(
    '/refunds/:id',
    run((r, _i, p) => retrieveRefund(e, id(r), p)),
  );

  router.post(
    '/checkout/sessions',
    run((_r, i, p) => createCheckoutSession(e, p, i)),
  );
  router.get(
    '/checkout/sessions',
    run((_r, _i, p) => listCheckoutSessions(e, p)),
  );
  router.get(
    '/checkout/sessions/:id',
    run((r, _i, p) => retrieveCheckoutSession(e, id(r), p)),
  );
  router.get(
    '/checkout/sessions/:id/line_items',
    run((r, _i, p) => listCheckoutLineItems(e, id(r), p)),
  );
  router.post(
    '/checkout/sessions/:id/expire',
    run((r, i) => expireCheckoutSession(e, id(r), i)),
  );

  router.get(
    '/events',
    run((_r, _i, p) => listEvents(e, p)),
  );
  router.get(
    '/events/:id',
    run((r) => retrieveEvent(e, id(r))),
  );

  router.use(
    run((req) => {
      throw new FakeStripeError(404, {
        type: 'invalid_request_error',
        message: `Unrecognized request URL (${req.method}: ${req.originalUrl.split('?')[0]}). This test tool covers only part of the API.`,
      });
    }),
  );
  return router;
}
