import "server-only";
import Stripe from "stripe";
import { getEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";

let client: Stripe | undefined;
let clientFor = "";

/**
 * The Stripe SDK, created lazily so tests can configure it first, and the only code that reads
 * the payment keys. With STRIPE_API_URL set (development and tests) every call goes to the
 * local stand-in through the SDK's host/port/protocol options; unset means the hosted service.
 */
export function getPaymentsClient(): Stripe {
  const env = getEnv();
  const key = `${env.STRIPE_SECRET_KEY}|${env.STRIPE_API_URL ?? ""}`;
  if (!client || clientFor !== key) {
    const base = env.STRIPE_API_URL ? new URL(env.STRIPE_API_URL) : null;
    const protocol = base?.protocol === "https:" ? "https" : "http";
    client = new Stripe(env.STRIPE_SECRET_KEY, {
      ...(base ? { host: base.hostname, port: base.port || (protocol === "https" ? 443 : 80), protocol } : {}),
      // The SDK retries with an idempotency key of its own; every create call also passes ours.
      maxNetworkRetries: 2,
      timeout: 20_000,
      telemetry: false,
      appInfo: { name: "Zoneward" },
    });
    clientFor = key;
  }
  return client;
}

/** True when payments go to the local stand-in (no money moves). */
export function isPaymentsStandIn(): boolean {
  return Boolean(getEnv().STRIPE_API_URL);
}

export class WebhookSignatureError extends AppError {
  constructor() {
    super("The webhook signature could not be verified.", 400, "bad_signature");
  }
}

/**
 * Verifies a webhook with the SDK against the raw body (a re-serialised body would not match
 * the signature) and the configured signing secret; throws WebhookSignatureError otherwise.
 */
export function constructPaymentEvent(rawBody: string, signature: string | null): Stripe.Event {
  if (!signature) throw new WebhookSignatureError();
  try {
    return getPaymentsClient().webhooks.constructEvent(rawBody, signature, getEnv().STRIPE_WEBHOOK_SECRET);
  } catch (error) {
    if (error instanceof Stripe.errors.StripeSignatureVerificationError) throw new WebhookSignatureError();
    throw error;
  }
}

/**
 * The payments service refused or could not be reached: a clear message, never its internals.
 * A refusal of our request (4xx) is a 409 for the user (state disagrees), an outage a 503.
 */
export function paymentServiceError(error: unknown, whatFailed: string): AppError {
  if (error instanceof Stripe.errors.StripeError) {
    const status = error.statusCode ?? 0;
    console.error(`[payments] ${whatFailed}:`, error.type, status, error.message);
    if (status >= 400 && status < 500 && status !== 401 && status !== 429) return new AppError(`${whatFailed}: the payments service refused it (${error.message}).`, 409, "payment_refused");
  } else {
    console.error(`[payments] ${whatFailed}:`, error instanceof Error ? error.message : error);
  }
  return new AppError(`${whatFailed}: the payments service did not answer. Nothing was charged or changed; please try again in a minute.`, 503, "payments_unavailable");
}

export type { Stripe };
