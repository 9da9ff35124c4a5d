import "server-only";
import { and, eq, gt, inArray, isNull } from "drizzle-orm";
import { createElement } from "react";
import { z } from "zod";
import { getDb } from "@/db/client";
import { authTokens, certifications, companies, programs, testerApprovals, users } from "@/db/schema";
import AccountInvitationEmail, { subjectOfAccountInvitation } from "@/emails/account-invitation";
import PasswordResetEmail, { subjectOfPasswordReset } from "@/emails/password-reset";
import TesterRegistrationDecisionEmail, { subjectOfTesterRegistrationDecision } from "@/emails/tester-registration-decision";
import { hashPassword, verifyAgainstDummy, verifyPassword } from "@/lib/auth/password";
import { invalidateAllSessions } from "@/lib/auth/session";
import { assertNotThrottled, clearAttempts, recordAttempt, throttleRules } from "@/lib/auth/throttle";
import { generateSecretToken, hashToken } from "@/lib/auth/tokens";
import { getEnv } from "@/lib/env";
import { InputError, isDuplicateKey } from "@/lib/errors";
import { sendEmailQuietly } from "@/lib/mail/send";
import { recordAudit } from "./audit";

export const emailSchema = z
  .string()
  .trim()
  .max(254, "An e-mail address has at most 254 characters.")
  .pipe(z.email("Enter an e-mail address like name@example.org."))
  .transform((s) => s.toLowerCase());

export const newPasswordSchema = z
  .string()
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.")
  .refine((s) => s.trim().length >= 10, "Use at least 10 characters that are not spaces.");

const RESET_MINUTES = 60;
const INVITATION_DAYS = 7;

function absoluteUrl(path: string): string {
  return new URL(path, getEnv().APP_URL).toString();
}

const genericSignInError = "That e-mail address and password do not match an active account.";

/** Checks a password sign-in. Throttled per account and per client address. */
export async function verifySignIn(input: { email: string; password: string; address: string }): Promise<{ userId: number }> {
  const accountKey = `signin:${input.email}`;
  const addressKey = input.address === "direct" ? null : `signin-ip:${input.address}`;
  await assertNotThrottled(addressKey ? [accountKey, addressKey] : [accountKey]);
  const [user] = await getDb()
    .select({ id: users.id, passwordHash: users.passwordHash, status: users.status })
    .from(users)
    .where(eq(users.email, input.email))
    .limit(1);
  const isValid = user?.passwordHash ? await verifyPassword(user.passwordHash, input.password) : await verifyAgainstDummy(input.password);
  if (!user || !isValid) {
    await recordAttempt(accountKey, throttleRules.account);
    if (addressKey) await recordAttempt(addressKey, throttleRules.address);
    throw new InputError(genericSignInError);
  }
  if (user.status === "suspended" || user.status === "disabled") throw new InputError("This account is not active. Please contact the program office.");
  if (user.status === "invited") throw new InputError("This account is not set up yet: use the link in your invitation e-mail.");
  await clearAttempts(accountKey);
  return { userId: user.id };
}

export const testerRegistrationSchema = z.object({
  name: z.string().trim().min(2, "Enter your full name.").max(120),
  email: emailSchema,
  phone: z.string().trim().min(7, "Enter a phone number where the program can reach you.").max(40),
  password: newPasswordSchema,
  companyName: z.string().trim().max(160).optional().default(""),
  programIds: z
    .array(z.coerce.number().int().positive())
    .min(1, "Pick at least one program to file tests with.")
    .max(20),
  certifyingBody: z.string().trim().min(2, "Enter the body that certified you.").max(160),
  certificationNumber: z.string().trim().min(2, "Enter your certificate number.").max(60),
  certificationExpiresOn: z.iso.date("Enter the expiry date as YYYY-MM-DD."),
});
export type TesterRegistration = z.infer<typeof testerRegistrationSchema>;

