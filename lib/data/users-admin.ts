import "server-only";
import { and, asc, count, desc, eq, gt, inArray, isNotNull, isNull, like, ne, or, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { authTokens, owners, siteOwners, users } from "@/db/schema";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { invalidateAllSessions } from "@/lib/auth/session";
import { ConflictError, InputError, isDuplicateKey, NotFoundError } from "@/lib/errors";
import { emailSchema, sendInvitation } from "./accounts";
import { recordAudit } from "./audit";
import { getProgramContext } from "./settings";

export interface StaffRow {
  id: number;
  name: string;
  email: string;
  phone: string;
  role: "inspector" | "admin";
  status: "active" | "invited" | "suspended" | "disabled";
  lastSignInAt: string | null;
  invitationExpiresAt: string | null;
  isSelf: boolean;
}

/** The program's inspectors and admins. */
export async function listProgramStaff(actor: Actor): Promise<StaffRow[]> {
  assertCan(actor, "users.manage");
  const programId = staffProgramId(actor);
  const db = getDb();
  const rows = await db
    .select({ id: users.id, name: users.name, email: users.email, phone: users.phone, role: users.role, status: users.status, lastSignInAt: users.lastSignInAt })
    .from(users)
    .where(and(eq(users.programId, programId), inArray(users.role, ["inspector", "admin"])))
    .orderBy(asc(users.name));
  const invited = rows.filter((r) => r.status === "invited").map((r) => r.id);
  const tokens = invited.length
    ? await db
        .select({ userId: authTokens.userId, expiresAt: authTokens.expiresAt })
        .from(authTokens)
        .where(and(inArray(authTokens.userId, invited), eq(authTokens.purpose, "invitation"), isNull(authTokens.usedAt), gt(authTokens.expiresAt, new Date())))
        .orderBy(desc(authTokens.expiresAt))
    : [];
  return rows.map((r) => ({
    ...r,
    role: r.role as StaffRow["role"],
    lastSignInAt: r.lastSignInAt?.toISOString() ?? null,
    invitationExpiresAt: tokens.find((t) => t.userId === r.id)?.expiresAt.toISOString() ?? null,
    isSelf: r.id === actor.id,
  }));
}

export const staffInviteSchema = z.object({
  name: z.string().trim().min(2, "Enter the person's full name.").max(120),
  email: emailSchema,
  role: z.enum(["inspector", "admin"], { message: "Choose inspector or program admin." }),
});

const purposeFor = (role: "inspector" | "admin", programName: string) =>
  role === "admin"
    ? `You have been given a program admin account for ${programName}: settings, users and the audit log, as well as the inspector's work.`
    : `You have been given an inspector account for ${programName}: the review queue, the inventory, the compliance picture and the tester roster.`;

/** Creates an invited inspector or admin account in the program and e-mails its set-up link; re-sends for a pending invitation. */
export async function inviteStaff(actor: Actor, input: z.infer<typeof staffInviteSchema>): Promise<{ userId: number; isResent: boolean }> {
  assertCan(actor, "users.manage");
  const context = await getProgramContext(staffProgramId(actor));
  const db = getDb();
  const [existing] = await db.select({ id: users.id, role: users.role, status: users.status, programId: users.programId }).from(users).where(eq(users.email, input.email)).limit(1);
  if (existing) {
    if (existing.programId === context.id && existing.status === "invited" && (existing.role === "inspector" || existing.role === "admin")) {
      await sendInvitation({ userId: existing.id, programName: context.name, purpose: purposeFor(existing.role, context.name), actorId: actor.id, programId: context.id });
      return { userId: existing.id, isResent: true };
    }
    throw new InputError("This e-mail address already has a Zoneward account.", { email: ["This address already has an account."] });
  }
  const now = new Date();
  let userId: number;
  try {
    userId = await db.transaction(async (tx) => {
      const [row] = await tx.insert(users).values({ email: input.email, name: input.name, role: input.role, programId: context.id, status: "invited", createdAt: now, updatedAt: now }).$returningId();
      await recordAudit(tx, { programId: context.id, actorId: actor.id, action: "user.created", entityType: "user", entityId: row!.id, after: { email: input.email, name: input.name, role: input.role } });
      return row!.id;
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw new InputError("This e-mail address already has a Zoneward account.", { email: ["This address already has an account."] });
    throw error;
  }
  await sendInvitation({ userId, programName: context.name, purpose: purposeFor(input.role, context.name), actorId: actor.id, programId: context.id });
  return { userId, isResent: false };
}

export const staffChangeSchema = z.object({
  status: z.enum(["active", "disabled"]).optional(),
  role: z.enum(["inspector", "admin"]).optional(),
});

/**
 * Disables or re-enables a staff account, or changes inspector ↔ admin. Disabling ends the
 * person's sessions at once. The program always keeps one active admin, and nobody locks
 * themselves out.
 */
export async function changeStaff(actor: Actor, userId: number, input: z.infer<typeof staffChangeSchema>): Promise<void> {
  assertCan(actor, "users.manage");
  const programId = staffProgramId(actor);
  if (userId === actor.id && (input.status === "disabled" || input.role === "inspector")) throw new ConflictError("You cannot disable your own account or give up your own admin role: ask another admin.");
  const isDisabling = await getDb().transaction(async (tx) => {
    const [user] = await tx.select().from(users).where(and(eq(users.id, userId), eq(users.programId, programId), inArray(users.role, ["inspector", "admin"]))).for("update");
    if (!user) throw new NotFoundError("No such staff member in your program.");
    const next = { status: input.status ?? user.status, role: input.role ?? user.role };
    if (user.status === "invited" && input.status === "active") throw new ConflictError("This person has not set up the account yet: re-send the invitation instead.");
    const losesAdmin = user.role === "admin" && user.status === "active" && (next.role !== "admin" || next.status !== "active");
    if (losesAdmin) {
      const [admins] = await tx.select({ n: count() }).from(users).where(and(eq(users.programId, programId), eq(users.role, "admin"), eq(users.status, "active"), ne(users.id, userId)));
      if (Number(admins?.n ?? 0) === 0) throw new ConflictError("The program needs at least one active admin.");
    }
    if (next.status === user.status && next.role === user.role) return false;
    await tx.update(users).set({ status: next.status, role: next.role, updatedAt: new Date() }).where(eq(users.id, userId));
    await recordAudit(tx, { programId, actorId: actor.id, action: next.status !== user.status ? (next.status === "disabled" ? "user.disabled" : "user.enabled") : "user.role_changed", entityType: "user", entityId: userId, before: { status: user.status, role: user.role }, after: next });
    return next.status === "disabled";
  });
  if (isDisabling) await invalidateAllSessions(userId);
}

export interface OwnerAccessRow {
  ownerId: number;
  name: string;
  email: string | null;
  siteCount: number;
  portal: "none" | "invited" | "active" | "disabled";
  lastSignInAt: string | null;
}

export const ownerAccessQuerySchema = z.object({
  q: z.string().trim().max(100).optional().default(""),
  portal: z.enum(["all", "none", "invited", "active"]).optional().default("all").catch("all"),
  after: z.coerce.number().int().min(0).optional().default(0).catch(0),
});

export const OWNER_ACCESS_PAGE = 30;

/** Owners of the program with an e-mail address and whether they use the owner portal. */
export async function listOwnerAccess(actor: Actor, query: z.infer<typeof ownerAccessQuerySchema>): Promise<{ rows: OwnerAccessRow[]; nextAfter: number | null }> {
  assertCan(actor, "users.manage");
  const programId = staffProgramId(actor);
  const db = getDb();
  const where: SQL[] = [eq(owners.programId, programId), isNotNull(owners.email), gt(owners.id, query.after)];
  if (query.q) where.push(or(like(owners.name, `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`), like(owners.email, `%${query.q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`))!);
  if (query.portal === "none") where.push(isNull(owners.userId));
  if (query.portal === "invited") where.push(eq(users.status, "invited"));
  if (query.portal === "active") where.push(eq(users.status, "active"));
  const rows = await db
    .select({ ownerId: owners.id, name: owners.name, email: owners.email, userStatus: users.status, lastSignInAt: users.lastSignInAt })
    .from(owners)
    .leftJoin(users, eq(users.id, owners.userId))
    .where(and(...where))
    .orderBy(asc(owners.id))
    .limit(OWNER_ACCESS_PAGE + 1);
  const page = rows.slice(0, OWNER_ACCESS_PAGE);
  const counts = page.length ? await db.select({ ownerId: siteOwners.ownerId, n: count() }).from(siteOwners).where(inArray(siteOwners.ownerId, page.map((r) => r.ownerId))).groupBy(siteOwners.ownerId) : [];
  return {
    rows: page.map((r) => ({
      ownerId: r.ownerId,
      name: r.name,
      email: r.email,
      siteCount: Number(counts.find((c) => c.ownerId === r.ownerId)?.n ?? 0),
      portal: !r.userStatus ? "none" : r.userStatus === "active" ? "active" : r.userStatus === "invited" ? "invited" : "disabled",
      lastSignInAt: r.lastSignInAt?.toISOString() ?? null,
    })),
    nextAfter: rows.length > OWNER_ACCESS_PAGE ? page.at(-1)!.ownerId : null,
  };
}

/**
 * Invites an owner to the owner portal: an owner account for their e-mail address (one account
 * may speak for owners in several programs), linked to this owner record, and the set-up link.
 * Someone already signed up is linked without a new e-mail.
 */
export async function inviteOwner(actor: Actor, ownerId: number): Promise<{ status: "invited" | "linked" }> {
  assertCan(actor, "inventory.manage");
  const context = await getProgramContext(staffProgramId(actor));
  const db = getDb();
  const [owner] = await db.select().from(owners).where(and(eq(owners.id, ownerId), eq(owners.programId, context.id))).limit(1);
  if (!owner) throw new NotFoundError("No such owner in your program.");
  if (!owner.email) throw new InputError("This owner has no e-mail address: add one first (notices go by letter until then).", { email: ["No e-mail address on file."] });
  const email = owner.email.toLowerCase();
  const now = new Date();
  const { userId, isActive } = await db.transaction(async (tx) => {
    const [existing] = await tx.select({ id: users.id, role: users.role, status: users.status }).from(users).where(eq(users.email, email)).for("update");
    if (existing && existing.role !== "owner") throw new ConflictError("This e-mail address belongs to a staff or tester account: give the owner a different address.");
    if (existing && (existing.status === "disabled" || existing.status === "suspended")) throw new ConflictError("The owner account for this address is disabled.");
    let id = existing?.id;
    if (!id) {
      const [row] = await tx.insert(users).values({ email, name: owner.name, phone: owner.phone, role: "owner", status: "invited", createdAt: now, updatedAt: now }).$returningId();
      id = row!.id;
      await recordAudit(tx, { programId: context.id, actorId: actor.id, action: "user.created", entityType: "user", entityId: id, after: { email, role: "owner", ownerId } });
    }
    if (owner.userId !== id) {
      await tx.update(owners).set({ userId: id, updatedAt: now }).where(eq(owners.id, ownerId));
      await recordAudit(tx, { programId: context.id, actorId: actor.id, action: "owner.portal_linked", entityType: "owner", entityId: ownerId, before: { userId: owner.userId }, after: { userId: id } });
    }
    return { userId: id, isActive: existing?.status === "active" };
  });
  if (isActive) return { status: "linked" };
  await sendInvitation({ userId, programName: context.name, purpose: `${context.name} invites you to its owner portal: see each of your assemblies' status and due dates, and download compliance certificates.`, actorId: actor.id, programId: context.id });
  return { status: "invited" };
}
