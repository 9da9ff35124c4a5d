// A local stand-in of the mail API that the resend SDK calls: the same routes and shapes for
// single and batch sends, every message kept (memory + a JSON-lines file) for the admin's
// mailbox page and for tests. Loopback only. Not part of the app.
import { randomUUID } from "node:crypto";
import { appendFileSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import http from "node:http";
import path from "node:path";

interface StoredMessage {
  id: string;
  created_at: string;
  from: string;
  to: string[];
  subject: string;
  html?: string;
  text?: string;
  reply_to?: string[];
  headers?: Record<string, string>;
  tags?: { name: string; value: string }[];
  attachments?: { filename: string; size: number }[];
}

function parseArgs(): { port: number; dir: string } {
  const args = process.argv.slice(2);
  const get = (name: string) => {
    const i = args.indexOf(name);
    return i >= 0 ? args[i + 1] : undefined;
  };
  return { port: Number(get("--port") ?? 3025), dir: get("--dir") ?? ".data/mail" };
}

const { port, dir } = parseArgs();
mkdirSync(dir, { recursive: true });
const file = path.join(dir, "messages.jsonl");
const messages: StoredMessage[] = existsSync(file)
  ? readFileSync(file, "utf8")
      .split("\n")
      .filter(Boolean)
      .map((line) => JSON.parse(line) as StoredMessage)
  : [];
const byIdempotencyKey = new Map<string, unknown>();

/** Fault injection for tests: accept this many more messages, then answer with an error. */
let failAfter: number | null = null;
let failStatus = 500;
let delayMs = 0;

const MAX_BATCH = 100;

function asList(value: unknown): string[] | null {
  if (typeof value === "string") return [value];
  if (Array.isArray(value) && value.every((v) => typeof v === "string")) return value;
  return null;
}

function validate(body: unknown): { message?: StoredMessage; error?: string } {
  if (typeof body !== "object" || body === null) return { error: "The request body must be a JSON object." };
  const b = body as Record<string, unknown>;
  const to = asList(b.to);
  if (typeof b.from !== "string" || !b.from.includes("@")) return { error: "The `from` field is missing or invalid." };
  if (!to || to.length === 0 || to.length > 50 || !to.every((a) => a.includes("@"))) return { error: "The `to` field is missing or invalid." };
  if (typeof b.subject !== "string" || b.subject.length === 0) return { error: "The `subject` field is missing." };
  if (typeof b.html !== "string" && typeof b.text !== "string") return { error: "Either `html` or `text` must be provided." };
  const attachments = Array.isArray(b.attachments)
    ? (b.attachments as { filename?: string; content?: string }[]).map((a) => ({ filename: String(a.filename ?? "attachment"), size: typeof a.content === "string" ? Math.floor((a.content.length * 3) / 4) : 0 }))
    : undefined;
  return {
    message: {
      id: randomUUID(),
      created_at: new Date().toISOString(),
      from: b.from,
      to,
      subject: b.subject,
      html: typeof b.html === "string" ? b.html : undefined,
      text: typeof b.text === "string" ? b.text : undefined,
      reply_to: asList(b.reply_to) ?? undefined,
      headers: typeof b.headers === "object" && b.headers !== null ? (b.headers as Record<string, string>) : undefined,
      tags: Array.isArray(b.tags) ? (b.tags as { name: string; value: string }[]) : undefined,
      attachments,
    },
  };
}

function store(message: StoredMessage): void {
  messages.push(message);
  appendFileSync(file, JSON.stringify(message) + "\n");
}

/** Counts down the fault-injection budget; true when this message must be refused. */
function shouldFail(count: number): boolean {
  if (failAfter === null) return false;
  if (failAfter < count) return true;
  failAfter -= count;
  return false;
}

function send(res: http.ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, { "content-type": "application/json", "content-length": Buffer.byteLength(text) });
  res.end(text);
}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > 40 * 1024 * 1024) {
        reject(new Error("too large"));
        req.destroy();
      } else chunks.push(chunk);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

const server = http.createServer((req, res) => void handle(req, res));

