import type Stripe from "stripe";
import { newId } from "./ids";
import type { Metadata } from "./params";

/**
 * Builders for the objects the fake hands out, typed with the SDK's own interfaces so every field
 * the installed API version declares is present (mostly as Stripe's nulls). Amounts are integers
 * in minor units; times are unix seconds on the fake clock.
 */

/** Stripe sends decimal amounts as strings; the SDK turns them into its Decimal type. */
export function wireDecimal(value: number | string): Stripe.Decimal {
  return String(value) as unknown as Stripe.Decimal;
}

export function apiList<T>(data: T[], url: string, hasMore = false): Stripe.ApiList<T> {
  return { object: "list", data, has_more: hasMore, url };
}

export function customer(input: { now: number; email: string | null; name: string | null; description: string | null; phone: string | null; metadata: Metadata }): Stripe.Customer {
  return {
    id: newId("cus"),
    object: "customer",
    address: null,
    balance: 0,
    created: input.now,
    currency: null,
    customer_account: null,
    default_source: null,
    delinquent: false,
    description: input.description,
    discount: null,
    email: input.email,
    invoice_prefix: randomInvoicePrefix(),
    invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
    livemode: false,
    metadata: input.metadata,
    name: input.name,
    next_invoice_sequence: 1,
    phone: input.phone,
    preferred_locales: [],
    shipping: null,
    tax_exempt: "none",
    test_clock: null,
  };
}

export function product(input: { now: number; id?: string; name: string; description: string | null; active: boolean; images: string[]; metadata: Metadata; url: string | null; unitLabel: string | null }): Stripe.Product {
  return {
    id: input.id ?? newId("prod"),
    object: "product",
    active: input.active,
    created: input.now,
    default_price: null,
    description: input.description,
    images: input.images,
    livemode: false,
    marketing_features: [],
    metadata: input.metadata,
    name: input.name,
    package_dimensions: null,
    shippable: null,
    statement_descriptor: null,
    tax_code: null,
    tax_details: null,
    type: "service",
    unit_label: input.unitLabel,
    updated: input.now,
    url: input.url,
  };
}

export interface RecurringInput {
  interval: "day" | "week" | "month" | "year";
  intervalCount: number;
}

export function price(input: {
  now: number;
  product: string;
  currency: string;
  unitAmount: number;
  recurring: RecurringInput | null;
  active: boolean;
  lookupKey: string | null;
  nickname: string | null;
  metadata: Metadata;
  taxBehavior: Stripe.Price.TaxBehavior | null;
}): Stripe.Price {
  return {
    id: newId("price"),
    object: "price",
    active: input.active,
    billing_scheme: "per_unit",
    created: input.now,
    currency: input.currency,
    custom_unit_amount: null,
    livemode: false,
    lookup_key: input.lookupKey,
    metadata: input.metadata,
    nickname: input.nickname,
    product: input.product,
    recurring: input.recurring
      ? { interval: input.recurring.interval, interval_count: input.recurring.intervalCount, meter: null, trial_period_days: null, usage_type: "licensed" }
      : null,
    tax_behavior: input.taxBehavior ?? "unspecified",
    tiers_mode: null,
    transform_quantity: null,
    type: input.recurring ? "recurring" : "one_time",
    unit_amount: input.unitAmount,
    unit_amount_decimal: wireDecimal(input.unitAmount),
  };
}

export function lineItem(input: { price: Stripe.Price; productName: string; quantity: number; metadata: Metadata | null }): Stripe.LineItem {
  const amount = (input.price.unit_amount ?? 0) * input.quantity;
  return {
    id: newId("li"),
    object: "item",
    adjustable_quantity: null,
    amount_discount: 0,
    amount_subtotal: amount,
    amount_tax: 0,
    amount_total: amount,
    currency: input.price.currency,
    description: input.productName,
    metadata: input.metadata,
    price: input.price,
    quantity: input.quantity,
  };
}

