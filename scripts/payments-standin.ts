// A local stand-in of the payments API that the Stripe SDK calls: Checkout Sessions (create,
// retrieve, expire), refunds, a checkout page where a person presses Pay or Cancel, and signed
// webhook deliveries to the app (Stripe-Signature: t=…,v1=HMAC-SHA256(secret, "t.payload")).
// State lives in memory and in a JSON-lines file in its directory. Inspection and fault routes
// (under /_) let tests list sessions, pay without a browser, replay a webhook or send one with a
// bad signature. Loopback only. Not part of the app; no money moves.
import { createHash, createHmac, randomBytes } from "node:crypto";
import { appendFileSync, existsSync, mkdirSync, readFileSync } from "node:fs";
import http from "node:http";
import path from "node:path";

// ---------------------------------------------------------------- arguments and state

function parseArgs() {
  const args = process.argv.slice(2);
  const get = (name: string) => {
    const i = args.indexOf(name);
    return i >= 0 ? args[i + 1] : undefined;
  };
  return {
    port: Number(get("--port") ?? 3026),
    dir: get("--dir") ?? ".data/payments",
    webhookUrl: get("--webhook-url") ?? "http://127.0.0.1:3000/api/fees/webhook",
    webhookSecret: get("--webhook-secret") ?? "whsec_local_standin",
    /** When set, API calls must carry exactly this key; otherwise any secret-looking key is accepted. */
    apiKey: get("--api-key"),
  };
}

const config = parseArgs();
mkdirSync(config.dir, { recursive: true });
const stateFile = path.join(config.dir, "state.jsonl");
const API_VERSION = "2026-10-28.endive";

interface LineItem {
  description: string;
  quantity: number;
  unit_amount: number;
  amount_total: number;
  currency: string;
}

interface Session {
  id: string;
  object: "checkout.session";
  mode: string;
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  success_url: string;
  cancel_url: string;
  client_reference_id: string | null;
  customer_email: string | null;
  metadata: Record<string, string>;
  payment_intent: string | null;
  url: string | null;
  created: number;
  expires_at: number;
  livemode: false;
  line_items: LineItem[];
}

interface PaymentIntent {
  id: string;
  object: "payment_intent";
  amount: number;
  amount_received: number;
  amount_refunded: number;
  currency: string;
  latest_charge: string;
  status: "succeeded";
  metadata: Record<string, string>;
  checkout_session: string;
  created: number;
}

interface Refund {
  id: string;
  object: "refund";
  amount: number;
  currency: string;
  payment_intent: string;
  charge: string;
  status: "pending" | "succeeded" | "failed" | "canceled";
  reason: string | null;
  failure_reason?: string;
  metadata: Record<string, string>;
  created: number;
}

interface WebhookEvent {
  id: string;
  object: "event";
  api_version: string;
  created: number;
  type: string;
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  data: { object: unknown };
}

interface Delivery {
  eventId: string;
  at: string;
  signature: string;
  status: number | null;
  body: string;
}

const sessions = new Map<string, Session>();
const intents = new Map<string, PaymentIntent>();
const refunds = new Map<string, Refund>();
const events: WebhookEvent[] = [];
const deliveries: Delivery[] = [];
const idempotent = new Map<string, { hash: string; status: number; body: unknown }>();
/** Sessions whose webhooks wait until a test sends them (POST /_sessions/:id/hold). */
const heldSessions = new Set<string>();

type Record_ = { t: "session"; v: Session } | { t: "intent"; v: PaymentIntent } | { t: "refund"; v: Refund } | { t: "event"; v: WebhookEvent } | { t: "delivery"; v: Delivery };

function persist(record: Record_): void {
  appendFileSync(stateFile, JSON.stringify(record) + "\n");
}

