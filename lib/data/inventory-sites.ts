import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, owners, siteOwners, sites, users } from "@/db/schema";
import { hazards } from "@/db/schema/inventory";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { InputError, isDuplicateKey, NotFoundError } from "@/lib/errors";
import type { ComplianceState } from "@/lib/rules";
import { recomputeAssemblyFacts } from "./assembly-facts";
import { recordAudit } from "./audit";
import { hasKindMismatch, stateOf, warningsForAssembly } from "./inventory-rules";
import { getProgramContext } from "./settings";

const optionalText = (max: number, label: string) => z.string().trim().max(max, `${label}: at most ${max} characters.`).optional().default("");

export const siteSchema = z.object({
  accountNumber: z.string().trim().min(1, "Enter the service account number.").max(40, "At most 40 characters."),
  name: z.string().trim().min(1, "Enter the site's name (the business or the household).").max(160, "At most 160 characters."),
  addressLine1: z.string().trim().min(1, "Enter the service address.").max(200, "At most 200 characters."),
  addressLine2: optionalText(200, "Address line 2"),
  city: z.string().trim().min(1, "Enter the town or city.").max(100, "At most 100 characters."),
  postalCode: optionalText(20, "Postal code"),
  hazard: z.enum(hazards, { message: "Choose the degree of hazard: severe, high or low." }),
  facilityType: optionalText(60, "Facility type"),
  contactName: optionalText(120, "Contact name"),
  contactPhone: optionalText(40, "Contact phone"),
  notes: optionalText(2000, "Notes"),
  isActive: z.boolean().optional().default(true),
  /** When the site's hazard changes, give its assemblies the same hazard (and recompute their deadlines). */
  applyHazardToAssemblies: z.boolean().optional().default(true),
});
export type SiteInput = z.infer<typeof siteSchema>;

export interface SiteOwnerLink {
  ownerId: number;
  name: string;
  email: string | null;
  phone: string;
  mailingAddress: string;
  relation: "owner" | "manager";
  receivesNotices: boolean;
  portal: "none" | "invited" | "active" | "disabled";
}

export interface SiteAssemblyRow {
  id: number;
  kind: string;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  hazard: string;
  status: string;
  installedOn: string | null;
  removedOn: string | null;
  lastTestedOn: string | null;
  lastOutcome: string | null;
  nextDueOn: string | null;
  repairDueOn: string | null;
  noticeStage: string | null;
  state: ComplianceState;
  warnings: string[];
  isMismatch: boolean;
}

export interface SiteDetail {
  id: number;
  accountNumber: string;
  name: string;
  addressLine1: string;
  addressLine2: string;
  city: string;
  postalCode: string;
  hazard: "severe" | "high" | "low";
  facilityType: string;
  contactName: string;
  contactPhone: string;
  notes: string;
  isActive: boolean;
  owners: SiteOwnerLink[];
  assemblies: SiteAssemblyRow[];
  today: string;
}

async function siteInProgramOrThrow(programId: number, siteId: number) {
  const [site] = await getDb().select().from(sites).where(and(eq(sites.id, siteId), eq(sites.programId, programId))).limit(1);
  if (!site) throw new NotFoundError("No such site in your program.");
  return site;
}

function portalStatusOf(status: string | null): SiteOwnerLink["portal"] {
  if (!status) return "none";
  if (status === "active") return "active";
  if (status === "invited") return "invited";
  return "disabled";
}

