import "server-only";
import { and, eq, gt, inArray, isNull, sql } from "drizzle-orm";
import { createElement } from "react";
import { z } from "zod";
import { getDb, type Executor } from "@/db/client";
import { authTokens, owners, programs, siteOwners, sites, users } from "@/db/schema";
import OwnerSignInLinkEmail, { subjectOfOwnerSignInLink } from "@/emails/owner-sign-in-link";
import { assertNotThrottled, clearAttempts, recordAttempt, throttleRules } from "@/lib/auth/throttle";
import { generateReadableCode, generateSecretToken, hashToken } from "@/lib/auth/tokens";
import { getEnv } from "@/lib/env";
import { InputError } from "@/lib/errors";
import { sendEmailQuietly } from "@/lib/mail/send";
import { recordAudit } from "./audit";
import { formatLongDate, normalizeReadableCode, OWNER_CODE_LENGTH } from "./notices-format";

/**
 * How owners get in without a password: a single-use link in each e-mailed notice
 * (auth_tokens purpose "owner_link"), or the account number plus a one-time code printed on a
 * letter ("owner_code"). Only hashes of the secrets are stored. Both sign the owner in to an
 * owner account linked to their owners rows, created when the first notice goes out.
 */

/** A notice link must outlive the time between two notices (the final comes 29 days after the overdue by default). */
export const OWNER_LINK_DAYS = 30;
/** Letters travel by post and wait on desks: their codes last longer. */
export const OWNER_CODE_DAYS = 90;

// Owners without an e-mail address still need an account for the code on their letter. The
// reserved ".invalid" top-level domain (RFC 2606) can never receive mail.
const PLACEHOLDER_DOMAIN = "letters.zoneward.invalid";

export function isPlaceholderEmail(email: string): boolean {
  return email.toLowerCase().endsWith(`@${PLACEHOLDER_DOMAIN}`);
}

function placeholderEmailFor(ownerId: number): string {
  return `owner-${ownerId}@${PLACEHOLDER_DOMAIN}`;
}

function absoluteUrl(path: string): string {
  return new URL(path, getEnv().APP_URL).toString();
}

/** The absolute address a notice links to: the signed sign-in page, or plain sign-in. */
export function ownerLinkUrl(token: string | null): string {
  return token ? absoluteUrl(`/o/${token}`) : absoluteUrl("/login?next=%2Fowner");
}

export function expiryOf(purpose: "owner_link" | "owner_code", now: Date): Date {
  return new Date(now.getTime() + (purpose === "owner_link" ? OWNER_LINK_DAYS : OWNER_CODE_DAYS) * 86_400_000);
}

/** The expiry as owners read it (the program's calendar day is close enough for a 30-day link). */
export function expiryWords(expiresAt: Date): string {
  return formatLongDate(expiresAt.toISOString().slice(0, 10));
}

export interface EmailRecipient {
  email: string;
  name: string;
  ownerIds: number[];
}

/**
 * The owner account that each e-mail recipient signs in to, inside the caller's transaction:
 * an existing owner account with that address, else the account already linked to one of the
 * owners rows (an account made for a letter takes the address), else a new one. The owners rows
 * are linked to it. null = the address belongs to a staff or tester account: such a notice gets
 * the plain sign-in link, never a password-free one.
 */