function loadState(): void {
  if (!existsSync(stateFile)) return;
  for (const line of readFileSync(stateFile, "utf8").split("\n")) {
    if (!line) continue;
    const record = JSON.parse(line) as Record_;
    if (record.t === "session") sessions.set(record.v.id, record.v);
    else if (record.t === "intent") intents.set(record.v.id, record.v);
    else if (record.t === "refund") refunds.set(record.v.id, record.v);
    else if (record.t === "event") events.push(record.v);
    else deliveries.push(record.v);
  }
}
loadState();

const saveSession = (s: Session) => (sessions.set(s.id, s), persist({ t: "session", v: s }));
const saveIntent = (p: PaymentIntent) => (intents.set(p.id, p), persist({ t: "intent", v: p }));
const saveRefund = (r: Refund) => (refunds.set(r.id, r), persist({ t: "refund", v: r }));

/** Behaviour switches for tests (POST /_control). */
const control = {
  /** "auto": deliver webhooks right away (with retries); "hold": only when a test asks. */
  webhookMode: "auto" as "auto" | "hold",
  webhookDelayMs: 0,
  /** The next refunds end as failed instead of succeeded. */
  failRefunds: 0,
  /** The next API calls answer 500 (the SDK sees the service down). */
  failApiCalls: 0,
};

const newId = (prefix: string) => `${prefix}_test_${randomBytes(12).toString("base64url").replace(/[-_]/g, "x")}`;
const nowSeconds = () => Math.floor(Date.now() / 1000);

// ---------------------------------------------------------------- form bodies as the SDK sends them

const forbiddenKeys = new Set(["__proto__", "constructor", "prototype"]);

/** `a[b][0][c]=v` → nested objects; objects whose keys are all indexes become arrays. */
function parseForm(body: string): Record<string, unknown> {
  const root: Record<string, unknown> = {};
  for (const pair of body.split("&")) {
    if (!pair) continue;
    const eq = pair.indexOf("=");
    const decode = (s: string) => decodeURIComponent(s.replace(/\+/g, " "));
    const key = decode(eq < 0 ? pair : pair.slice(0, eq));
    const value = eq < 0 ? "" : decode(pair.slice(eq + 1));
    const parts = key.replace(/\]$/, "").split(/\]?\[/);
    if (parts.some((p) => forbiddenKeys.has(p))) continue;
    let node: Record<string, unknown> = root;
    parts.forEach((part, i) => {
      const name = part === "" ? String(Object.keys(node).length) : part;
      if (i === parts.length - 1) node[name] = value;
      else node = (node[name] ??= {}) as Record<string, unknown>;
    });
  }
  const arrays = (value: unknown): unknown => {
    if (!value || typeof value !== "object") return value;
    const object = value as Record<string, unknown>;
    const keys = Object.keys(object);
    const converted = Object.fromEntries(keys.map((k) => [k, arrays(object[k])]));
    if (keys.length > 0 && keys.every((k, i) => k === String(i))) return keys.map((k) => converted[k]);
    return converted;
  };
  return arrays(root) as Record<string, unknown>;
}

class ApiError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly type = "invalid_request_error",
    public readonly param?: string,
    public readonly code?: string,
  ) {
    super(message);
  }
}

const integerOf = (value: unknown, param: string, min = 0): number => {
  if (typeof value !== "string" || !/^\d+$/.test(value)) throw new ApiError(400, `Invalid integer: ${typeof value === "string" ? value : JSON.stringify(value ?? "")}`, "invalid_request_error", param);
  const n = Number(value);
  if (!Number.isSafeInteger(n) || n < min) throw new ApiError(400, `This value must be greater than or equal to ${min}.`, "invalid_request_error", param);
  return n;
};

const stringMap = (value: unknown): Record<string, string> => {
  if (!value || typeof value !== "object" || Array.isArray(value)) return {};
  return Object.fromEntries(Object.entries(value as Record<string, unknown>).filter(([, v]) => typeof v === "string")) as Record<string, string>;
};

const publicSession = (s: Session) => {
  const { line_items: _items, ...rest } = s;
  void _items;
  return rest;
};

// ---------------------------------------------------------------- API operations