async function handle(req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
  const url = new URL(req.url ?? "/", "http://standin");
  try {
    if (req.method === "GET" && url.pathname === "/health") return send(res, 200, { ok: true, messages: messages.length });

    // Inspection routes used by the admin's mailbox page and by tests.
    if (req.method === "GET" && url.pathname === "/_messages") {
      const to = url.searchParams.get("to")?.toLowerCase();
      const limit = Math.min(Number(url.searchParams.get("limit") ?? 200) || 200, 5000);
      const list = (to ? messages.filter((m) => m.to.some((a) => a.toLowerCase() === to)) : messages).slice(-limit).reverse();
      return send(res, 200, { total: messages.length, data: list });
    }
    if (req.method === "DELETE" && url.pathname === "/_messages") {
      messages.length = 0;
      byIdempotencyKey.clear();
      writeFileSync(file, "");
      return send(res, 200, { ok: true });
    }
    if (req.method === "POST" && url.pathname === "/_control") {
      const body = JSON.parse((await readBody(req)) || "{}") as { failAfter?: number | null; failStatus?: number; delayMs?: number };
      failAfter = body.failAfter ?? null;
      failStatus = body.failStatus ?? 500;
      delayMs = body.delayMs ?? 0;
      return send(res, 200, { ok: true, failAfter, failStatus, delayMs });
    }

    const auth = req.headers.authorization ?? "";
    if ((url.pathname === "/emails" || url.pathname === "/emails/batch") && req.method === "POST") {
      if (!/^Bearer \S+/.test(auth)) return send(res, 401, { statusCode: 401, name: "missing_api_key", message: "Missing API key in the authorization header." });
      if (delayMs > 0) await new Promise((r) => setTimeout(r, delayMs));
      const idempotencyKey = req.headers["idempotency-key"];
      const key = typeof idempotencyKey === "string" ? `${url.pathname}:${idempotencyKey}` : null;
      if (key && byIdempotencyKey.has(key)) return send(res, 200, byIdempotencyKey.get(key));

      let parsed: unknown;
      try {
        parsed = JSON.parse(await readBody(req));
      } catch {
        return send(res, 422, { statusCode: 422, name: "validation_error", message: "The request body is not valid JSON." });
      }

      if (url.pathname === "/emails") {
        const { message, error } = validate(parsed);
        if (!message) return send(res, 422, { statusCode: 422, name: "validation_error", message: error });
        if (shouldFail(1)) return send(res, failStatus, { statusCode: failStatus, name: "internal_server_error", message: "The stand-in was told to fail." });
        store(message);
        const answer = { id: message.id };
        if (key) byIdempotencyKey.set(key, answer);
        return send(res, 200, answer);
      }

      if (!Array.isArray(parsed)) return send(res, 422, { statusCode: 422, name: "validation_error", message: "A batch must be a JSON array." });
      if (parsed.length === 0 || parsed.length > MAX_BATCH) return send(res, 422, { statusCode: 422, name: "validation_error", message: `A batch holds 1 to ${MAX_BATCH} emails.` });
      const checked = parsed.map(validate);
      const bad = checked.findIndex((c) => !c.message);
      if (bad >= 0) return send(res, 422, { statusCode: 422, name: "validation_error", message: `Email ${bad}: ${checked[bad]?.error}` });
      if (shouldFail(parsed.length)) return send(res, failStatus, { statusCode: failStatus, name: "internal_server_error", message: "The stand-in was told to fail." });
      const stored = checked.map((c) => c.message as StoredMessage);
      stored.forEach(store);
      const answer = { data: stored.map((m) => ({ id: m.id })) };
      if (key) byIdempotencyKey.set(key, answer);
      return send(res, 200, answer);
    }

    return send(res, 404, { statusCode: 404, name: "not_found", message: "Not found." });
  } catch (error) {
    return send(res, 500, { statusCode: 500, name: "internal_server_error", message: String(error) });
  }
}

server.listen(port, "127.0.0.1", () => {
  console.log(`mail stand-in listening on http://127.0.0.1:${port} (${messages.length} messages kept)`);
});
const stop = () => server.close(() => process.exit(0));
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
