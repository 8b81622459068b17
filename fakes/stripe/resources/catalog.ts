import type Stripe from "stripe";
import type { Engine, RequestContext } from "../engine";
import { StripeApiError, invalidRequest, missingParam } from "../errors";
import * as build from "../objects";
import { PAGINATION_PARAMS, Params, applyMetadata, pagination, rangeFilter } from "../params";

// Parameter names Stripe accepts on these endpoints (from the SDK's *Params types) that the fake
// takes without acting on them.
const CUSTOMER_IGNORED = ["address", "balance", "business_name", "cash_balance", "individual_name", "invoice_prefix", "invoice_settings", "next_invoice_sequence", "payment_method", "preferred_locales", "shipping", "source", "tax", "tax_exempt", "tax_id_data", "test_clock", "validate", "default_source"];
const PRODUCT_IGNORED = ["marketing_features", "package_dimensions", "shippable", "statement_descriptor", "tax_code", "tax_details", "type"];
const PRICE_IGNORED = ["billing_scheme", "currency_options", "tiers", "tiers_mode", "transform_quantity"];

export function createCustomer(engine: Engine, params: Params, request: RequestContext): Stripe.Customer {
  params.allow(["email", "name", "description", "phone", "metadata", "expand"], ignoring(engine, CUSTOMER_IGNORED));
  const email = optionalEmail(params, "email");
  const customer = build.customer({
    now: engine.now(),
    email,
    name: params.str("name") || null,
    description: params.str("description") || null,
    phone: params.str("phone") || null,
    metadata: params.metadata()?.value ?? {},
  });
  engine.put("customer", customer);
  engine.emit("customer.created", customer, request);
  return customer;
}

/** A customer made by Checkout for the person who paid. */
export function newCustomer(engine: Engine, input: { email: string; name: string | null }, request: RequestContext): Stripe.Customer {
  const customer = build.customer({ now: engine.now(), email: input.email, name: input.name, description: null, phone: null, metadata: {} });
  engine.put("customer", customer);
  engine.emit("customer.created", customer, request);
  return customer;
}

export function updateCustomer(engine: Engine, id: string, params: Params, request: RequestContext): Stripe.Customer {
  params.allow(["email", "name", "description", "phone", "metadata", "expand"], ignoring(engine, CUSTOMER_IGNORED));
  const customer = engine.require("customer", id, { param: "id", status: 404 });
  return engine.update("customer", customer, "customer.updated", request, (target) => {
    if (params.has("email")) target.email = optionalEmail(params, "email");
    if (params.has("name")) target.name = params.str("name") || null;
    if (params.has("description")) target.description = params.str("description") || null;
    if (params.has("phone")) target.phone = params.str("phone") || null;
    target.metadata = applyMetadata(target.metadata, params.metadata());
  });
}

export function listCustomers(engine: Engine, params: Params): Stripe.ApiList<Stripe.Customer> {
  params.allow([...PAGINATION_PARAMS, "email", "created"], ignoring(engine, ["test_clock"]));
  const email = params.str("email");
  const created = rangeFilter(params, "created");
  const items = engine.newestFirst("customer", (c) => (email === undefined || c.email === email) && (!created || created(c.created)));
  return engine.list(items, pagination(params), "/v1/customers");
}

export function createProduct(engine: Engine, params: Params, request: RequestContext): Stripe.Product {
  params.allow(["name", "id", "active", "description", "images", "metadata", "url", "unit_label", "default_price_data", "expand"], ignoring(engine, PRODUCT_IGNORED));
  const name = params.requiredStr("name");
  const id = params.str("id") || undefined;
  if (id && engine.get("product", id)) {
    throw new StripeApiError(400, { message: `Product already exists.`, param: "id", code: "resource_already_exists" });
  }
  const product = build.product({
    now: engine.now(),
    ...(id ? { id } : {}),
    name,
    description: params.str("description") || null,
    active: params.bool("active") ?? true,
    images: params.strings("images"),
    metadata: params.metadata()?.value ?? {},
    url: params.str("url") || null,
    unitLabel: params.str("unit_label") || null,
  });
  engine.put("product", product);
  engine.emit("product.created", product, request);

  const defaultPriceData = params.obj("default_price_data");
  if (defaultPriceData) {
    defaultPriceData.allow(["currency", "unit_amount", "unit_amount_decimal", "recurring", "tax_behavior", "metadata"], ignoring(engine, ["currency_options", "custom_unit_amount"]));
    const price = storePrice(engine, defaultPriceData, product.id, true, request);
    engine.update("product", product, null, request, (target) => {
      target.default_price = price.id;
    });
  }
  return product;
}

