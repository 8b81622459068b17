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
