// Documented test card numbers decide the outcome, as in Stripe's test mode.

export interface CardFailure {
  code: string;
  decline_code?: string;
  message: string;
}

export interface TestCard {
  number: string;
  brand: 'visa' | 'mastercard' | 'amex';
  funding: 'credit' | 'debit';
  /** Outcome when the card is saved (SetupIntent, attach); null = succeeds. */
  onSave: CardFailure | null;
  /** Outcome when the card is charged; null = succeeds. */
  onCharge: CardFailure | null;
}

const generic: CardFailure = { code: 'card_declined', decline_code: 'generic_decline', message: 'Your card was declined.' };
const insufficient: CardFailure = {
  code: 'card_declined',
  decline_code: 'insufficient_funds',
  message: 'Your card has insufficient funds.',
};
const expired: CardFailure = { code: 'expired_card', decline_code: 'expired_card', message: 'Your card has expired.' };

export const TEST_CARDS: readonly TestCard[] = [
  { number: '4242424242424242', brand: 'visa', funding: 'credit', onSave: null, onCharge: null },
  { number: '4000056655665556', brand: 'visa', funding: 'debit', onSave: null, onCharge: null },
  { number: '5555555555554444', brand: 'mastercard', funding: 'credit', onSave: null, onCharge: null },
  { number: '4000000000000002', brand: 'visa', funding: 'credit', onSave: generic, onCharge: generic },
  { number: '4000000000009995', brand: 'visa', funding: 'credit', onSave: insufficient, onCharge: insufficient },
  { number: '4000000000000069', brand: 'visa', funding: 'credit', onSave: expired, onCharge: expired },
  // Saves fine, then every charge declines: the card for dunning.
  { number: '4000000000000341', brand: 'visa', funding: 'credit', onSave: null, onCharge: generic },
];

/** Test payment-method ids that stand for a test card, as Stripe's test mode offers. */
export const TEST_PAYMENT_METHODS: Readonly<Record<string, string>> = {
  pm_card_visa: '4242424242424242',
  pm_card_visa_debit: '4000056655665556',
  pm_card_mastercard: '5555555555554444',
  pm_card_chargeDeclined: '4000000000000002',
  pm_card_chargeDeclinedInsufficientFunds: '4000000000009995',
  pm_card_chargeDeclinedExpiredCard: '4000000000000069',
  pm_card_chargeCustomerFail: '4000000000000341',
};

/** Test card tokens accepted as `card[token]`. */
export const TEST_TOKENS: Readonly<Record<string, string>> = {
  tok_visa: '4242424242424242',
  tok_mastercard: '5555555555554444',
  tok_chargeDeclined: '4000000000000002',
  tok_chargeDeclinedInsufficientFunds: '4000000000009995',
  tok_chargeDeclinedExpiredCard: '4000000000000069',
  tok_chargeCustomerFail: '4000000000000341',
};

export function luhnValid(digits: string): boolean {
  let sum = 0;
  for (let i = 0; i < digits.length; i++) {
    let d = Number(digits[digits.length - 1 - i]);
    if (i % 2 === 1) {
      d *= 2;
      if (d > 9) d -= 9;
    }
    sum += d;
  }
  return digits.length >= 12 && sum % 10 === 0;
}

export type CardLookup = { ok: true; card: TestCard } | { ok: false; failure: CardFailure };

/** Looks a typed card number up among the test cards (spaces and dashes ignored). */
export function lookupCard(rawNumber: string): CardLookup {
  const digits = rawNumber.replace(/[\s-]/g, '');
  if (!/^\d{12,19}$/.test(digits) || !luhnValid(digits)) {
    return { ok: false, failure: { code: 'incorrect_number', message: 'Your card number is incorrect.' } };
  }
  const card = TEST_CARDS.find((c) => c.number === digits);
  if (!card) {
    return {
      ok: false,
      failure: {
        code: 'card_declined',
        decline_code: 'test_mode_live_card',
        message: 'Your card was declined. This test tool only accepts the documented test card numbers.',
      },
    };
  }
  return { ok: true, card };
}