export function updateProduct(engine: Engine, id: string, params: Params, request: RequestContext): Stripe.Product {
  params.allow(["name", "active", "description", "images", "metadata", "url", "unit_label", "default_price", "expand"], ignoring(engine, PRODUCT_IGNORED));
  const product = engine.require("product", id, { param: "id", status: 404 });
  const defaultPrice = params.str("default_price");
  if (defaultPrice) {
    const price = engine.require("price", defaultPrice, { param: "default_price", status: 400 });
    if (price.product !== product.id) throw invalidRequest(`The price \`${price.id}\` does not belong to this product.`, "default_price");
  }
  return engine.update("product", product, "product.updated", request, (target) => {
    if (params.has("name")) target.name = params.requiredStr("name");
    if (params.has("active")) target.active = params.bool("active") ?? target.active;
    if (params.has("description")) target.description = params.str("description") || null;
    if (params.has("images")) target.images = params.strings("images");
    if (params.has("url")) target.url = params.str("url") || null;
    if (params.has("unit_label")) target.unit_label = params.str("unit_label") || null;
    if (params.has("default_price")) target.default_price = defaultPrice || null;
    target.metadata = applyMetadata(target.metadata, params.metadata());
    target.updated = engine.now();
  });
}

export function listProducts(engine: Engine, params: Params): Stripe.ApiList<Stripe.Product> {
  params.allow([...PAGINATION_PARAMS, "active", "ids", "created", "url"], ignoring(engine, ["shippable", "type"]));
  const active = params.bool("active");
  const ids = params.strings("ids");
  const created = rangeFilter(params, "created");
  const url = params.str("url");
  const items = engine.newestFirst(
    "product",
    (p) => (active === undefined || p.active === active) && (ids.length === 0 || ids.includes(p.id)) && (!created || created(p.created)) && (url === undefined || p.url === url),
  );
  return engine.list(items, pagination(params), "/v1/products");
}

export function createPrice(engine: Engine, params: Params, request: RequestContext): Stripe.Price {
  params.allow(
    ["currency", "unit_amount", "unit_amount_decimal", "product", "product_data", "recurring", "lookup_key", "transfer_lookup_key", "nickname", "metadata", "active", "tax_behavior", "custom_unit_amount", "expand"],
    ignoring(engine, PRICE_IGNORED),
  );
  if (params.has("custom_unit_amount")) throw unsupported("custom_unit_amount");
  const productId = params.str("product");
  const productData = params.obj("product_data");
  if (productId && productData) throw invalidRequest("You may only specify one of these parameters: product, product_data.", "product");
  let product: string;
  if (productData) product = inlineProduct(engine, productData, request, true).id;
  else if (productId) product = engine.require("product", productId, { param: "product", status: 400 }).id;
  else throw missingParam("product");
  return storePrice(engine, params, product, params.bool("active") ?? true, request);
}

export function updatePrice(engine: Engine, id: string, params: Params, request: RequestContext): Stripe.Price {
  params.allow(["active", "lookup_key", "transfer_lookup_key", "nickname", "metadata", "tax_behavior", "expand"], ignoring(engine, ["currency_options"]));
  const price = engine.require("price", id, { param: "id", status: 404 });
  const lookupKey = params.has("lookup_key") ? params.str("lookup_key") || null : price.lookup_key;
  if (lookupKey && lookupKey !== price.lookup_key) claimLookupKey(engine, lookupKey, params.bool("transfer_lookup_key") ?? false, request);
  return engine.update("price", price, "price.updated", request, (target) => {
    if (params.has("active")) target.active = params.bool("active") ?? target.active;
    if (params.has("nickname")) target.nickname = params.str("nickname") || null;
    target.lookup_key = lookupKey;
    target.metadata = applyMetadata(target.metadata, params.metadata());
  });
}

export function listPrices(engine: Engine, params: Params): Stripe.ApiList<Stripe.Price> {
  params.allow([...PAGINATION_PARAMS, "active", "currency", "product", "type", "lookup_keys", "created", "recurring"]);
  const active = params.bool("active");
  const currency = params.str("currency")?.toLowerCase();
  const product = params.str("product");
  const type = params.oneOf("type", ["one_time", "recurring"] as const);
  const lookupKeys = params.strings("lookup_keys");
  if (lookupKeys.length > 10) throw invalidRequest("You may pass at most 10 lookup keys.", "lookup_keys");
  const created = rangeFilter(params, "created");
  const recurring = params.obj("recurring")?.allow(["interval", "meter", "usage_type"]);
  const interval = recurring?.str("interval");
  const items = engine.newestFirst(
    "price",
    (p) =>
      (active === undefined || p.active === active) &&
      (currency === undefined || p.currency === currency) &&
      (product === undefined || p.product === product) &&
      (type === undefined || p.type === type) &&
      (lookupKeys.length === 0 || (p.lookup_key !== null && lookupKeys.includes(p.lookup_key))) &&
      (!created || created(p.created)) &&
      (interval === undefined || p.recurring?.interval === interval),
  );
  return engine.list(items, pagination(params), "/v1/prices");
}

