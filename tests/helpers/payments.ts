// The local payments stand-in's inspection and fault routes, for the filing-fee tests.
const PAYMENTS_URL = process.env.PAYMENTS_STANDIN_URL ?? "http://127.0.0.1:3045";

export interface StandInSession {
  id: string;
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  amount_total: number;
  currency: string;
  url: string | null;
  success_url: string;
  cancel_url: string;
  client_reference_id: string | null;
  customer_email: string | null;
  metadata: Record<string, string>;
  payment_intent: string | null;
  line_items: { description: string; unit_amount: number; quantity: number; currency: string }[];
}

export interface StandInDelivery {
  eventId: string;
  signature: string;
  status: number | null;
  body: string;
}

async function call<T>(method: string, path: string, body?: unknown): Promise<T> {
  const response = await fetch(`${PAYMENTS_URL}${path}`, { method, headers: body === undefined ? {} : { "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
  const text = await response.text();
  if (!response.ok) throw new Error(`${method} ${path}: ${response.status} ${text}`);
  return JSON.parse(text) as T;
}

export const standInUrl = (path = "") => `${PAYMENTS_URL}${path}`;

export function sessionIdFromUrl(url: string): string {
  const match = /\/checkout\/([^/?#]+)/.exec(url);
  if (!match) throw new Error(`Not a stand-in checkout URL: ${url}`);
  return decodeURIComponent(match[1]!);
}

export const getStandInSession = (id: string) => call<StandInSession>("GET", `/_sessions/${encodeURIComponent(id)}`);

/** Pays as the Pay button does; "sync" waits for the app's answer to the webhook. */
export const payStandInSession = (id: string, deliver: "sync" | "none" = "sync") =>
  call<{ session: StandInSession; eventId: string; delivery: StandInDelivery | null; redirect: string }>("POST", `/_sessions/${encodeURIComponent(id)}/pay`, { deliver });

/** This session's webhooks are kept back until the test sends them with replayWebhook. */
export const holdStandInWebhooks = (id: string) => call<{ held: string }>("POST", `/_sessions/${encodeURIComponent(id)}/hold`);

export const replayWebhook = (eventId: string, copies = 1) => call<{ eventId: string; results: StandInDelivery[] }>("POST", "/_webhooks/replay", { eventId, copies });

export const sendBadlySignedWebhook = (eventId: string, mode: "wrong_secret" | "tampered_payload" | "missing" | "stale" = "wrong_secret") =>
  call<{ eventId: string; result: StandInDelivery }>("POST", "/_webhooks/bad-signature", { eventId, mode });

export const listStandInEvents = (type?: string) => call<{ data: { id: string; type: string; data: { object: Record<string, unknown> } }[]; deliveries: StandInDelivery[] }>("GET", `/_events${type ? `?type=${encodeURIComponent(type)}` : ""}`);

export const controlStandIn = (settings: { webhookMode?: "auto" | "hold"; webhookDelayMs?: number; failRefunds?: number; failApiCalls?: number }) => call<Record<string, unknown>>("POST", "/_control", settings);

/** Waits until the stand-in has delivered an event of this type about this object and the app answered 2xx. */
export async function waitForDelivered(type: string, objectId: string, timeoutMs = 15_000): Promise<string> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const { data, deliveries } = await listStandInEvents(type);
    const event = data.find((e) => e.data.object.id === objectId);
    if (event && deliveries.some((d) => d.eventId === event.id && d.status !== null && d.status >= 200 && d.status < 300)) return event.id;
    if (Date.now() > deadline) throw new Error(`No delivered ${type} for ${objectId} within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 150));
  }
}

/** Waits until the stand-in has no webhook delivery under way (before counting rows). */
export async function waitForStandInIdle(timeoutMs = 15_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const health = await call<{ deliveriesInFlight: number }>("GET", "/health");
    if (health.deliveriesInFlight === 0) return;
    if (Date.now() > deadline) throw new Error("The payments stand-in kept delivering webhooks");
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** Polls until `check` returns a value (for effects that follow an asynchronous webhook). */
export async function eventually<T>(check: () => Promise<T | null | undefined | false>, what: string, timeoutMs = 15_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`Timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 150));
  }
}