export async function getSiteForStaff(actor: Actor, siteId: number): Promise<SiteDetail> {
  assertCan(actor, "inventory.view");
  const context = await getProgramContext(staffProgramId(actor));
  const site = await siteInProgramOrThrow(context.id, siteId);
  const db = getDb();
  const [ownerRows, assemblyRows] = await Promise.all([
    db
      .select({ ownerId: owners.id, name: owners.name, email: owners.email, phone: owners.phone, mailingAddress: owners.mailingAddress, relation: siteOwners.relation, receivesNotices: siteOwners.receivesNotices, userStatus: users.status })
      .from(siteOwners)
      .innerJoin(owners, eq(owners.id, siteOwners.ownerId))
      .leftJoin(users, eq(users.id, owners.userId))
      .where(eq(siteOwners.siteId, site.id))
      .orderBy(asc(owners.name)),
    db.select().from(assemblies).where(eq(assemblies.siteId, site.id)).orderBy(asc(assemblies.id)),
  ]);
  return {
    id: site.id,
    accountNumber: site.accountNumber,
    name: site.name,
    addressLine1: site.addressLine1,
    addressLine2: site.addressLine2,
    city: site.city,
    postalCode: site.postalCode,
    hazard: site.hazard,
    facilityType: site.facilityType,
    contactName: site.contactName,
    contactPhone: site.contactPhone,
    notes: site.notes ?? "",
    isActive: site.isActive,
    today: context.today,
    owners: ownerRows.map(({ userStatus, ...o }) => ({ ...o, portal: portalStatusOf(userStatus) })),
    assemblies: assemblyRows
      .filter((a) => a.mergedIntoId === null)
      .map((a) => ({
        id: a.id,
        kind: a.kind,
        make: a.make,
        model: a.model,
        size: a.size,
        serial: a.serial,
        location: a.location,
        hazard: a.hazard,
        status: a.status,
        installedOn: a.installedOn,
        removedOn: a.removedOn,
        lastTestedOn: a.lastTestedOn,
        lastOutcome: a.lastOutcome,
        nextDueOn: a.nextDueOn,
        repairDueOn: a.repairDueOn,
        noticeStage: a.noticeStage,
        state: stateOf(a, context.today, context.rules),
        warnings: a.status === "active" || a.status === "awaiting_confirmation" ? warningsForAssembly(a) : [],
        isMismatch: (a.status === "active" || a.status === "awaiting_confirmation") && hasKindMismatch(a),
      })),
  };
}

function siteValues(input: SiteInput) {
  return {
    accountNumber: input.accountNumber,
    name: input.name,
    addressLine1: input.addressLine1,
    addressLine2: input.addressLine2,
    city: input.city,
    postalCode: input.postalCode,
    hazard: input.hazard,
    facilityType: input.facilityType,
    contactName: input.contactName,
    contactPhone: input.contactPhone,
    notes: input.notes || null,
    isActive: input.isActive,
  };
}

function accountTaken(error: unknown): never {
  if (isDuplicateKey(error)) throw new InputError("Another site in the program has this account number.", { accountNumber: ["This account number belongs to another site."] });
  throw error;
}

export async function createSite(actor: Actor, input: SiteInput): Promise<{ id: number }> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  const now = new Date();
  try {
    return await getDb().transaction(async (tx) => {
      const [row] = await tx
        .insert(sites)
        .values({ programId, ...siteValues(input), createdAt: now, updatedAt: now })
        .$returningId();
      await recordAudit(tx, { programId, actorId: actor.id, action: "site.created", entityType: "site", entityId: row!.id, after: siteValues(input) });
      return { id: row!.id };
    });
  } catch (error) {
    accountTaken(error);
  }
}

/** Edits a site; a new hazard is passed to its assemblies (their repair deadlines follow it) unless asked not to. */
export async function updateSite(actor: Actor, siteId: number, input: SiteInput): Promise<{ assembliesUpdated: number }> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  try {
    return await getDb().transaction(async (tx) => {
      const [site] = await tx.select().from(sites).where(and(eq(sites.id, siteId), eq(sites.programId, programId))).for("update");
      if (!site) throw new NotFoundError("No such site in your program.");
      const values = siteValues(input);
      const before: Record<string, unknown> = {};
      const after: Record<string, unknown> = {};
      for (const [key, value] of Object.entries(values)) {
        const old = site[key as keyof typeof site] ?? null;
        if (old !== value) {
          before[key] = old;
          after[key] = value;
        }
      }
      if (Object.keys(after).length === 0) return { assembliesUpdated: 0 };
      await tx.update(sites).set({ ...values, updatedAt: new Date() }).where(eq(sites.id, site.id));
      let assembliesUpdated = 0;
      if (input.applyHazardToAssemblies && site.hazard !== input.hazard) {
        const affected = await tx.select({ id: assemblies.id }).from(assemblies).where(and(eq(assemblies.siteId, site.id), eq(assemblies.hazard, site.hazard)));
        if (affected.length) {
          await tx.update(assemblies).set({ hazard: input.hazard, updatedAt: new Date() }).where(inArray(assemblies.id, affected.map((a) => a.id)));
          for (const a of affected) await recomputeAssemblyFacts(tx, a.id);
          assembliesUpdated = affected.length;
          after.assembliesGivenHazard = affected.map((a) => a.id);
        }
      }
      await recordAudit(tx, { programId, actorId: actor.id, action: "site.updated", entityType: "site", entityId: site.id, before, after });
      return { assembliesUpdated };
    });
  } catch (error) {
    accountTaken(error);
  }
}

