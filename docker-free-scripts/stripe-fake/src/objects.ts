import type Stripe from 'stripe';
import { newId, PREFIX } from './ids.js';

/*
 * Object factories typed with the SDK's own types, so a field the SDK expects and the fake forgets
 * is a compile error. Only the fields a card payment through Checkout uses carry real values; the
 * rest are the nulls and defaults the processor sends for such a payment.
 */

export function customer(p: { created: number; email: string | null; name: string | null; description: string | null; metadata: Stripe.Metadata }): Stripe.Customer {
  return {
    id: newId(PREFIX.customer),
    object: 'customer',
    balance: 0,
    created: p.created,
    default_source: null,
    description: p.description,
    email: p.email,
    name: p.name,
    invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
    livemode: false,
    metadata: p.metadata,
    shipping: null,
  };
}

export function paymentIntent(p: {
  created: number;
  amount: number;
  currency: string;
  customer: string | null;
  description: string | null;
  metadata: Stripe.Metadata;
  receiptEmail: string | null;
  paymentMethod: string | null;
}): Stripe.PaymentIntent {
  const id = newId(PREFIX.paymentIntent);
  return {
    id,
    object: 'payment_intent',
    allowed_payment_method_types: null,
    amount: p.amount,
    amount_capturable: 0,
    amount_received: 0,
    application: null,
    application_fee_amount: null,
    automatic_payment_methods: null,
    canceled_at: null,
    cancellation_reason: null,
    capture_method: 'automatic',
    client_secret: `${id}_secret_${newId('').slice(0, 24)}`,
    confirmation_method: 'automatic',
    created: p.created,
    currency: p.currency,
    customer: p.customer,
    customer_account: null,
    description: p.description,
    excluded_payment_method_types: null,
    last_payment_error: null,
    latest_charge: null,
    livemode: false,
    managed_payments: null,
    metadata: p.metadata,
    next_action: null,
    on_behalf_of: null,
    payment_method: p.paymentMethod,
    payment_method_configuration_details: null,
    payment_method_options: null,
    payment_method_types: ['card'],
    payment_record: null,
    processing: null,
    receipt_email: p.receiptEmail,
    review: null,
    setup_future_usage: null,
    shipping: null,
    source: null,
    statement_descriptor: null,
    statement_descriptor_suffix: null,
    status: p.paymentMethod ? 'requires_confirmation' : 'requires_payment_method',
    transfer_group: null,
  };
}

export interface LineItemInput {
  name: string;
  description: string | null;
  unitAmount: number;
  quantity: number;
  currency: string;
}

export function lineItem(created: number, li: LineItemInput): Stripe.LineItem {
  const total = li.unitAmount * li.quantity;
  const product = newId(PREFIX.product);
  return {
    id: newId(PREFIX.lineItem),
    object: 'item',
    adjustable_quantity: null,
    amount_discount: 0,
    amount_subtotal: total,
    amount_tax: 0,
    amount_total: total,
    currency: li.currency,
    description: li.name,
    metadata: {},
    quantity: li.quantity,
    price: {
      id: newId(PREFIX.price),
      object: 'price',
      active: false,
      billing_scheme: 'per_unit',
      created,
      currency: li.currency,
      custom_unit_amount: null,
      livemode: false,
      lookup_key: null,
      metadata: {},
      nickname: null,
      product,
      recurring: null,
      tax_behavior: 'unspecified',
      tiers_mode: null,
      transform_quantity: null,
      type: 'one_time',
      unit_amount: li.unitAmount,
      // On the wire a decimal is a string; the SDK turns it into its own Decimal when it reads the reply.
      unit_amount_decimal: String(li.unitAmount) as unknown as Stripe.Decimal,
    },
  };
}

export function checkoutSession(p: {
  created: number;
  expiresAt: number;
  currency: string;
  amountTotal: number;
  successUrl: string | null;
  cancelUrl: string | null;
  customer: string | null;
  customerEmail: string | null;
  clientReferenceId: string | null;
  metadata: Stripe.Metadata;
  payBaseUrl: string;
}): Stripe.Checkout.Session {
  const id = newId(PREFIX.checkoutSession);
  return {
    id,
    object: 'checkout.session',
    adaptive_pricing: null,
    after_expiration: null,
    allow_promotion_codes: null,
    allowed_payment_method_types: null,
    amount_subtotal: p.amountTotal,
    amount_total: p.amountTotal,
    automatic_tax: { enabled: false, liability: null, provider: null, status: null },
    billing_address_collection: null,
    cancel_url: p.cancelUrl,
    client_reference_id: p.clientReferenceId,
    client_secret: null,
    collected_information: null,
    consent: null,
    consent_collection: null,
    created: p.created,
    currency: p.currency,
    currency_conversion: null,
    custom_fields: [],
    custom_text: { after_submit: null, shipping_address: null, submit: null, terms_of_service_acceptance: null },
    customer: p.customer,
    customer_account: null,
    customer_creation: p.customer ? null : 'if_required',
    customer_details: null,
    customer_email: p.customerEmail,
    discounts: [],
    expires_at: p.expiresAt,
    integration_identifier: null,
    invoice: null,
    invoice_creation: null,
    livemode: false,
    locale: null,
    managed_payments: null,
    metadata: p.metadata,
    mode: 'payment',
    origin_context: null,
    payment_intent: null,
    payment_link: null,
    payment_method_collection: 'if_required',
    payment_method_configuration_details: null,
    payment_method_options: null,
    payment_method_types: ['card'],
    payment_status: 'unpaid',
    permissions: null,
    recovered_from: null,
    saved_payment_method_options: null,
    setup_intent: null,
    shipping_address_collection: null,
    shipping_cost: null,
    shipping_options: [],
    status: 'open',
    submit_type: null,
    subscription: null,
    success_url: p.successUrl,
    total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
    ui_mode: 'hosted',
    url: `${p.payBaseUrl}/pay/${id}`,
    wallet_options: null,
  };
}

