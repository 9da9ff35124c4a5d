import "server-only";
import { cookies, headers } from "next/headers";
import { redirect } from "next/navigation";
import { cache } from "react";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { getLucia } from "./lucia";
import type { Actor } from "./permissions";
import { generateSecretToken, hashToken } from "./tokens";

export interface SignedIn {
  actor: Actor;
  sessionId: string;
}

/**
 * Starts a session. The cookie carries a random token; the database keeps only its hash as
 * the session id (lucia's createSession accepts the id we choose).
 */
export async function createUserSession(userId: number): Promise<{ token: string; expiresAt: Date }> {
  const token = generateSecretToken();
  const session = await getLucia().createSession(userId, {}, { sessionId: hashToken(token) });
  await getDb().update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, userId));
  return { token, expiresAt: session.expiresAt };
}

export async function setSessionCookie(token: string): Promise<void> {
  const cookie = getLucia().createSessionCookie(token);
  (await cookies()).set(cookie.name, cookie.value, cookie.attributes);
}

export async function clearSessionCookie(): Promise<void> {
  const cookie = getLucia().createBlankSessionCookie();
  (await cookies()).set(cookie.name, cookie.value, cookie.attributes);
}

/** Validates a token from a cookie or header; extends the session when half its life is gone. */
export async function validateSessionToken(token: string) {
  const { session, user } = await getLucia().validateSession(hashToken(token));
  if (!session || !user) return null;
  if (user.status !== "active") {
    await getLucia().invalidateSession(session.id);
    return null;
  }
  const actor: Actor = {
    id: user.id,
    role: user.role,
    name: user.name,
    email: user.email,
    programId: user.programId,
    companyId: user.companyId,
    isBillingManager: user.isBillingManager,
  };
  return { actor, sessionId: session.id, isFresh: session.fresh };
}

/** The signed-in user for this request (once per request: React cache). */
export const getSignedIn = cache(async (): Promise<SignedIn | null> => {
  const jar = await cookies();
  const token = jar.get(getLucia().sessionCookieName)?.value;
  if (!token) return null;
  const result = await validateSessionToken(token);
  if (!result) return null;
  if (result.isFresh) {
    // Refreshing the cookie only works in actions and route handlers; pages render without it.
    try {
      await setSessionCookie(token);
    } catch {
      /* a Server Component cannot set cookies; the next action or API call will */
    }
  }
  return { actor: result.actor, sessionId: result.sessionId };
});

export async function getActor(): Promise<Actor | null> {
  return (await getSignedIn())?.actor ?? null;
}

/** For pages: the actor, or a redirect to sign-in that comes back here afterwards. */
export async function requireActor(): Promise<Actor> {
  const actor = await getActor();
  if (!actor) {
    const h = await headers();
    const next = h.get("x-zw-path") ?? "/";
    redirect(`/login?next=${encodeURIComponent(next)}`);
  }
  return actor;
}

export async function signOutCurrentSession(): Promise<void> {
  const signedIn = await getSignedIn();
  if (signedIn) await getLucia().invalidateSession(signedIn.sessionId);
  await clearSessionCookie();
}

export async function invalidateAllSessions(userId: number): Promise<void> {
  await getLucia().invalidateUserSessions(userId);
}
