import { eq } from "drizzle-orm";
import { randomBytes, createHash } from "node:crypto";
import supertest from "supertest";
import { sessions, users } from "@/db/schema";
import { testDb } from "./db";

export const APP_URL = process.env.TEST_APP_URL ?? "http://127.0.0.1:3100";
export const ORIGIN = new URL(APP_URL).origin;

/** supertest against the running, built app. */
export function api() {
  return supertest(APP_URL);
}

/**
 * A session for a user, written straight into the database the way sign-in does (the cookie
 * carries a token, the table its SHA-256). Fast: tests do not pay argon2 for every request.
 */
export async function sessionCookieFor(email: string): Promise<string> {
  const db = testDb();
  const [user] = await db.select({ id: users.id }).from(users).where(eq(users.email, email)).limit(1);
  if (!user) throw new Error(`No test user ${email}`);
  const token = randomBytes(20).toString("base64url");
  await db.insert(sessions).values({ id: createHash("sha256").update(token).digest("hex"), userId: user.id, expiresAt: new Date(Date.now() + 86_400_000) });
  return `zw_session=${token}`;
}

/** Requests as a signed-in user, with the Origin a browser would send. */
export async function as(email: string) {
  const cookie = await sessionCookieFor(email);
  return {
    cookie,
    get: (path: string) => api().get(path).set("Cookie", cookie).redirects(0),
    post: (path: string, body?: unknown) => api().post(path).set("Cookie", cookie).set("Origin", ORIGIN).send(body as object).redirects(0),
    put: (path: string, body?: unknown) => api().put(path).set("Cookie", cookie).set("Origin", ORIGIN).send(body as object).redirects(0),
    patch: (path: string, body?: unknown) => api().patch(path).set("Cookie", cookie).set("Origin", ORIGIN).send(body as object).redirects(0),
    delete: (path: string) => api().delete(path).set("Cookie", cookie).set("Origin", ORIGIN).redirects(0),
  };
}

export function cookieFrom(response: { headers: Record<string, unknown> }): string | null {
  const raw = response.headers["set-cookie"];
  const list = Array.isArray(raw) ? raw : typeof raw === "string" ? [raw] : [];
  const found = list.find((c: string) => c.startsWith("zw_session=") && !c.startsWith("zw_session=;"));
  return found ? found.split(";")[0]! : null;
}

/** A unique suffix so tests that create rows never collide with each other or with the seed. */
export function unique(prefix = "t"): string {
  return `${prefix}${Date.now().toString(36)}${randomBytes(3).toString("hex")}`;
}