export function charge(p: {
  created: number;
  pi: Stripe.PaymentIntent;
  paymentMethod: string;
  last4: string;
  failure: { code: string; message: string; declineCode: string | null } | null;
  balanceTransaction: string | null;
}): Stripe.Charge {
  const ok = p.failure === null;
  return {
    id: newId(PREFIX.charge),
    object: 'charge',
    amount: p.pi.amount,
    amount_captured: ok ? p.pi.amount : 0,
    amount_refunded: 0,
    application: null,
    application_fee: null,
    application_fee_amount: null,
    balance_transaction: p.balanceTransaction,
    billing_details: { address: null, email: null, name: null, phone: null, tax_id: null },
    calculated_statement_descriptor: 'WINGSTAGE TEST',
    captured: ok,
    created: p.created,
    currency: p.pi.currency,
    customer: typeof p.pi.customer === 'string' ? p.pi.customer : null,
    description: p.pi.description,
    disputed: false,
    failure_balance_transaction: null,
    failure_code: p.failure?.code ?? null,
    failure_message: p.failure?.message ?? null,
    fraud_details: {},
    livemode: false,
    metadata: { ...p.pi.metadata },
    on_behalf_of: null,
    outcome: {
      advice_code: null,
      network_advice_code: null,
      network_decline_code: null,
      network_status: ok ? 'approved_by_network' : 'declined_by_network',
      reason: p.failure?.declineCode ?? null,
      risk_level: 'normal',
      seller_message: ok ? 'Payment complete.' : 'The bank did not return any further details with this decline.',
      type: ok ? 'authorized' : 'issuer_declined',
    },
    paid: ok,
    payment_intent: p.pi.id,
    payment_method: p.paymentMethod,
    payment_method_details: null,
    receipt_email: p.pi.receipt_email,
    receipt_number: null,
    receipt_url: null,
    refunded: false,
    review: null,
    shipping: null,
    source: null,
    source_transfer: null,
    statement_descriptor: null,
    statement_descriptor_suffix: null,
    status: ok ? 'succeeded' : 'failed',
    transfer_data: null,
    transfer_group: null,
  };
}

export function refund(p: { created: number; amount: number; currency: string; charge: string; paymentIntent: string | null; reason: Stripe.Refund.Reason | null; metadata: Stripe.Metadata; balanceTransaction: string }): Stripe.Refund {
  return {
    id: newId(PREFIX.refund),
    object: 'refund',
    amount: p.amount,
    balance_transaction: p.balanceTransaction,
    charge: p.charge,
    created: p.created,
    currency: p.currency,
    customer: null,
    customer_account: null,
    metadata: p.metadata,
    payment_intent: p.paymentIntent,
    payment_method: null,
    reason: p.reason,
    receipt_number: null,
    source_transfer_reversal: null,
    status: 'succeeded',
    transfer_reversal: null,
  };
}

export function balanceTransaction(p: {
  id?: string;
  created: number;
  availableOn: number;
  amount: number;
  fee: number;
  currency: string;
  type: 'charge' | 'refund' | 'payout';
  source: string;
  description: string | null;
}): Stripe.BalanceTransaction {
  return {
    id: p.id ?? newId(PREFIX.balanceTransaction),
    object: 'balance_transaction',
    amount: p.amount,
    available_on: p.availableOn,
    balance_type: 'payments',
    created: p.created,
    currency: p.currency,
    description: p.description,
    exchange_rate: null,
    fee: p.fee,
    fee_details: p.fee ? [{ amount: p.fee, application: null, currency: p.currency, description: 'Processing fees', type: 'stripe_fee' }] : [],
    net: p.amount - p.fee,
    reporting_category: p.type,
    source: p.source,
    status: 'pending',
    type: p.type,
  };
}

export function payout(p: { created: number; amount: number; currency: string; balanceTransaction: string }): Stripe.Payout {
  return {
    id: newId(PREFIX.payout),
    object: 'payout',
    amount: p.amount,
    application_fee: null,
    application_fee_amount: null,
    arrival_date: p.created,
    automatic: true,
    balance_transaction: p.balanceTransaction,
    created: p.created,
    currency: p.currency,
    description: 'STRIPE PAYOUT',
    destination: 'ba_test_wingstage',
    failure_balance_transaction: null,
    failure_code: null,
    failure_message: null,
    livemode: false,
    metadata: {},
    method: 'standard',
    original_payout: null,
    payout_method: null,
    reconciliation_status: 'completed',
    reversed_by: null,
    source_type: 'card',
    statement_descriptor: null,
    status: 'paid',
    trace_id: null,
    type: 'bank_account',
  };
}