export const siteOwnerSchema = z.object({
  name: z.string().trim().min(2, "Enter the owner's or manager's name.").max(160),
  email: z
    .string()
    .trim()
    .max(254)
    .transform((s) => s.toLowerCase())
    .pipe(z.union([z.literal(""), z.email("Enter an e-mail address like name@example.org, or leave it empty (notices then go by letter).")]))
    .optional()
    .default(""),
  phone: optionalText(40, "Phone"),
  mailingAddress: optionalText(300, "Mailing address"),
  relation: z.enum(["owner", "manager"]).optional().default("owner"),
  receivesNotices: z.boolean().optional().default(true),
});
export type SiteOwnerInput = z.infer<typeof siteOwnerSchema>;

/** Adds a contact to a site: an existing owner of the program with the same e-mail address is reused. */
export async function addSiteOwner(actor: Actor, siteId: number, input: SiteOwnerInput): Promise<{ ownerId: number }> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  await siteInProgramOrThrow(programId, siteId);
  const now = new Date();
  return getDb().transaction(async (tx) => {
    let ownerId: number | null = null;
    if (input.email) {
      const [existing] = await tx.select({ id: owners.id }).from(owners).where(and(eq(owners.programId, programId), eq(owners.email, input.email))).limit(1);
      ownerId = existing?.id ?? null;
    }
    if (ownerId === null) {
      const [row] = await tx
        .insert(owners)
        .values({ programId, name: input.name, email: input.email || null, phone: input.phone, mailingAddress: input.mailingAddress, createdAt: now, updatedAt: now })
        .$returningId();
      ownerId = row!.id;
      await recordAudit(tx, { programId, actorId: actor.id, action: "owner.created", entityType: "owner", entityId: ownerId, after: { name: input.name, email: input.email || null } });
    }
    const [link] = await tx.select({ ownerId: siteOwners.ownerId }).from(siteOwners).where(and(eq(siteOwners.siteId, siteId), eq(siteOwners.ownerId, ownerId))).limit(1);
    if (link) throw new InputError("This contact is already on the site.", { email: ["Already a contact of this site."] });
    await tx.insert(siteOwners).values({ siteId, ownerId, relation: input.relation, receivesNotices: input.receivesNotices });
    await recordAudit(tx, { programId, actorId: actor.id, action: "site.owner_added", entityType: "site", entityId: siteId, after: { ownerId, relation: input.relation, receivesNotices: input.receivesNotices } });
    return { ownerId };
  });
}

export const siteOwnerLinkSchema = z.object({
  relation: z.enum(["owner", "manager"]).optional(),
  receivesNotices: z.boolean().optional(),
  remove: z.boolean().optional().default(false),
});

/** Changes or removes a site–owner link; the owner record itself stays. */
export async function updateSiteOwnerLink(actor: Actor, siteId: number, ownerId: number, input: z.infer<typeof siteOwnerLinkSchema>): Promise<void> {
  assertCan(actor, "inventory.manage");
  const programId = staffProgramId(actor);
  await siteInProgramOrThrow(programId, siteId);
  await getDb().transaction(async (tx) => {
    const [link] = await tx.select().from(siteOwners).where(and(eq(siteOwners.siteId, siteId), eq(siteOwners.ownerId, ownerId))).for("update");
    if (!link) throw new NotFoundError("This contact is not on the site.");
    if (input.remove) {
      await tx.delete(siteOwners).where(and(eq(siteOwners.siteId, siteId), eq(siteOwners.ownerId, ownerId)));
      await recordAudit(tx, { programId, actorId: actor.id, action: "site.owner_removed", entityType: "site", entityId: siteId, before: link });
      return;
    }
    const next = { relation: input.relation ?? link.relation, receivesNotices: input.receivesNotices ?? link.receivesNotices };
    await tx.update(siteOwners).set(next).where(and(eq(siteOwners.siteId, siteId), eq(siteOwners.ownerId, ownerId)));
    await recordAudit(tx, { programId, actorId: actor.id, action: "site.owner_updated", entityType: "site", entityId: siteId, before: { ownerId, relation: link.relation, receivesNotices: link.receivesNotices }, after: { ownerId, ...next } });
  });
}