export async function resolveOwnerUsersForEmails(tx: Executor, recipients: readonly EmailRecipient[], now: Date): Promise<Map<string, number | null>> {
  const result = new Map<string, number | null>();
  if (recipients.length === 0) return result;
  const byEmail = new Map(recipients.map((r) => [r.email.toLowerCase(), r]));
  const emails = [...byEmail.keys()];
  const existing = await tx.select({ id: users.id, email: users.email, role: users.role }).from(users).where(inArray(users.email, emails));
  const existingByEmail = new Map(existing.map((u) => [u.email.toLowerCase(), u]));
  const ownerIds = recipients.flatMap((r) => r.ownerIds);
  const linked = ownerIds.length
    ? await tx
        .select({ ownerId: owners.id, userId: users.id, email: users.email, role: users.role })
        .from(owners)
        .innerJoin(users, eq(users.id, owners.userId))
        .where(inArray(owners.id, ownerIds))
    : [];
  const missing: { email: string; name: string }[] = [];
  for (const [email, recipient] of byEmail) {
    const user = existingByEmail.get(email);
    if (user) {
      result.set(email, user.role === "owner" ? user.id : null);
      continue;
    }
    const letterAccount = linked.find((l) => recipient.ownerIds.includes(l.ownerId) && l.role === "owner" && isPlaceholderEmail(l.email));
    if (letterAccount) {
      await tx.update(users).set({ email, updatedAt: now }).where(eq(users.id, letterAccount.userId));
      result.set(email, letterAccount.userId);
      continue;
    }
    missing.push({ email, name: recipient.name });
  }
  if (missing.length) {
    // INSERT IGNORE: an account made a moment ago by a sign-in request is simply reused.
    await tx
      .insert(users)
      .ignore()
      .values(missing.map((m) => ({ email: m.email, name: m.name.slice(0, 120), role: "owner" as const, status: "invited" as const, createdAt: now, updatedAt: now })));
    const created = await tx.select({ id: users.id, email: users.email, role: users.role }).from(users).where(inArray(users.email, missing.map((m) => m.email)));
    for (const user of created) result.set(user.email.toLowerCase(), user.role === "owner" ? user.id : null);
  }
  const links = recipients.flatMap((r) => {
    const userId = result.get(r.email.toLowerCase());
    return userId ? r.ownerIds.map((ownerId) => ({ ownerId, userId })) : [];
  });
  await linkOwnersRows(tx, links, now);
  return result;
}

/** owners.user_id for rows not yet linked, in one statement. */
async function linkOwnersRows(tx: Executor, links: readonly { ownerId: number; userId: number }[], now: Date): Promise<void> {
  if (links.length === 0) return;
  const cases = sql.join(
    links.map((l) => sql`WHEN ${l.ownerId} THEN ${l.userId}`),
    sql` `,
  );
  await tx.execute(sql`UPDATE owners SET user_id = CASE id ${cases} END, updated_at = ${now} WHERE user_id IS NULL AND id IN (${sql.join(
    links.map((l) => sql`${l.ownerId}`),
    sql`, `,
  )})`);
}

/**
 * The account that each letter's owners row signs in to with the letter's code: the linked one,
 * or a new one with a placeholder address (the owner can add a real address after signing in).
 */
export async function resolveOwnerUsersForLetters(tx: Executor, letterOwners: readonly { ownerId: number; name: string }[], now: Date): Promise<Map<number, number | null>> {
  const result = new Map<number, number | null>();
  if (letterOwners.length === 0) return result;
  const ids = [...new Set(letterOwners.map((o) => o.ownerId))];
  const rows = await tx.select({ ownerId: owners.id, userId: owners.userId, role: users.role }).from(owners).leftJoin(users, eq(users.id, owners.userId)).where(inArray(owners.id, ids));
  const unlinked: { ownerId: number; name: string }[] = [];
  for (const row of rows) {
    if (row.userId !== null) result.set(row.ownerId, row.role === "owner" ? row.userId : null);
    else unlinked.push({ ownerId: row.ownerId, name: letterOwners.find((o) => o.ownerId === row.ownerId)?.name ?? "Property owner" });
  }
  if (unlinked.length) {
    await tx
      .insert(users)
      .ignore()
      .values(unlinked.map((o) => ({ email: placeholderEmailFor(o.ownerId), name: o.name.slice(0, 120), role: "owner" as const, status: "invited" as const, createdAt: now, updatedAt: now })));
    const created = await tx.select({ id: users.id, email: users.email }).from(users).where(inArray(users.email, unlinked.map((o) => placeholderEmailFor(o.ownerId))));
    const links: { ownerId: number; userId: number }[] = [];
    for (const o of unlinked) {
      const user = created.find((u) => u.email === placeholderEmailFor(o.ownerId));
      if (!user) continue;
      result.set(o.ownerId, user.id);
      links.push({ ownerId: o.ownerId, userId: user.id });
    }
    await linkOwnersRows(tx, links, now);
  }
  return result;
}