export function checkoutSession(input: {
  now: number;
  id: string;
  mode: "payment" | "subscription";
  url: string;
  currency: string;
  amountTotal: number;
  successUrl: string | null;
  cancelUrl: string | null;
  clientReferenceId: string | null;
  customer: string | null;
  customerEmail: string | null;
  customerCreation: Stripe.Checkout.Session.CustomerCreation | null;
  expiresAt: number;
  metadata: Metadata;
  locale: Stripe.Checkout.Session.Locale | null;
  submitType: Stripe.Checkout.Session.SubmitType | null;
}): Stripe.Checkout.Session {
  return {
    id: input.id,
    object: "checkout.session",
    adaptive_pricing: { enabled: false },
    after_expiration: null,
    allow_promotion_codes: null,
    allowed_payment_method_types: null,
    amount_subtotal: input.amountTotal,
    amount_total: input.amountTotal,
    automatic_tax: { enabled: false, liability: null, provider: null, status: null },
    billing_address_collection: null,
    cancel_url: input.cancelUrl,
    client_reference_id: input.clientReferenceId,
    client_secret: null,
    collected_information: null,
    consent: null,
    consent_collection: null,
    created: input.now,
    currency: input.currency,
    currency_conversion: null,
    custom_fields: [],
    custom_text: { after_submit: null, shipping_address: null, submit: null, terms_of_service_acceptance: null },
    customer: input.customer,
    customer_account: null,
    customer_creation: input.customerCreation,
    // Filled in when the customer completes the page.
    customer_details: null,
    customer_email: input.customerEmail,
    discounts: [],
    expires_at: input.expiresAt,
    integration_identifier: null,
    invoice: null,
    invoice_creation:
      input.mode === "payment"
        ? {
            enabled: false,
            invoice_data: {
              account_tax_ids: null,
              custom_fields: null,
              description: null,
              footer: null,
              issuer: null,
              metadata: {},
              rendering_options: null,
            },
          }
        : null,
    livemode: false,
    locale: input.locale,
    managed_payments: null,
    metadata: input.metadata,
    mode: input.mode,
    origin_context: null,
    payment_intent: null,
    payment_link: null,
    payment_method_collection: input.mode === "subscription" ? "always" : null,
    payment_method_configuration_details: null,
    payment_method_options: { card: { request_three_d_secure: "automatic" } },
    payment_method_types: ["card"],
    payment_status: "unpaid",
    permissions: null,
    phone_number_collection: { enabled: false },
    recovered_from: null,
    saved_payment_method_options: null,
    setup_intent: null,
    shipping_address_collection: null,
    shipping_cost: null,
    shipping_options: [],
    status: "open",
    submit_type: input.submitType,
    subscription: null,
    success_url: input.successUrl,
    total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
    ui_mode: "hosted",
    url: input.url,
    wallet_options: null,
  };
}

export interface CardDetails {
  brand: "visa";
  last4: string;
  expMonth: number;
  expYear: number;
  fingerprint: string;
  country: string;
  funding: "credit" | "debit";
}

export function paymentMethod(input: { now: number; card: CardDetails; name: string | null; email: string | null; customer: string | null }): Stripe.PaymentMethod {
  return {
    id: newId("pm"),
    object: "payment_method",
    allow_redisplay: "limited",
    billing_details: { address: null, email: input.email, name: input.name, phone: null, tax_id: null },
    card: {
      brand: input.card.brand,
      checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: "pass" },
      country: input.card.country,
      display_brand: input.card.brand,
      exp_month: input.card.expMonth,
      exp_year: input.card.expYear,
      fingerprint: input.card.fingerprint,
      funding: input.card.funding,
      generated_from: null,
      last4: input.card.last4,
      networks: { available: [input.card.brand], preferred: null },
      regulated_status: "unregulated",
      three_d_secure_usage: { supported: true },
      wallet: null,
    },
    created: input.now,
    customer: input.customer,
    customer_account: null,
    livemode: false,
    metadata: {},
    type: "card",
  };
}

export function paymentIntent(input: {
  now: number;
  amount: number;
  currency: string;
  customer: string | null;
  description: string | null;
  metadata: Metadata;
  receiptEmail: string | null;
}): Stripe.PaymentIntent {
  const id = newId("pi");
  return {
    id,
    object: "payment_intent",
    allowed_payment_method_types: null,
    amount: input.amount,
    amount_capturable: 0,
    amount_details: { tip: {} },
    amount_received: 0,
    application: null,
    application_fee_amount: null,
    automatic_payment_methods: null,
    canceled_at: null,
    cancellation_reason: null,
    capture_method: "automatic_async",
    client_secret: `${id}_secret_${newId("req").slice(4)}`,
    confirmation_method: "automatic",
    created: input.now,
    currency: input.currency,
    customer: input.customer,
    customer_account: null,
    description: input.description,
    excluded_payment_method_types: null,
    last_payment_error: null,
    latest_charge: null,
    livemode: false,
    managed_payments: null,
    metadata: input.metadata,
    next_action: null,
    on_behalf_of: null,
    payment_method: null,
    payment_method_configuration_details: null,
    payment_method_options: {
      card: { installments: null, mandate_options: null, network: null, request_three_d_secure: "automatic" },
    },
    payment_method_types: ["card"],
    payment_record: null,
    processing: null,
    receipt_email: input.receiptEmail,
    review: null,
    setup_future_usage: null,
    shipping: null,
    source: null,
    statement_descriptor: null,
    statement_descriptor_suffix: null,
    status: "requires_payment_method",
    transfer_data: null,
    transfer_group: null,
  };
}

