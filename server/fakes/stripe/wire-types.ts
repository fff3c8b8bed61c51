import type Stripe from 'stripe';

// The objects the fake keeps, in the API's wire shape. Each is the SDK's own type cut down to
// the fields the fake fills in (the real objects carry many more), so a field the fake sends
// has the SDK's name and type. Fields that hold another object in the SDK's type hold the
// fake's cut-down version of it here.

/** `T` narrowed to the keys `K`, with the fields in `O` replaced. */
type Wire<T, K extends keyof T, O = object> = Omit<Pick<T, K>, keyof O> & O;

/** One page of a list endpoint. */
export interface WireList<T> {
  object: 'list';
  data: T[];
  has_more: boolean;
  url: string;
}

export type WireCustomer = Wire<
  Stripe.Customer,
  | 'id'
  | 'object'
  | 'created'
  | 'livemode'
  | 'address'
  | 'balance'
  | 'currency'
  | 'default_source'
  | 'delinquent'
  | 'description'
  | 'email'
  | 'invoice_prefix'
  | 'invoice_settings'
  | 'metadata'
  | 'name'
  | 'phone'
  | 'preferred_locales'
  | 'shipping'
  | 'tax_exempt'
  | 'test_clock',
  { invoice_settings: Wire<Stripe.Customer.InvoiceSettings, 'custom_fields' | 'default_payment_method' | 'footer' | 'rendering_options'> }
>;

export type WireDeletedCustomer = Pick<Stripe.DeletedCustomer, 'id' | 'object' | 'deleted'>;

export type WireCard = Pick<
  Stripe.PaymentMethod.Card,
  'brand' | 'checks' | 'country' | 'display_brand' | 'exp_month' | 'exp_year' | 'fingerprint' | 'funding' | 'last4' | 'networks' | 'wallet'
>;

export type WireBillingDetails = Pick<Stripe.PaymentMethod.BillingDetails, 'address' | 'email' | 'name' | 'phone'>;

export type WirePaymentMethod = Wire<
  Stripe.PaymentMethod,
  'id' | 'object' | 'created' | 'livemode' | 'allow_redisplay' | 'billing_details' | 'card' | 'customer' | 'metadata' | 'type',
  { billing_details: WireBillingDetails; card: WireCard; customer: string | null }
>;

/** A card error as it sits on an intent (`last_setup_error`, `last_payment_error`). */
export type WireLastError = Wire<
  Stripe.PaymentIntent.LastPaymentError,
  'type' | 'code' | 'decline_code' | 'message' | 'charge',
  { payment_method: WirePaymentMethod; charge?: string }
>;

export type WireSetupIntent = Wire<
  Stripe.SetupIntent,
  | 'id'
  | 'object'
  | 'application'
  | 'automatic_payment_methods'
  | 'cancellation_reason'
  | 'client_secret'
  | 'created'
  | 'customer'
  | 'description'
  | 'last_setup_error'
  | 'latest_attempt'
  | 'livemode'
  | 'metadata'
  | 'next_action'
  | 'payment_method'
  | 'payment_method_types'
  | 'status'
  | 'usage',
  { customer: string | null; payment_method: string | null; last_setup_error: WireLastError | null; cancellation_reason: string | null }
>;

export type WirePaymentIntent = Wire<
  Stripe.PaymentIntent,
  | 'id'
  | 'object'
  | 'amount'
  | 'amount_capturable'
  | 'amount_details'
  | 'amount_received'
  | 'application'
  | 'application_fee_amount'
  | 'automatic_payment_methods'
  | 'canceled_at'
  | 'cancellation_reason'
  | 'capture_method'
  | 'client_secret'
  | 'confirmation_method'
  | 'created'
  | 'currency'
  | 'customer'
  | 'description'
  | 'last_payment_error'
  | 'latest_charge'
  | 'livemode'
  | 'metadata'
  | 'next_action'
  | 'on_behalf_of'
  | 'payment_method'
  | 'payment_method_types'
  | 'processing'
  | 'receipt_email'
  | 'setup_future_usage'
  | 'statement_descriptor'
  | 'statement_descriptor_suffix'
  | 'status'
  | 'transfer_data'
  | 'transfer_group',
  {
    amount_details: Pick<Stripe.PaymentIntent.AmountDetails, 'tip'>;
    customer: string | null;
    payment_method: string | null;
    latest_charge: string | null;
    last_payment_error: WireLastError | null;
  }