function createSession(params: Record<string, unknown>, origin: string): Session {
  if (params.mode !== "payment") throw new ApiError(400, "Only mode=payment is supported by this stand-in.", "invalid_request_error", "mode");
  for (const url of ["success_url", "cancel_url"] as const) {
    const value = params[url];
    if (typeof value !== "string" || !/^https?:\/\//.test(value)) throw new ApiError(400, `Not a valid URL`, "invalid_request_error", url);
  }
  const items = params.line_items;
  if (!Array.isArray(items) || items.length === 0) throw new ApiError(400, "line_items is required in payment mode.", "invalid_request_error", "line_items");
  if (items.length > 100) throw new ApiError(400, "A Checkout Session takes at most 100 line items.", "invalid_request_error", "line_items");
  const lines: LineItem[] = items.map((raw, i) => {
    const item = (raw ?? {}) as Record<string, unknown>;
    const price = (item.price_data ?? {}) as Record<string, unknown>;
    const product = (price.product_data ?? {}) as Record<string, unknown>;
    const currency = typeof price.currency === "string" ? price.currency.toLowerCase() : "";
    if (!/^[a-z]{3}$/.test(currency)) throw new ApiError(400, "Invalid currency.", "invalid_request_error", `line_items[${i}][price_data][currency]`);
    if (typeof product.name !== "string" || product.name.trim() === "") throw new ApiError(400, "A product name is required.", "invalid_request_error", `line_items[${i}][price_data][product_data][name]`);
    const unitAmount = integerOf(price.unit_amount, `line_items[${i}][price_data][unit_amount]`);
    const quantity = integerOf(item.quantity ?? "1", `line_items[${i}][quantity]`, 1);
    return { description: product.name, quantity, unit_amount: unitAmount, amount_total: unitAmount * quantity, currency };
  });
  const currency = lines[0]!.currency;
  if (lines.some((l) => l.currency !== currency)) throw new ApiError(400, "All line items must use the same currency.", "invalid_request_error", "line_items");
  const total = lines.reduce((sum, l) => sum + l.amount_total, 0);
  if (total < 1) throw new ApiError(400, "The Checkout Session's total amount must be greater than zero.", "invalid_request_error", "line_items");
  const id = newId("cs");
  const created = nowSeconds();
  const session: Session = {
    id,
    object: "checkout.session",
    mode: "payment",
    status: "open",
    payment_status: "unpaid",
    amount_subtotal: total,
    amount_total: total,
    currency,
    success_url: params.success_url as string,
    cancel_url: params.cancel_url as string,
    client_reference_id: typeof params.client_reference_id === "string" ? params.client_reference_id : null,
    customer_email: typeof params.customer_email === "string" ? params.customer_email : null,
    metadata: stringMap(params.metadata),
    payment_intent: null,
    url: `${origin}/checkout/${id}`,
    created,
    expires_at: created + 24 * 3600,
    livemode: false,
    line_items: lines,
  };
  saveSession(session);
  return session;
}

function sessionOrThrow(id: string): Session {
  const session = sessions.get(id);
  if (!session) throw new ApiError(404, `No such checkout.session: '${id}'`, "invalid_request_error", "session", "resource_missing");
  if (session.status === "open" && session.expires_at < nowSeconds()) {
    session.status = "expired";
    session.url = null;
    saveSession(session);
  }
  return session;
}

function expireSession(id: string): Session {
  const session = sessionOrThrow(id);
  if (session.status !== "open") throw new ApiError(400, `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${session.status}".`);
  session.status = "expired";
  session.url = null;
  saveSession(session);
  emit("checkout.session.expired", publicSession(session));
  return session;
}

/** The payer pressed Pay: the session completes and the signed webhook goes to the app. */
function paySession(id: string): { session: Session; event: WebhookEvent } {
  const session = sessionOrThrow(id);
  if (session.status !== "open") throw new ApiError(400, `This Checkout Session is ${session.status} and cannot be paid.`);
  const intent: PaymentIntent = {
    id: newId("pi"),
    object: "payment_intent",
    amount: session.amount_total,
    amount_received: session.amount_total,
    amount_refunded: 0,
    currency: session.currency,
    latest_charge: newId("ch"),
    status: "succeeded",
    metadata: session.metadata,
    checkout_session: session.id,
    created: nowSeconds(),
  };
  saveIntent(intent);
  session.status = "complete";
  session.payment_status = "paid";
  session.payment_intent = intent.id;
  session.url = null;
  saveSession(session);
  return { session, event: emit("checkout.session.completed", publicSession(session)) };
}

function createRefund(params: Record<string, unknown>): Refund {
  const intentId = typeof params.payment_intent === "string" ? params.payment_intent : null;
  const byCharge = typeof params.charge === "string" ? [...intents.values()].find((p) => p.latest_charge === params.charge) : undefined;
  const intent = intentId ? intents.get(intentId) : byCharge;
  if (!intent) throw new ApiError(404, `No such payment_intent: '${intentId ?? (typeof params.charge === "string" ? params.charge : "")}'`, "invalid_request_error", "payment_intent", "resource_missing");
  const remaining = intent.amount_received - intent.amount_refunded;
  const amount = params.amount === undefined ? remaining : integerOf(params.amount, "amount", 1);
  if (remaining <= 0) throw new ApiError(400, `Charge ${intent.latest_charge} has already been refunded.`, "invalid_request_error", undefined, "charge_already_refunded");
  if (amount > remaining) throw new ApiError(400, `Refund amount (${amount}) is greater than unrefunded amount on charge (${remaining}).`, "invalid_request_error", "amount", "amount_too_large");
  const shouldFail = control.failRefunds > 0;
  if (shouldFail) control.failRefunds -= 1;
  const refund: Refund = {
    id: newId("re"),
    object: "refund",
    amount,
    currency: intent.currency,
    payment_intent: intent.id,
    charge: intent.latest_charge,
    status: shouldFail ? "pending" : "succeeded",
    reason: typeof params.reason === "string" ? params.reason : null,
    metadata: stringMap(params.metadata),
    created: nowSeconds(),
  };
  saveRefund(refund);
  if (shouldFail) {
    // A refund the card network later declines: created as pending, then failed.
    emit("refund.created", { ...refund });
    refund.status = "failed";
    refund.failure_reason = "expired_or_canceled_card";
    saveRefund(refund);
    emit("refund.failed", { ...refund });
  } else {
    intent.amount_refunded += amount;
    saveIntent(intent);
    emit("refund.created", { ...refund });
    emit("charge.refunded", { id: intent.latest_charge, object: "charge", amount: intent.amount, amount_refunded: intent.amount_refunded, currency: intent.currency, payment_intent: intent.id, refunded: intent.amount_refunded >= intent.amount });
  }
  return refund;
}

// ---------------------------------------------------------------- webhooks

function emit(type: string, object: unknown): WebhookEvent {
  const event: WebhookEvent = { id: newId("evt"), object: "event", api_version: API_VERSION, created: nowSeconds(), type, livemode: false, pending_webhooks: 1, request: { id: null, idempotency_key: null }, data: { object } };
  events.push(event);
  persist({ t: "event", v: event });
  const objectId = (object as { id?: unknown }).id;
  const isHeld = typeof objectId === "string" && heldSessions.has(objectId);
  if (control.webhookMode === "auto" && !isHeld) void deliverWithRetries(event);
  return event;
}

function signPayload(payload: string, secret: string, timestamp = nowSeconds()): string {
  const signature = createHmac("sha256", secret).update(`${timestamp}.${payload}`, "utf8").digest("hex");
  return `t=${timestamp},v1=${signature}`;
}

type SignatureMode = "valid" | "wrong_secret" | "tampered_payload" | "missing" | "stale";

async function deliver(event: WebhookEvent, mode: SignatureMode = "valid"): Promise<Delivery> {
  const payload = JSON.stringify(event, null, 2);
  let header = "";
  let body = payload;
  if (mode === "valid") header = signPayload(payload, config.webhookSecret);
  else if (mode === "wrong_secret") header = signPayload(payload, `whsec_${randomBytes(16).toString("hex")}`);
  else if (mode === "tampered_payload") {
    header = signPayload(payload, config.webhookSecret);
    // Signed for one body, sent with another: e.g. an attacker raising the amount.
    body = payload.replace(/"amount_total": (\d+)/, (_m, n: string) => `"amount_total": ${Number(n) + 100}`).replace(/"id": "evt_/, '"id": "evt_forged_');
  } else if (mode === "stale") header = signPayload(payload, config.webhookSecret, nowSeconds() - 3600);
  const delivery: Delivery = { eventId: event.id, at: new Date().toISOString(), signature: mode, status: null, body: "" };
  try {
    const headers: Record<string, string> = { "content-type": "application/json; charset=utf-8", "user-agent": "Stripe/1.0 (+local stand-in)" };
    if (header) headers["stripe-signature"] = header;
    const response = await fetch(config.webhookUrl, { method: "POST", headers, body, signal: AbortSignal.timeout(30_000) });
    delivery.status = response.status;
    delivery.body = (await response.text()).slice(0, 2000);
  } catch (error) {
    delivery.body = `delivery failed: ${error instanceof Error ? error.message : String(error)}`;
  }
  deliveries.push(delivery);
  persist({ t: "delivery", v: delivery });
  return delivery;
}

/** Like the hosted service: retried with back-off until the app answers 2xx (a few tries here). */
let deliveriesInFlight = 0;

async function deliverWithRetries(event: WebhookEvent): Promise<void> {
  deliveriesInFlight += 1;
  try {
    if (control.webhookDelayMs > 0) await new Promise((r) => setTimeout(r, control.webhookDelayMs));
    for (let attempt = 0; attempt < 5; attempt++) {
      const result = await deliver(event);
      if (result.status !== null && result.status >= 200 && result.status < 300) return;
      await new Promise((r) => setTimeout(r, 500 * 2 ** attempt));
    }
  } finally {
    deliveriesInFlight -= 1;
  }
}

function eventOrThrow(eventId: unknown, type?: unknown): WebhookEvent {
  const candidates = typeof type === "string" ? events.filter((e) => e.type === type) : events;
  const event = typeof eventId === "string" ? events.find((e) => e.id === eventId) : candidates[candidates.length - 1];
  if (!event) throw new ApiError(404, "No such event.");
  return event;
}

// ---------------------------------------------------------------- HTTP

function send(res: http.ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  const text = JSON.stringify(body);
  res.writeHead(status, { "content-type": "application/json", "content-length": Buffer.byteLength(text), "request-id": `req_${randomBytes(8).toString("hex")}`, ...headers });
  res.end(text);
}

function sendError(res: http.ServerResponse, error: ApiError): void {
  send(res, error.status, { error: { type: error.type, message: error.message, ...(error.param ? { param: error.param } : {}), ...(error.code ? { code: error.code } : {}) } });
}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > 1024 * 1024) {
        reject(new ApiError(413, "The request is too large."));
        req.destroy();
      } else chunks.push(chunk);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
const money = (cents: number, currency: string) => new Intl.NumberFormat("en-US", { style: "currency", currency: currency.toUpperCase() }).format(cents / 100);

function checkoutPage(session: Session): string {
  const rows = session.line_items.map((l) => `<tr><td>${escapeHtml(l.description)}</td><td class="n">${money(l.amount_total, l.currency)}</td></tr>`).join("");
  const isOpen = session.status === "open";
  const closed = session.status === "complete" ? "This checkout has been paid." : "This checkout has expired and can no longer be paid.";
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>Checkout (local payments stand-in)</title>
<style>
  body { font-family: system-ui, sans-serif; background: #f3f4f6; color: #111827; margin: 0; padding: 24px 12px; }
  main { max-width: 460px; margin: 0 auto; background: #fff; border: 1px solid #d1d5db; border-radius: 10px; padding: 24px; }
  .banner { background: #fef3c7; border: 1px solid #f59e0b; color: #78350f; border-radius: 6px; padding: 8px 10px; font-size: 14px; margin-bottom: 16px; }
  h1 { font-size: 20px; margin: 0 0 4px; } p.sub { color: #4b5563; margin: 0 0 16px; font-size: 14px; }
  table { width: 100%; border-collapse: collapse; font-size: 15px; } td { padding: 6px 0; border-bottom: 1px solid #e5e7eb; } td.n { text-align: right; font-variant-numeric: tabular-nums; }
  tr.total td { font-weight: 700; border-bottom: 0; padding-top: 10px; }
  .actions { display: flex; gap: 10px; margin-top: 20px; } form { flex: 1; }
  button { width: 100%; min-height: 48px; font-size: 17px; font-weight: 600; border-radius: 6px; cursor: pointer; }
  .pay { background: #1f2937; color: #fff; border: 0; } .cancel { background: #fff; color: #111827; border: 1px solid #9ca3af; }
</style></head>
<body><main>
  <div class="banner" role="note">Local payments stand-in for development and tests. No card is charged and no money moves.</div>
  <h1>Pay ${money(session.amount_total, session.currency)}</h1>
  <p class="sub">${session.customer_email ? `For ${escapeHtml(session.customer_email)} · ` : ""}Checkout ${escapeHtml(session.id)}</p>
  <table><tbody>${rows}<tr class="total"><td>Total</td><td class="n">${money(session.amount_total, session.currency)}</td></tr></tbody></table>
  ${
    isOpen
      ? `<div class="actions">
    <form method="post" action="/checkout/${encodeURIComponent(session.id)}/cancel"><button class="cancel" type="submit">Cancel</button></form>
    <form method="post" action="/checkout/${encodeURIComponent(session.id)}/pay"><button class="pay" type="submit">Pay ${money(session.amount_total, session.currency)}</button></form>
  </div>`
      : `<p role="status"><strong>${closed}</strong></p><p><a href="${escapeHtml(session.status === "complete" ? session.success_url.replace("{CHECKOUT_SESSION_ID}", session.id) : session.cancel_url)}">Return to the site</a></p>`
  }
</main></body></html>`;
}

function redirect(res: http.ServerResponse, location: string): void {
  res.writeHead(303, { location, "content-length": 0 });
  res.end();
}

function checkApiKey(req: http.IncomingMessage): void {
  const match = /^Bearer (\S+)$/.exec(req.headers.authorization ?? "");
  if (!match) throw new ApiError(401, "You did not provide an API key. Provide it in the Authorization header as a Bearer token.", "invalid_request_error");
  const key = match[1]!;
  if (config.apiKey ? key !== config.apiKey : !/^sk_(test|live)_\S+$/.test(key)) throw new ApiError(401, `Invalid API Key provided: ${key.slice(0, 8)}…`, "invalid_request_error");
}

/** Same key and same body: the stored answer; same key and another body: an error, like the hosted API. */
function withIdempotency(req: http.IncomingMessage, scope: string, body: string, run: () => { status: number; body: unknown }): { status: number; body: unknown } {
  const header = req.headers["idempotency-key"];
  if (typeof header !== "string" || header.startsWith("stripe-node-retry-")) return run();
  const key = `${scope}:${header}`;
  const hash = createHash("sha256").update(body).digest("hex");
  const seen = idempotent.get(key);
  if (seen) {
    if (seen.hash !== hash) throw new ApiError(400, "Keys for idempotent requests can only be used with the same parameters they were first used with.", "idempotency_error");
    return { status: seen.status, body: seen.body };
  }
  const answer = run();
  idempotent.set(key, { hash, ...answer });
  return answer;
}

const server = http.createServer((req, res) => void handle(req, res));

async function handle(req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
  const url = new URL(req.url ?? "/", `http://${req.headers.host ?? `127.0.0.1:${config.port}`}`);
  const origin = `http://127.0.0.1:${config.port}`;
  const method = req.method ?? "GET";
  const segments = url.pathname.split("/").filter(Boolean).map(decodeURIComponent);
  try {
    if (method === "GET" && url.pathname === "/health") return send(res, 200, { ok: true, sessions: sessions.size, events: events.length, deliveriesInFlight });

    // ------------------------------------------------ the payer's checkout page
    if (segments[0] === "checkout" && segments[1]) {
      const session = sessions.get(segments[1]);
      if (!session) {
        res.writeHead(404, { "content-type": "text/html; charset=utf-8" });
        return void res.end("<!doctype html><title>Not found</title><p>No such checkout.</p>");
      }
      if (method === "GET" && segments.length === 2) {
        const html = checkoutPage(sessionOrThrow(session.id));
        res.writeHead(200, { "content-type": "text/html; charset=utf-8", "content-length": Buffer.byteLength(html), "cache-control": "no-store" });
        return void res.end(html);
      }
      if (method === "POST" && segments[2] === "pay") {
        if (sessionOrThrow(session.id).status !== "open") return redirect(res, `/checkout/${encodeURIComponent(session.id)}`);
        paySession(session.id);
        return redirect(res, session.success_url.replace("{CHECKOUT_SESSION_ID}", session.id));
      }
      if (method === "POST" && segments[2] === "cancel") return redirect(res, session.cancel_url.replace("{CHECKOUT_SESSION_ID}", session.id));
    }

    // ------------------------------------------------ inspection and fault routes for tests
    if (segments[0] === "_sessions") {
      if (method === "GET" && segments.length === 1) {
        const ref = url.searchParams.get("client_reference_id");
        const list = [...sessions.values()].filter((s) => !ref || s.client_reference_id === ref).reverse();
        return send(res, 200, { data: list });
      }
      const session = sessionOrThrow(segments[1] ?? "");
      if (method === "GET" && segments.length === 2) return send(res, 200, session);
      if (method === "POST" && segments[2] === "pay") {
        const options = JSON.parse((await readBody(req)) || "{}") as { deliver?: "sync" | "none" };
        const previousMode = control.webhookMode;
        // A synchronous delivery answers with the app's response: deterministic for tests.
        if (options.deliver) control.webhookMode = "hold";
        try {
          const { session: paid, event } = paySession(session.id);
          const delivery = options.deliver === "sync" ? await deliver(event) : null;
          return send(res, 200, { session: paid, eventId: event.id, delivery, redirect: paid.success_url.replace("{CHECKOUT_SESSION_ID}", paid.id) });
        } finally {
          control.webhookMode = previousMode;
        }
      }
      if (method === "POST" && segments[2] === "cancel") return send(res, 200, { redirect: session.cancel_url });
      if (method === "POST" && segments[2] === "hold") {
        heldSessions.add(session.id);
        return send(res, 200, { held: session.id });
      }
    }
    if (method === "GET" && url.pathname === "/_events") {
      const type = url.searchParams.get("type");
      return send(res, 200, { data: events.filter((e) => !type || e.type === type).reverse(), deliveries: deliveries.slice(-200).reverse() });
    }
    if (method === "POST" && url.pathname === "/_webhooks/replay") {
      const body = JSON.parse((await readBody(req)) || "{}") as { eventId?: string; type?: string; copies?: number };
      const event = eventOrThrow(body.eventId, body.type);
      const copies = Math.min(Math.max(Number(body.copies ?? 1) || 1, 1), 10);
      // All copies leave at once: the app must apply the event once however they interleave.
      const results = await Promise.all(Array.from({ length: copies }, () => deliver(event)));
      return send(res, 200, { eventId: event.id, results });
    }
    if (method === "POST" && url.pathname === "/_webhooks/bad-signature") {
      const body = JSON.parse((await readBody(req)) || "{}") as { eventId?: string; type?: string; mode?: SignatureMode };
      const event = eventOrThrow(body.eventId, body.type);
      const mode = body.mode && body.mode !== "valid" ? body.mode : "wrong_secret";
      return send(res, 200, { eventId: event.id, result: await deliver(event, mode) });
    }
    if (method === "POST" && url.pathname === "/_control") {
      const body = JSON.parse((await readBody(req)) || "{}") as Partial<typeof control>;
      if (body.webhookMode === "auto" || body.webhookMode === "hold") control.webhookMode = body.webhookMode;
      if (typeof body.webhookDelayMs === "number") control.webhookDelayMs = Math.max(0, Math.min(body.webhookDelayMs, 60_000));
      if (typeof body.failRefunds === "number") control.failRefunds = Math.max(0, body.failRefunds);
      if (typeof body.failApiCalls === "number") control.failApiCalls = Math.max(0, body.failApiCalls);
      return send(res, 200, control);
    }

    // ------------------------------------------------ the API the SDK calls
    if (segments[0] === "v1") {
      checkApiKey(req);
      if (control.failApiCalls > 0) {
        control.failApiCalls -= 1;
        throw new ApiError(500, "The stand-in was told to fail this call.", "api_error");
      }
      const raw = method === "GET" ? url.searchParams.toString() : await readBody(req);
      const params = parseForm(raw);
      const resource = segments.slice(1).join("/");
      if (method === "POST" && resource === "checkout/sessions") {
        const answer = withIdempotency(req, resource, raw, () => ({ status: 200, body: publicSession(createSession(params, origin)) }));
        return send(res, answer.status, answer.body);
      }
      if (segments[1] === "checkout" && segments[2] === "sessions" && segments[3]) {
        if (method === "GET" && segments.length === 4) return send(res, 200, publicSession(sessionOrThrow(segments[3])));
        if (method === "GET" && segments[4] === "line_items") {
          const s = sessionOrThrow(segments[3]);
          return send(res, 200, { object: "list", url: `/v1/checkout/sessions/${s.id}/line_items`, has_more: false, data: s.line_items.map((l, i) => ({ id: `li_${s.id}_${i}`, object: "item", ...l })) });
        }
        if (method === "POST" && segments[4] === "expire") return send(res, 200, publicSession(expireSession(segments[3])));
      }
      if (method === "POST" && resource === "refunds") {
        const answer = withIdempotency(req, resource, raw, () => ({ status: 200, body: createRefund(params) }));
        return send(res, answer.status, answer.body);
      }
      if (method === "GET" && segments[1] === "refunds" && segments[2]) {
        const refund = refunds.get(segments[2]);
        if (!refund) throw new ApiError(404, `No such refund: '${segments[2]}'`, "invalid_request_error", "id", "resource_missing");
        return send(res, 200, refund);
      }
      if (method === "GET" && segments[1] === "payment_intents" && segments[2]) {
        const intent = intents.get(segments[2]);
        if (!intent) throw new ApiError(404, `No such payment_intent: '${segments[2]}'`, "invalid_request_error", "id", "resource_missing");
        return send(res, 200, intent);
      }
      throw new ApiError(404, `Unrecognized request URL (${method}: ${url.pathname}). This stand-in answers only the calls Zoneward makes.`);
    }
    throw new ApiError(404, "Not found.");
  } catch (error) {
    if (error instanceof ApiError) return sendError(res, error);
    if (error instanceof SyntaxError) return sendError(res, new ApiError(400, "The request body is not valid JSON."));
    return sendError(res, new ApiError(500, String(error), "api_error"));
  }
}

server.listen(config.port, "127.0.0.1", () => {
  console.log(`payments stand-in listening on http://127.0.0.1:${config.port} (webhooks to ${config.webhookUrl}; ${sessions.size} sessions kept)`);
});
const stop = () => server.close(() => process.exit(0));
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