export interface ChargeFailure {
  code: string;
  declineCode: string;
  message: string;
  sellerMessage: string;
}

export function charge(input: {
  now: number;
  paymentIntent: Stripe.PaymentIntent;
  paymentMethod: Stripe.PaymentMethod;
  failure: ChargeFailure | null;
  receiptUrlBase: string;
}): Stripe.Charge {
  const { paymentIntent: intent, paymentMethod: method, failure } = input;
  const card = method.card!;
  const id = newId("ch");
  return {
    id,
    object: "charge",
    amount: intent.amount,
    amount_captured: failure ? 0 : intent.amount,
    amount_refunded: 0,
    application: null,
    application_fee: null,
    application_fee_amount: null,
    balance_transaction: failure ? null : `txn_${id.slice(3)}`,
    billing_details: method.billing_details,
    calculated_statement_descriptor: "PROOFBAY TEST",
    captured: !failure,
    created: input.now,
    currency: intent.currency,
    customer: typeof intent.customer === "string" ? intent.customer : null,
    description: intent.description,
    disputed: false,
    failure_balance_transaction: null,
    failure_code: failure?.code ?? null,
    failure_message: failure?.message ?? null,
    fraud_details: {},
    livemode: false,
    metadata: intent.metadata,
    on_behalf_of: null,
    outcome: failure
      ? {
          advice_code: "try_again_later",
          network_advice_code: null,
          network_decline_code: null,
          network_status: "declined_by_network",
          reason: failure.declineCode,
          risk_level: "normal",
          seller_message: failure.sellerMessage,
          type: "issuer_declined",
        }
      : {
          advice_code: null,
          network_advice_code: null,
          network_decline_code: null,
          network_status: "approved_by_network",
          reason: null,
          risk_level: "normal",
          seller_message: "Payment complete.",
          type: "authorized",
        },
    paid: !failure,
    payment_intent: intent.id,
    payment_method: method.id,
    payment_method_details: {
      type: "card",
      card: {
        amount_authorized: failure ? null : intent.amount,
        authorization_code: failure ? null : "123456",
        brand: card.brand,
        checks: card.checks,
        country: card.country,
        electronic_commerce_indicator: null,
        exp_month: card.exp_month,
        exp_year: card.exp_year,
        fingerprint: card.fingerprint ?? null,
        funding: card.funding,
        installments: null,
        last4: card.last4,
        mandate: null,
        network: card.brand,
        network_transaction_id: failure ? null : "1234567890",
        regulated_status: "unregulated",
        three_d_secure: null,
        transaction_link_id: null,
        wallet: null,
      },
    },
    receipt_email: intent.receipt_email,
    receipt_number: null,
    receipt_url: failure ? null : `${input.receiptUrlBase}/receipts/${id}`,
    refunded: false,
    review: null,
    shipping: null,
    source: null,
    source_transfer: null,
    statement_descriptor: null,
    statement_descriptor_suffix: null,
    status: failure ? "failed" : "succeeded",
    transfer_data: null,
    transfer_group: null,
  };
}

export function refund(input: {
  now: number;
  charge: Stripe.Charge;
  amount: number;
  metadata: Metadata;
  reason: Stripe.Refund.Reason | null;
}): Stripe.Refund {
  const id = newId("re");
  return {
    id,
    object: "refund",
    amount: input.amount,
    balance_transaction: `txn_${id.slice(3)}`,
    charge: input.charge.id,
    created: input.now,
    currency: input.charge.currency,
    customer: typeof input.charge.customer === "string" ? input.charge.customer : null,
    customer_account: null,
    destination_details: { type: "card", card: { reference_status: "pending", reference_type: "acquirer_reference_number", type: "refund" } },
    metadata: input.metadata,
    payment_intent: typeof input.charge.payment_intent === "string" ? input.charge.payment_intent : null,
    payment_method: input.charge.payment_method,
    reason: input.reason,
    receipt_number: null,
    source_transfer_reversal: null,
    // Card refunds in test mode succeed at once.
    status: "succeeded",
    transfer_reversal: null,
  };
}

