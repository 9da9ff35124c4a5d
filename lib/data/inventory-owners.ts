import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { owners, siteOwners, sites, users } from "@/db/schema";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { NotFoundError } from "@/lib/errors";
import { recordAudit } from "./audit";
import { siteOwnerSchema, type SiteOwnerInput } from "./inventory-sites";

export const ownerSchema = siteOwnerSchema.pick({ name: true, email: true, phone: true, mailingAddress: true });

export interface OwnerDetail {
  id: number;
  name: string;
  email: string | null;
  phone: string;
  mailingAddress: string;
  portal: { status: "none" | "invited" | "active" | "disabled"; email: string | null; lastSignInAt: string | null };
  sites: { id: number; accountNumber: string; name: string; address: string; relation: string; receivesNotices: boolean }[];
}

export async function getOwnerForStaff(actor: Actor, ownerId: number): Promise<OwnerDetail> {
  assertCan(actor, "inventory.view");
  const programId = staffProgramId(actor);
  const db = getDb();
  const [row] = await db
    .select({ owner: owners, userStatus: users.status, userEmail: users.email, lastSignInAt: users.lastSignInAt })
    .from(owners)
    .leftJoin(users, eq(users.id, owners.userId))
    .where(and(eq(owners.id, ownerId), eq(owners.programId, programId)))
    .limit(1);
  if (!row) throw new NotFoundError("No such owner in your program.");
  const links = await db
    .select({ id: sites.id, accountNumber: sites.accountNumber, name: sites.name, addressLine1: sites.addressLine1, city: sites.city, relation: siteOwners.relation, receivesNotices: siteOwners.receivesNotices })
    .from(siteOwners)
    .innerJoin(sites, eq(sites.id, siteOwners.siteId))
    .where(eq(siteOwners.ownerId, ownerId))
    .orderBy(asc(sites.name));
  const status = row.userStatus;
  return {
    id: row.owner.id,
    name: row.owner.name,
    email: row.owner.email,
    phone: row.owner.phone,
    mailingAddress: row.owner.mailingAddress,
    portal: { status: !status ? "none" : status === "active" ? "active" : status === "invited" ? "invited" : "disabled", email: row.userEmail, lastSignInAt: row.lastSignInAt?.toISOString() ?? null },
    sites: links.map((l) => ({ id: l.id, accountNumber: l.accountNumber, name: l.name, address: `${l.addressLine1}, ${l.city}`, relation: l.relation, receivesNotices: l.receivesNotices })),
  };
}

/** Edits an owner's contact details (the portal account, if any, keeps its own sign-in address). */
export async function updateOwner(actor: Actor, ownerId: number, input: Pick<SiteOwnerInput, "name" | "email" | "phone" | "mailingAddress">): Promise<void> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  await getDb().transaction(async (tx) => {
    const [current] = await tx.select().from(owners).where(and(eq(owners.id, ownerId), eq(owners.programId, programId))).for("update");
    if (!current) throw new NotFoundError("No such owner in your program.");
    const next = { name: input.name, email: input.email || null, phone: input.phone, mailingAddress: input.mailingAddress };
    const before: Record<string, unknown> = {};
    const after: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(next)) {
      if (current[key as keyof typeof current] !== value) {
        before[key] = current[key as keyof typeof current];
        after[key] = value;
      }
    }
    if (Object.keys(after).length === 0) return;
    await tx.update(owners).set({ ...next, updatedAt: new Date() }).where(eq(owners.id, ownerId));
    await recordAudit(tx, { programId, actorId: actor.id, action: "owner.updated", entityType: "owner", entityId: ownerId, before, after });
  });
}
