import "server-only";
import { eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { signInThrottle } from "@/db/schema";
import { TooManyRequestsError } from "@/lib/errors";

interface ThrottleRule {
  /** Failures allowed within the window before the key is locked. */
  limit: number;
  windowMinutes: number;
  lockMinutes: number;
}

// Common practice for sign-in forms (e.g. OWASP guidance), not a published rule: 5 tries per
// account in 15 minutes, then a 15-minute pause; per client address, a looser limit.
export const throttleRules = {
  account: { limit: 5, windowMinutes: 15, lockMinutes: 15 },
  address: { limit: 30, windowMinutes: 15, lockMinutes: 15 },
  lookup: { limit: 60, windowMinutes: 10, lockMinutes: 10 },
} satisfies Record<string, ThrottleRule>;

/** Throws when any key is locked; call before doing the costly or sensitive work. */
export async function assertNotThrottled(keys: string[], now = new Date()): Promise<void> {
  for (const key of keys) {
    const [row] = await getDb().select().from(signInThrottle).where(eq(signInThrottle.key, key)).limit(1);
    if (row?.lockedUntil && row.lockedUntil > now) {
      const seconds = Math.ceil((row.lockedUntil.getTime() - now.getTime()) / 1000);
      throw new TooManyRequestsError(`Too many attempts. Please wait ${Math.ceil(seconds / 60)} minute(s) and try again.`, seconds);
    }
  }
}

/** Counts one failure (or one use, for lookups) against a key; locks it past the limit. */
export async function recordAttempt(key: string, rule: ThrottleRule, now = new Date()): Promise<void> {
  const windowStart = new Date(now.getTime() - rule.windowMinutes * 60_000);
  const lockUntil = new Date(now.getTime() + rule.lockMinutes * 60_000);
  // One statement, so two concurrent failures both count.
  await getDb().execute(sql`
    INSERT INTO sign_in_throttle (\`key\`, failures, window_started_at, locked_until)
    VALUES (${key}, 1, ${now}, NULL)
    ON DUPLICATE KEY UPDATE
      failures = IF(window_started_at < ${windowStart}, 1, failures + 1),
      window_started_at = IF(window_started_at < ${windowStart}, ${now}, window_started_at),
      locked_until = IF(IF(window_started_at < ${windowStart}, 1, failures) >= ${rule.limit}, ${lockUntil}, locked_until)`);
}

export async function clearAttempts(key: string): Promise<void> {
  await getDb().delete(signInThrottle).where(eq(signInThrottle.key, key));
}