/** Creates a price for `product` from `currency`, `unit_amount` and `recurring` (shared by prices, product defaults and line items). */
export function storePrice(engine: Engine, params: Params, product: string, active: boolean, request: RequestContext | null): Stripe.Price {
  const currency = readCurrency(params);
  const unitAmount = readUnitAmount(params);
  const recurring = readRecurring(params);
  const lookupKey = params.str("lookup_key") || null;
  if (lookupKey && request) claimLookupKey(engine, lookupKey, params.bool("transfer_lookup_key") ?? false, request);
  const price = build.price({
    now: engine.now(),
    product,
    currency,
    unitAmount,
    recurring,
    active,
    lookupKey,
    nickname: params.str("nickname") || null,
    metadata: params.metadata()?.value ?? {},
    taxBehavior: params.oneOf("tax_behavior", ["exclusive", "inclusive", "unspecified"] as const) ?? null,
  });
  engine.put("price", price);
  // Inline prices from `price_data` are not announced by events; prices made through the API are.
  if (request) engine.emit("price.created", price, request);
  return price;
}

/** A product from `product_data` (inline: line items, prices). */
export function inlineProduct(engine: Engine, params: Params, request: RequestContext | null, announce: boolean): Stripe.Product {
  params.allow(["name", "description", "images", "metadata", "unit_label", "id", "active"], ignoring(engine, ["tax_code", "statement_descriptor", "tax_details"]));
  const product = build.product({
    now: engine.now(),
    ...(params.str("id") ? { id: params.str("id")! } : {}),
    name: params.requiredStr("name"),
    description: params.str("description") || null,
    active: params.bool("active") ?? true,
    images: params.strings("images"),
    metadata: params.metadata()?.value ?? {},
    url: null,
    unitLabel: params.str("unit_label") || null,
  });
  engine.put("product", product);
  if (announce && request) engine.emit("product.created", product, request);
  return product;
}

export function readCurrency(params: Params): string {
  const raw = params.requiredStr("currency");
  const currency = raw.toLowerCase();
  if (!/^[a-z]{3}$/.test(currency) || !SUPPORTED_CURRENCIES.has(currency)) {
    throw invalidRequest(`Invalid currency: ${raw}. Stripe currently supports these currencies: ${[...SUPPORTED_CURRENCIES].slice(0, 12).join(", ")}, …`, params.name("currency"));
  }
  return currency;
}

function readUnitAmount(params: Params): number {
  const unitAmount = params.int("unit_amount", { min: 0, max: 99_999_999 });
  if (unitAmount !== undefined) return unitAmount;
  const decimal = params.str("unit_amount_decimal");
  if (decimal !== undefined && decimal !== "") {
    if (!/^\d+$/.test(decimal)) throw unsupported(params.name("unit_amount_decimal"), "fractional unit amounts");
    return Number(decimal);
  }
  throw missingParam(params.name("unit_amount"));
}

function readRecurring(params: Params): build.RecurringInput | null {
  const recurring = params.obj("recurring");
  if (!recurring) return null;
  recurring.allow(["interval", "interval_count"], { ignored: ["meter", "usage_type", "trial_period_days", "aggregate_usage"] });
  const interval = recurring.oneOf("interval", ["day", "week", "month", "year"] as const);
  if (!interval) throw missingParam(recurring.name("interval"));
  const intervalCount = recurring.int("interval_count", { min: 1 }) ?? 1;
  // Stripe's limit: at most one year between billings.
  const maxCount = { day: 365, week: 52, month: 12, year: 1 }[interval];
  if (intervalCount > maxCount) {
    throw invalidRequest("The maximum billing frequency is one year (1 year, 12 months, 52 weeks or 365 days).", recurring.name("interval_count"));
  }
  return { interval, intervalCount };
}

function claimLookupKey(engine: Engine, lookupKey: string, transfer: boolean, request: RequestContext): void {
  const holder = engine.store.all("price").find((p) => p.lookup_key === lookupKey);
  if (!holder) return;
  if (!transfer) {
    throw invalidRequest(`A price (\`${holder.id}\`) already uses that lookup key.`, "lookup_key", "lookup_key_exists");
  }
  engine.update("price", holder, "price.updated", request, (target) => {
    target.lookup_key = null;
  });
}

function optionalEmail(params: Params, key: string): string | null {
  const email = params.str(key);
  if (email === undefined || email === "") return null;
  if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) throw invalidRequest(`Invalid email address: ${email}`, params.name(key), "email_invalid");
  return email;
}

export function ignoring(engine: Engine, ignored: readonly string[]) {
  return {
    ignored,
    onIgnored: (param: string) => engine.warnOnce(`Accepted but not modelled by the fake: ${param}`),
  };
}

/** A parameter Stripe accepts whose effect the fake cannot reproduce; refusing beats pretending. */
export function unsupported(param: string, what = `the parameter \`${param}\``): StripeApiError {
  return new StripeApiError(400, {
    message: `The local Stripe fake does not support ${what}. Extend fakes/stripe or test this against Stripe's test mode.`,
    param,
    code: "fake_unsupported",
  });
}

const SUPPORTED_CURRENCIES = new Set(Intl.supportedValuesOf("currency").map((code) => code.toLowerCase()));