/** Self-registration: the account can sign in at once; filing waits for each program's approval. */
export async function registerTester(input: TesterRegistration): Promise<{ userId: number }> {
  const db = getDb();
  const known = await db.select({ id: programs.id, name: programs.name }).from(programs).where(inArray(programs.id, input.programIds));
  if (known.length !== new Set(input.programIds).size) throw new InputError("Pick programs from the list.", { programIds: ["Pick programs from the list."] });
  const passwordHash = await hashPassword(input.password);
  const now = new Date();
  let userId: number;
  try {
    userId = await db.transaction(async (tx) => {
      let companyId: number | null = null;
      if (input.companyName) {
        const [company] = await tx.select({ id: companies.id }).from(companies).where(eq(companies.name, input.companyName)).limit(1);
        companyId = company?.id ?? (await tx.insert(companies).values({ name: input.companyName, createdAt: now }).$returningId())[0]!.id;
      }
      const [created] = await tx
        .insert(users)
        .values({ email: input.email, name: input.name, phone: input.phone, passwordHash, role: "tester", status: "active", companyId, passwordChangedAt: now, createdAt: now, updatedAt: now })
        .$returningId();
      const id = created!.id;
      await tx.insert(certifications).values({ testerId: id, certifyingBody: input.certifyingBody, number: input.certificationNumber, expiresOn: input.certificationExpiresOn, createdAt: now, updatedAt: now });
      await tx.insert(testerApprovals).values(known.map((p) => ({ programId: p.id, testerId: id, status: "pending" as const, createdAt: now })));
      for (const p of known) await recordAudit(tx, { programId: p.id, actorId: id, action: "tester.registered", entityType: "user", entityId: id, after: { email: input.email, name: input.name } });
      return id;
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw new InputError("An account with this e-mail address already exists. Sign in, or reset your password.", { email: ["An account with this e-mail address already exists."] });
    throw error;
  }
  for (const p of known) {
    await sendEmailQuietly({
      to: input.email,
      subject: subjectOfTesterRegistrationDecision({ programName: p.name, decision: "received" }),
      fromName: p.name,
      react: createElement(TesterRegistrationDecisionEmail, { name: input.name, programName: p.name, decision: "received", signInUrl: absoluteUrl("/login") }),
    });
  }
  return { userId };
}

/** Always answers the same way, whether or not the address has an account. */
export async function requestPasswordReset(input: { email: string; address: string }): Promise<void> {
  const key = `reset:${input.email}`;
  await assertNotThrottled(input.address === "direct" ? [key] : [key, `reset-ip:${input.address}`]);
  await recordAttempt(key, throttleRules.account);
  if (input.address !== "direct") await recordAttempt(`reset-ip:${input.address}`, throttleRules.address);
  const db = getDb();
  const [user] = await db.select({ id: users.id, name: users.name, status: users.status }).from(users).where(eq(users.email, input.email)).limit(1);
  if (!user || user.status !== "active") return;
  const token = generateSecretToken();
  const now = new Date();
  await db.insert(authTokens).values({ tokenHash: hashToken(token), userId: user.id, purpose: "password_reset", expiresAt: new Date(now.getTime() + RESET_MINUTES * 60_000), createdAt: now });
  await sendEmailQuietly({
    to: input.email,
    subject: subjectOfPasswordReset(),
    react: createElement(PasswordResetEmail, { name: user.name, resetUrl: absoluteUrl(`/reset-password/${token}`), expiresInMinutes: RESET_MINUTES }),
  });
}

type TokenPurpose = (typeof authTokens.$inferSelect)["purpose"];

/** A usable token row (unused, unexpired), or null. */
export async function findUsableToken(token: string, purpose: TokenPurpose) {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
  const [row] = await getDb()
    .select({ id: authTokens.id, userId: authTokens.userId, email: users.email, name: users.name })
    .from(authTokens)
    .innerJoin(users, eq(users.id, authTokens.userId))
    .where(and(eq(authTokens.tokenHash, hashToken(token)), eq(authTokens.purpose, purpose), isNull(authTokens.usedAt), gt(authTokens.expiresAt, new Date())))
    .limit(1);
  return row ?? null;
}

const expiredLink = "This link has expired or was already used. Ask for a new one.";

/**
 * Spends a token and sets the password in one transaction; the conditional update makes a
 * link usable exactly once even when two tabs submit together.
 */
async function spendTokenAndSetPassword(token: string, purpose: TokenPurpose, password: string, activate: boolean): Promise<{ userId: number }> {
  const row = await findUsableToken(token, purpose);
  if (!row) throw new InputError(expiredLink);
  const passwordHash = await hashPassword(password);
  const now = new Date();
  await getDb().transaction(async (tx) => {
    const [spent] = await tx
      .update(authTokens)
      .set({ usedAt: now })
      .where(and(eq(authTokens.id, row.id), isNull(authTokens.usedAt), gt(authTokens.expiresAt, now)));
    if (spent.affectedRows !== 1) throw new InputError(expiredLink);
    await tx
      .update(users)
      .set({ passwordHash, passwordChangedAt: now, updatedAt: now, ...(activate ? { status: "active" as const } : {}) })
      .where(eq(users.id, row.userId));
    await recordAudit(tx, { actorId: row.userId, action: purpose === "password_reset" ? "user.password_reset" : "user.invitation_accepted", entityType: "user", entityId: row.userId });
  });
  // Every other session of this user ends when the password changes.
  await invalidateAllSessions(row.userId);
  return { userId: row.userId };
}

export function resetPassword(token: string, password: string) {
  return spendTokenAndSetPassword(token, "password_reset", password, false);
}

export function acceptInvitation(token: string, password: string) {
  return spendTokenAndSetPassword(token, "invitation", password, true);
}

/** Creates (or reuses) a sign-in account in the "invited" state and e-mails its set-up link. */
export async function sendInvitation(input: { userId: number; programName: string; purpose: string; actorId: number; programId: number | null }): Promise<void> {
  const db = getDb();
  const [user] = await db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.id, input.userId)).limit(1);
  if (!user) throw new InputError("No such account.");
  const token = generateSecretToken();
  const now = new Date();
  await db.transaction(async (tx) => {
    await tx.insert(authTokens).values({ tokenHash: hashToken(token), userId: user.id, purpose: "invitation", expiresAt: new Date(now.getTime() + INVITATION_DAYS * 86_400_000), createdAt: now });
    await recordAudit(tx, { programId: input.programId, actorId: input.actorId, action: "user.invited", entityType: "user", entityId: user.id });
  });
  await sendEmailQuietly({
    to: user.email,
    subject: subjectOfAccountInvitation({ programName: input.programName }),
    fromName: input.programName,
    react: createElement(AccountInvitationEmail, { name: user.name, programName: input.programName, inviteUrl: absoluteUrl(`/invite/${token}`), expiresInDays: INVITATION_DAYS, purpose: input.purpose }),
  });
}

export async function listPublicPrograms() {
  return getDb().select({ id: programs.id, name: programs.name, shortName: programs.shortName }).from(programs).orderBy(programs.name);
}
