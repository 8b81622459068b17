import "server-only";
import Stripe from "stripe";
import { env } from "@/lib/env";

const cache = globalThis as unknown as { proofbayStripe?: Stripe };

/**
 * The Stripe SDK client. With STRIPE_API_URL set (the demo and tests: the local fake) requests go
 * there; unset, to Stripe itself — real keys are configuration only.
 */
export function getStripe(): Stripe {
  if (!cache.proofbayStripe) {
    const target = env.stripe.apiUrl ? new URL(env.stripe.apiUrl) : undefined;
    cache.proofbayStripe = new Stripe(env.stripe.secretKey, {
      telemetry: false,
      maxNetworkRetries: 2,
      ...(target
        ? {
            host: target.hostname,
            port: Number(target.port || (target.protocol === "https:" ? 443 : 80)),
            protocol: target.protocol === "https:" ? "https" : "http",
          }
        : {}),
    });
  }
  return cache.proofbayStripe;
}

export type ProcessorError = Error & { type: string; statusCode?: number; code?: string };

/**
 * The SDK's errors by shape rather than `instanceof`: the bundler can load the SDK more than once
 * (one copy per server chunk), and an error made by one copy is not an instance of another's class.
 * Every SDK error carries its class name in `type` (e.g. `StripeInvalidRequestError`).
 */
export function asProcessorError(error: unknown): ProcessorError | null {
  if (!(error instanceof Error)) return null;
  const type = (error as { type?: unknown }).type;
  return typeof type === "string" && type.startsWith("Stripe") ? (error as ProcessorError) : null;
}