/** Creates single-use secrets for these accounts in one insert; returns the plain secrets in order (only their hashes are stored). */
export async function createOwnerTokens(tx: Executor, purpose: "owner_link" | "owner_code", userIds: readonly number[], now: Date): Promise<string[]> {
  if (userIds.length === 0) return [];
  const secrets = userIds.map(() => (purpose === "owner_link" ? generateSecretToken() : generateReadableCode(OWNER_CODE_LENGTH)));
  const expiresAt = expiryOf(purpose, now);
  await tx.insert(authTokens).values(userIds.map((userId, i) => ({ tokenHash: hashToken(secrets[i]!), userId, purpose, expiresAt, createdAt: now })));
  return secrets;
}

const TOKEN_SHAPE = /^[A-Za-z0-9_-]{20,64}$/;
const usedOrExpired = "This sign-in link has expired or was already used. Nothing was changed. Ask for a new link below, or use the code on a letter from the program.";

export type OwnerLinkState = { isUsable: true; name: string; programNames: string[] } | { isUsable: false };

/** Whether a notice link can still sign in, without spending it (a mail scanner opening the page must not use it up). */
export async function inspectOwnerLink(token: string, now = new Date()): Promise<OwnerLinkState> {
  if (!TOKEN_SHAPE.test(token)) return { isUsable: false };
  const db = getDb();
  const [row] = await db
    .select({ userId: authTokens.userId, name: users.name, status: users.status })
    .from(authTokens)
    .innerJoin(users, eq(users.id, authTokens.userId))
    .where(and(eq(authTokens.tokenHash, hashToken(token)), eq(authTokens.purpose, "owner_link"), isNull(authTokens.usedAt), gt(authTokens.expiresAt, now)))
    .limit(1);
  if (!row || row.status === "suspended" || row.status === "disabled") return { isUsable: false };
  const programRows = await db.selectDistinct({ name: programs.name }).from(owners).innerJoin(programs, eq(programs.id, owners.programId)).where(eq(owners.userId, row.userId));
  return { isUsable: true, name: row.name, programNames: programRows.map((p) => p.name) };
}

/**
 * Spends a token and readies its owner account in one transaction: the conditional update lets
 * a secret sign in exactly once even when two tabs submit together.
 */
async function spendOwnerToken(tokenId: number, userId: number, how: "link" | "code", now: Date, unusable: string): Promise<void> {
  await getDb().transaction(async (tx) => {
    const [spent] = await tx
      .update(authTokens)
      .set({ usedAt: now })
      .where(and(eq(authTokens.id, tokenId), isNull(authTokens.usedAt), gt(authTokens.expiresAt, now)));
    if (spent.affectedRows !== 1) throw new InputError(unusable);
    const [user] = await tx.select({ email: users.email, status: users.status, role: users.role }).from(users).where(eq(users.id, userId)).for("update");
    if (!user || user.role !== "owner" || user.status === "suspended" || user.status === "disabled") throw new InputError("This account is not active. Please call the program office.");
    if (user.status === "invited") await tx.update(users).set({ status: "active", updatedAt: now }).where(eq(users.id, userId));
    // Every owners row with this address belongs to this person, in any program.
    if (!isPlaceholderEmail(user.email)) {
      await tx
        .update(owners)
        .set({ userId, updatedAt: now })
        .where(and(eq(owners.email, user.email), isNull(owners.userId)));
    }
    await recordAudit(tx, { actorId: userId, action: how === "link" ? "owner.signed_in_with_link" : "owner.signed_in_with_code", entityType: "user", entityId: userId });
  });
}

/** Signs in with a notice link: returns the account, or a clear error when it expired or was used (nothing changes). */
export async function redeemOwnerLink(token: string, now = new Date()): Promise<{ userId: number }> {
  if (!TOKEN_SHAPE.test(token)) throw new InputError(usedOrExpired);
  const [row] = await getDb()
    .select({ id: authTokens.id, userId: authTokens.userId })
    .from(authTokens)
    .where(and(eq(authTokens.tokenHash, hashToken(token)), eq(authTokens.purpose, "owner_link"), isNull(authTokens.usedAt), gt(authTokens.expiresAt, now)))
    .limit(1);
  if (!row) throw new InputError(usedOrExpired);
  await spendOwnerToken(row.id, row.userId, "link", now, usedOrExpired);
  return { userId: row.userId };
}