export function plan(price: Stripe.Price): Stripe.Plan {
  const recurring = price.recurring!;
  return {
    id: price.id,
    object: "plan",
    active: price.active,
    amount: price.unit_amount,
    amount_decimal: price.unit_amount_decimal,
    billing_scheme: "per_unit",
    created: price.created,
    currency: price.currency,
    interval: recurring.interval,
    interval_count: recurring.interval_count,
    livemode: false,
    metadata: price.metadata,
    meter: null,
    nickname: price.nickname,
    product: typeof price.product === "string" ? price.product : price.product.id,
    tiers_mode: null,
    transform_usage: null,
    trial_period_days: null,
    usage_type: "licensed",
  };
}

export function subscriptionItem(input: { now: number; subscription: string; price: Stripe.Price; quantity: number; periodStart: number; periodEnd: number; metadata: Metadata }): Stripe.SubscriptionItem {
  return {
    id: newId("si"),
    object: "subscription_item",
    billing_thresholds: null,
    created: input.now,
    current_period_end: input.periodEnd,
    current_period_start: input.periodStart,
    current_trial: null,
    discounts: [],
    metadata: input.metadata,
    plan: plan(input.price),
    price: input.price,
    quantity: input.quantity,
    subscription: input.subscription,
    tax_rates: [],
  };
}

export function subscription(input: {
  now: number;
  id: string;
  customer: string;
  currency: string;
  items: Stripe.SubscriptionItem[];
  defaultPaymentMethod: string | null;
  description: string | null;
  metadata: Metadata;
}): Stripe.Subscription {
  return {
    id: input.id,
    object: "subscription",
    application: null,
    application_fee_percent: null,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null },
    billing_cycle_anchor: input.now,
    billing_cycle_anchor_config: null,
    billing_mode: { flexible: null, type: "classic" },
    billing_schedules: [],
    billing_thresholds: null,
    cancel_at: null,
    cancel_at_period_end: false,
    canceled_at: null,
    cancellation_details: { comment: null, feedback: null, feedback_option: null, reason: null },
    collection_method: "charge_automatically",
    created: input.now,
    currency: input.currency,
    customer: input.customer,
    customer_account: null,
    days_until_due: null,
    default_payment_method: input.defaultPaymentMethod,
    default_source: null,
    default_tax_rates: [],
    description: input.description,
    discounts: [],
    ended_at: null,
    invoice_settings: { account_tax_ids: null, custom_fields: null, description: null, footer: null, issuer: { type: "self" } },
    items: apiList(input.items, `/v1/subscription_items?subscription=${input.id}`),
    latest_invoice: null,
    livemode: false,
    managed_payments: null,
    metadata: input.metadata,
    next_pending_invoice_item_invoice: null,
    on_behalf_of: null,
    pause_collection: null,
    payment_settings: { payment_method_options: null, payment_method_types: null, save_default_payment_method: "off" },
    pending_invoice_item_interval: null,
    pending_setup_intent: null,
    pending_update: null,
    schedule: null,
    start_date: input.now,
    status: "incomplete",
    test_clock: null,
    transfer_data: null,
    trial_end: null,
    trial_settings: { end_behavior: { billing_cycle_anchor: null, missing_payment_method: "create_invoice" } },
    trial_start: null,
  };
}

