import type { AppDeps } from '../deps';
import type { agreements } from '../db/schema';
import { AppError } from '../http/errors';
import { ensureStripeCustomer, providerError } from '../billing/checkout';

// Saving a card for automatic renewal: the processor's hosted page in setup mode. The webhook
// records the card and, when asked, turns automatic renewal on.

type AgreementRow = typeof agreements.$inferSelect;

export async function startCardSetup(deps: Pick<AppDeps, 'config' | 'database' | 'stripe'>, a: AgreementRow, enableAutoRenew: boolean): Promise<{ checkoutUrl: string }> {
  try {
    return await openCardSetup(deps, a, enableAutoRenew);
  } catch (e) {
    throw providerError(e);
  }
}

async function openCardSetup(deps: Pick<AppDeps, 'config' | 'database' | 'stripe'>, a: AgreementRow, enableAutoRenew: boolean): Promise<{ checkoutUrl: string }> {
  const customer = await ensureStripeCustomer(deps, a.customerId);
  const base = deps.config.publicUrl.replace(/\/$/, '');
  const metadata = { agreementId: a.id, enableAutoRenew: String(enableAutoRenew) };
  const s = await deps.stripe.checkout.sessions.create({
    mode: 'setup',
    customer,
    metadata,
    setup_intent_data: { metadata },
    success_url: `${base}/portal/plan?checkout={CHECKOUT_SESSION_ID}`,
    cancel_url: `${base}/portal/plan?checkout=canceled`,
  });
  if (!s.url) throw new AppError(502, 'checkout_failed', 'The card page could not be opened. Please try again.');
  return { checkoutUrl: s.url };
}