export const ownerCodeSchema = z.object({
  accountNumber: z
    .string({ error: "Enter the account number from your letter." })
    .trim()
    .min(3, "Enter the account number from your letter.")
    .max(40, "An account number has at most 40 characters.")
    .regex(/^[A-Za-z0-9-]+$/, "An account number has only letters, digits and dashes.")
    .transform((s) => s.toUpperCase()),
  code: z
    .string({ error: "Enter the one-time code from your letter." })
    .trim()
    .min(1, "Enter the one-time code from your letter.")
    .max(64)
    .transform((s, ctx) => {
      const code = normalizeReadableCode(s, OWNER_CODE_LENGTH);
      if (!code) {
        ctx.addIssue({ code: "custom", message: `The one-time code has ${OWNER_CODE_LENGTH} letters and digits, printed like ABCDE-FGHJK.` });
        return z.NEVER;
      }
      return code;
    }),
});

const codeMismatch = "That account number and one-time code do not match a current letter. Check both against your letter, or call the program office for a new one.";

/**
 * Signs in with the account number and one-time code printed on a letter. Throttled per
 * account number and per client address: a wrong pair counts; a locked key answers 429.
 */
export async function redeemOwnerCode(input: { accountNumber: string; code: string; address: string }, now = new Date()): Promise<{ userId: number }> {
  const accountKey = `owner-code:${input.accountNumber}`;
  const addressKey = input.address === "direct" ? null : `owner-code-ip:${input.address}`;
  await assertNotThrottled(addressKey ? [accountKey, addressKey] : [accountKey], now);
  const db = getDb();
  const [row] = await db
    .select({ id: authTokens.id, userId: authTokens.userId })
    .from(authTokens)
    .where(and(eq(authTokens.tokenHash, hashToken(input.code)), eq(authTokens.purpose, "owner_code"), isNull(authTokens.usedAt), gt(authTokens.expiresAt, now)))
    .limit(1);
  const [site] = row
    ? await db
        .select({ siteId: sites.id })
        .from(owners)
        .innerJoin(siteOwners, eq(siteOwners.ownerId, owners.id))
        .innerJoin(sites, eq(sites.id, siteOwners.siteId))
        .where(and(eq(owners.userId, row.userId), eq(sites.accountNumber, input.accountNumber)))
        .limit(1)
    : [];
  if (!row || !site) {
    await recordAttempt(accountKey, throttleRules.account, now);
    if (addressKey) await recordAttempt(addressKey, throttleRules.address, now);
    throw new InputError(codeMismatch);
  }
  await spendOwnerToken(row.id, row.userId, "code", now, codeMismatch);
  await clearAttempts(accountKey);
  return { userId: row.userId };
}

/**
 * "E-mail me a sign-in link": answers the same whether or not the address is on file (so the
 * form reveals nothing), throttled per address and per client.
 */
export async function requestOwnerSignInLink(input: { email: string; address: string }, now = new Date()): Promise<void> {
  const key = `owner-link:${input.email}`;
  const addressKey = input.address === "direct" ? null : `owner-link-ip:${input.address}`;
  await assertNotThrottled(addressKey ? [key, addressKey] : [key], now);
  await recordAttempt(key, throttleRules.account, now);
  if (addressKey) await recordAttempt(addressKey, throttleRules.address, now);
  const db = getDb();
  const rows = await db.select({ id: owners.id, name: owners.name, programName: programs.name }).from(owners).innerJoin(programs, eq(programs.id, owners.programId)).where(eq(owners.email, input.email));
  if (rows.length === 0) return;
  const token = await db.transaction(async (tx) => {
    const userIds = await resolveOwnerUsersForEmails(tx, [{ email: input.email, name: rows[0]!.name, ownerIds: rows.map((r) => r.id) }], now);
    const userId = userIds.get(input.email.toLowerCase());
    if (!userId) return null;
    const [secret] = await createOwnerTokens(tx, "owner_link", [userId], now);
    return secret ?? null;
  });
  if (!token) return;
  await sendEmailQuietly({
    to: input.email,
    subject: subjectOfOwnerSignInLink(),
    react: createElement(OwnerSignInLinkEmail, { name: rows[0]!.name, signInUrl: ownerLinkUrl(token), expiresOn: expiryWords(expiryOf("owner_link", now)), programNames: [...new Set(rows.map((r) => r.programName))] }),
  });
}