export function invoice(input: {
  now: number;
  subscription: Stripe.Subscription;
  customer: Stripe.Customer;
  billingReason: Stripe.Invoice.BillingReason;
  number: string;
  /** The invoice's own period: for a renewal the one that just ended; for the first invoice, the start instant. */
  periodStart: number;
  periodEnd: number;
  hostedUrlBase: string;
}): Stripe.Invoice {
  const id = newId("in");
  const sub = input.subscription;
  const lines: Stripe.InvoiceLineItem[] = sub.items.data.map((item) => {
    const amount = (item.price.unit_amount ?? 0) * (item.quantity ?? 1);
    return {
      id: newId("il"),
      object: "line_item",
      amount,
      currency: item.price.currency,
      description: `${item.quantity ?? 1} × ${item.price.nickname ?? "subscription"} (at ${item.price.unit_amount ?? 0} / ${item.price.recurring?.interval ?? "month"})`,
      discount_amounts: [],
      discountable: true,
      discounts: [],
      invoice: id,
      livemode: false,
      metadata: sub.metadata,
      parent: {
        invoice_item_details: null,
        subscription_item_details: { invoice_item: null, proration: false, proration_details: { credited_items: null }, subscription: sub.id, subscription_item: item.id },
        type: "subscription_item_details",
      },
      period: { start: item.current_period_start, end: item.current_period_end },
      pretax_credit_amounts: [],
      pricing: { price_details: { price: item.price.id, product: typeof item.price.product === "string" ? item.price.product : item.price.product.id }, type: "price_details", unit_amount_decimal: item.price.unit_amount_decimal },
      quantity: item.quantity ?? 1,
      quantity_decimal: wireDecimal(item.quantity ?? 1),
      subscription: sub.id,
      subtotal: amount,
      taxes: [],
    };
  });
  const total = lines.reduce((sum, line) => sum + line.amount, 0);
  return {
    id,
    object: "invoice",
    account_country: "NZ",
    account_name: "Proofbay (test)",
    account_tax_ids: null,
    amount_due: total,
    amount_overpaid: 0,
    amount_paid: 0,
    amount_remaining: total,
    amount_shipping: 0,
    application: null,
    attempt_count: 0,
    attempted: false,
    auto_advance: true,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
    automatically_finalizes_at: null,
    billing_reason: input.billingReason,
    collection_method: "charge_automatically",
    created: input.now,
    currency: sub.currency,
    custom_fields: null,
    customer: input.customer.id,
    customer_account: null,
    customer_address: null,
    customer_email: input.customer.email,
    customer_name: input.customer.name ?? null,
    customer_phone: null,
    customer_shipping: null,
    customer_tax_exempt: "none",
    customer_tax_ids: [],
    default_payment_method: null,
    default_source: null,
    default_tax_rates: [],
    description: null,
    discounts: [],
    due_date: null,
    effective_at: null,
    ending_balance: null,
    footer: null,
    from_invoice: null,
    hosted_invoice_url: `${input.hostedUrlBase}/invoices/${id}`,
    invoice_pdf: null,
    issuer: { type: "self" },
    last_finalization_error: null,
    latest_revision: null,
    lines: apiList(lines, `/v1/invoices/${id}/lines`),
    livemode: false,
    metadata: {},
    next_payment_attempt: null,
    number: input.number,
    on_behalf_of: null,
    parent: {
      quote_details: null,
      subscription_details: { metadata: sub.metadata, subscription: sub.id },
      type: "subscription_details",
    },
    payment_settings: { default_mandate: null, payment_method_options: null, payment_method_types: null },
    period_end: input.periodEnd,
    period_start: input.periodStart,
    post_payment_credit_notes_amount: 0,
    pre_payment_credit_notes_amount: 0,
    receipt_number: null,
    rendering: null,
    shipping_cost: null,
    shipping_details: null,
    starting_balance: 0,
    statement_descriptor: null,
    status: "draft",
    status_transitions: { finalized_at: null, marked_uncollectible_at: null, paid_at: null, voided_at: null },
    subtotal: total,
    subtotal_excluding_tax: total,
    test_clock: null,
    total,
    total_discount_amounts: [],
    total_excluding_tax: total,
    total_pretax_credit_amounts: [],
    total_taxes: [],
    webhooks_delivered_at: null,
  };
}

export function invoicePayment(input: { now: number; invoice: Stripe.Invoice; paymentIntent: Stripe.PaymentIntent }): Stripe.InvoicePayment {
  const paid = input.paymentIntent.status === "succeeded";
  return {
    id: newId("inpay"),
    object: "invoice_payment",
    amount_paid: paid ? input.paymentIntent.amount : null,
    amount_requested: input.paymentIntent.amount,
    created: input.now,
    currency: input.invoice.currency,
    invoice: input.invoice.id,
    is_default: true,
    livemode: false,
    payment: { payment_intent: input.paymentIntent.id, type: "payment_intent" },
    status: paid ? "paid" : "open",
    status_transitions: { canceled_at: null, paid_at: paid ? input.now : null },
  };
}

function randomInvoicePrefix(): string {
  return newId("req").slice(4, 12).toUpperCase().replace(/[^A-Z0-9]/g, "A");
}