>;

export type WireCharge = Wire<
  Stripe.Charge,
  | 'id'
  | 'object'
  | 'created'
  | 'livemode'
  | 'amount'
  | 'amount_captured'
  | 'amount_refunded'
  | 'billing_details'
  | 'captured'
  | 'currency'
  | 'customer'
  | 'description'
  | 'disputed'
  | 'failure_code'
  | 'failure_message'
  | 'metadata'
  | 'outcome'
  | 'paid'
  | 'payment_intent'
  | 'payment_method'
  | 'payment_method_details'
  | 'receipt_email'
  | 'receipt_url'
  | 'refunded'
  | 'status',
  {
    billing_details: WireBillingDetails;
    customer: string | null;
    payment_intent: string;
    outcome: Pick<Stripe.Charge.Outcome, 'network_status' | 'reason' | 'risk_level' | 'seller_message' | 'type'>;
    payment_method_details: {
      type: 'card';
      card: Pick<Stripe.Charge.PaymentMethodDetails.Card, 'brand' | 'last4' | 'exp_month' | 'exp_year' | 'funding' | 'country'>;
    };
  }
>;

export type WireRefund = Wire<
  Stripe.Refund,
  'id' | 'object' | 'created' | 'amount' | 'balance_transaction' | 'charge' | 'currency' | 'metadata' | 'payment_intent' | 'reason' | 'receipt_number' | 'status',
  { charge: string; payment_intent: string }
>;

export type WirePrice = Wire<
  Stripe.Price,
  'id' | 'object' | 'active' | 'billing_scheme' | 'created' | 'currency' | 'livemode' | 'metadata' | 'product' | 'type' | 'unit_amount' | 'unit_amount_decimal',
  // A decimal string on the wire; the SDK reads it into its own Decimal.
  { unit_amount_decimal: string | null }
>;

export type WireLineItem = Wire<
  Stripe.LineItem,
  'id' | 'object' | 'amount_discount' | 'amount_subtotal' | 'amount_tax' | 'amount_total' | 'currency' | 'description' | 'price' | 'quantity',
  { price: WirePrice }
>;

export type WireCheckoutSession = Wire<
  Stripe.Checkout.Session,
  | 'id'
  | 'object'
  | 'amount_subtotal'
  | 'amount_total'
  | 'cancel_url'
  | 'client_reference_id'
  | 'created'
  | 'currency'
  | 'customer'
  | 'customer_creation'
  | 'customer_details'
  | 'customer_email'
  | 'expires_at'
  | 'livemode'
  | 'locale'
  | 'metadata'
  | 'mode'
  | 'payment_intent'
  | 'payment_method_types'
  | 'payment_status'
  | 'setup_intent'
  | 'status'
  | 'submit_type'
  | 'success_url'
  | 'ui_mode'
  | 'url',
  {
    customer: string | null;
    payment_intent: string | null;
    setup_intent: string | null;
    customer_details: Pick<Stripe.Checkout.Session.CustomerDetails, 'email' | 'name' | 'phone' | 'address' | 'tax_exempt' | 'tax_ids'> | null;
    success_url: string;
  }
>;

/** Every object an event can carry. */
export type WireObject = WireCustomer | WirePaymentMethod | WireSetupIntent | WirePaymentIntent | WireCharge | WireRefund | WireCheckoutSession;

export interface WireEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: WireObject };
  livemode: boolean;
  pending_webhooks: number;
  request: Stripe.Event.Request;
  type: Stripe.Event.Type;
}
