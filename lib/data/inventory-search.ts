import "server-only";
import { and, asc, count, eq, gt, inArray, isNull, like, or, sql, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, owners, siteOwners, sites, users } from "@/db/schema";
import { assemblyKinds, hazards } from "@/db/schema/inventory";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import type { ComplianceState } from "@/lib/rules";
import { hasKindMismatch, kindMismatchCondition, stateOf, warningsForAssembly } from "./inventory-rules";
import { getProgramContext } from "./settings";

/**
 * Inventory search. Account numbers and serials match from their start on their indexes; names
 * and addresses match anywhere in the text (a street name is in the middle of an address), and
 * the LIMIT stops the scan as soon as a page is full.
 */

export const inventorySearchSchema = z.object({
  q: z.string().trim().max(100).optional().default(""),
  view: z.enum(["sites", "assemblies", "owners"]).optional().default("sites").catch("sites"),
  show: z.enum(["all", "awaiting", "mismatch", "out_of_service"]).optional().default("all").catch("all"),
  kind: z.enum(assemblyKinds).optional().catch(undefined),
  hazard: z.enum(hazards).optional().catch(undefined),
  after: z.coerce.number().int().min(0).optional().default(0).catch(0),
});
export type InventorySearch = z.infer<typeof inventorySearchSchema>;

export const INVENTORY_PAGE_SIZE = 40;

/** LIKE pattern with the user's own % and _ taken literally. */
function contains(term: string): string {
  return `%${term.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}
function startsWith(term: string): string {
  return `${term.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

export interface SiteHit {
  id: number;
  accountNumber: string;
  name: string;
  address: string;
  hazard: string;
  facilityType: string;
  isActive: boolean;
  assemblyCount: number;
}

export interface AssemblyHit {
  id: number;
  siteId: number;
  siteName: string;
  address: string;
  kind: string;
  make: string;
  model: string;
  serial: string;
  location: string;
  hazard: string;
  status: string;
  nextDueOn: string | null;
  state: ComplianceState;
  warnings: string[];
  isMismatch: boolean;
}

export interface OwnerHit {
  id: number;
  name: string;
  email: string | null;
  phone: string;
  siteCount: number;
  portal: "none" | "invited" | "active" | "disabled";
}

export type InventoryResult =
  | { view: "sites"; hits: SiteHit[]; nextAfter: number | null }
  | { view: "assemblies"; hits: AssemblyHit[]; nextAfter: number | null }
  | { view: "owners"; hits: OwnerHit[]; nextAfter: number | null };

export async function searchInventory(actor: Actor, search: InventorySearch): Promise<InventoryResult> {
  assertCan(actor, "inventory.view");
  const context = await getProgramContext(staffProgramId(actor));
  const programId = context.id;
  const db = getDb();
  const q = search.q;
  const limit = INVENTORY_PAGE_SIZE + 1;

  if (search.view === "owners") {
    const where: SQL[] = [eq(owners.programId, programId), gt(owners.id, search.after)];
    if (q) where.push(or(like(owners.name, contains(q)), like(owners.email, startsWith(q.toLowerCase())), like(owners.phone, contains(q)))!);
    const rows = await db
      .select({ id: owners.id, name: owners.name, email: owners.email, phone: owners.phone, userStatus: users.status })
      .from(owners)
      .leftJoin(users, eq(users.id, owners.userId))
      .where(and(...where))
      .orderBy(asc(owners.id))
      .limit(limit);
    const page = rows.slice(0, INVENTORY_PAGE_SIZE);
    const siteCounts = page.length ? await db.select({ ownerId: siteOwners.ownerId, n: count() }).from(siteOwners).where(inArray(siteOwners.ownerId, page.map((r) => r.id))).groupBy(siteOwners.ownerId) : [];
    const byOwner = new Map(siteCounts.map((c) => [c.ownerId, Number(c.n)]));
    return {
      view: "owners",
      hits: page.map(({ userStatus, ...r }) => ({ ...r, siteCount: byOwner.get(r.id) ?? 0, portal: !userStatus ? "none" : userStatus === "active" ? "active" : userStatus === "invited" ? "invited" : "disabled" })),
      nextAfter: rows.length > INVENTORY_PAGE_SIZE ? page.at(-1)!.id : null,
    };
  }

  if (search.view === "assemblies") {
    const where: SQL[] = [eq(assemblies.programId, programId), isNull(assemblies.mergedIntoId), gt(assemblies.id, search.after)];
    if (q) where.push(or(like(assemblies.serial, startsWith(q)), like(sites.accountNumber, startsWith(q)), like(sites.name, contains(q)), like(sites.addressLine1, contains(q)), like(assemblies.location, contains(q)))!);
    if (search.kind) where.push(eq(assemblies.kind, search.kind));
    if (search.hazard) where.push(eq(assemblies.hazard, search.hazard));
    if (search.show === "awaiting") where.push(eq(assemblies.status, "awaiting_confirmation"));
    else if (search.show === "mismatch") where.push(inArray(assemblies.status, ["active", "awaiting_confirmation"]), kindMismatchCondition());
    else if (search.show === "out_of_service") where.push(inArray(assemblies.status, ["removed", "replaced"]));
    const rows = await db
      .select({ a: assemblies, siteName: sites.name, address: sites.addressLine1, city: sites.city })
      .from(assemblies)
      .innerJoin(sites, eq(sites.id, assemblies.siteId))
      .where(and(...where))
      .orderBy(asc(assemblies.id))
      .limit(limit);
    const page = rows.slice(0, INVENTORY_PAGE_SIZE);
    return {
      view: "assemblies",
      hits: page.map(({ a, siteName, address, city }) => {
        const isInService = a.status === "active" || a.status === "awaiting_confirmation";
        return {
          id: a.id,
          siteId: a.siteId,
          siteName,
          address: `${address}, ${city}`,
          kind: a.kind,
          make: a.make,
          model: a.model,
          serial: a.serial,
          location: a.location,
          hazard: a.hazard,
          status: a.status,
          nextDueOn: a.nextDueOn,
          state: stateOf(a, context.today, context.rules),
          warnings: isInService ? warningsForAssembly(a) : [],
          isMismatch: isInService && hasKindMismatch(a),
        };
      }),
      nextAfter: rows.length > INVENTORY_PAGE_SIZE ? page.at(-1)!.a.id : null,
    };
  }

  const where: SQL[] = [eq(sites.programId, programId), gt(sites.id, search.after)];
  if (q) where.push(or(like(sites.accountNumber, startsWith(q)), like(sites.name, contains(q)), like(sites.addressLine1, contains(q)), like(sites.contactName, contains(q)))!);
  if (search.hazard) where.push(eq(sites.hazard, search.hazard));
  const rows = await db
    .select({ id: sites.id, accountNumber: sites.accountNumber, name: sites.name, addressLine1: sites.addressLine1, city: sites.city, hazard: sites.hazard, facilityType: sites.facilityType, isActive: sites.isActive })
    .from(sites)
    .where(and(...where))
    .orderBy(asc(sites.id))
    .limit(limit);
  const page = rows.slice(0, INVENTORY_PAGE_SIZE);
  const counts = page.length
    ? await db
        .select({ siteId: assemblies.siteId, n: count() })
        .from(assemblies)
        .where(and(inArray(assemblies.siteId, page.map((r) => r.id)), inArray(assemblies.status, ["active", "awaiting_confirmation"])))
        .groupBy(assemblies.siteId)
    : [];
  const bySite = new Map(counts.map((c) => [c.siteId, Number(c.n)]));
  return {
    view: "sites",
    hits: page.map((r) => ({ id: r.id, accountNumber: r.accountNumber, name: r.name, address: `${r.addressLine1}, ${r.city}`, hazard: r.hazard, facilityType: r.facilityType, isActive: r.isActive, assemblyCount: bySite.get(r.id) ?? 0 })),
    nextAfter: rows.length > INVENTORY_PAGE_SIZE ? page.at(-1)!.id : null,
  };
}

export interface InventoryCounts {
  sites: number;
  inService: number;
  awaitingConfirmation: number;
  mismatches: number;
  outOfService: number;
}

/** The inventory's headline numbers (index range counts). */
export async function getInventoryCounts(actor: Actor): Promise<InventoryCounts> {
  assertCan(actor, "inventory.view");
  const programId = staffProgramId(actor);
  const db = getDb();
  const [[siteCount], byStatus, [mismatch]] = await Promise.all([
    db.select({ n: count() }).from(sites).where(eq(sites.programId, programId)),
    db.select({ status: assemblies.status, n: count() }).from(assemblies).where(and(eq(assemblies.programId, programId), isNull(assemblies.mergedIntoId))).groupBy(assemblies.status),
    db
      .select({ n: count() })
      .from(assemblies)
      .where(and(eq(assemblies.programId, programId), inArray(assemblies.status, ["active", "awaiting_confirmation"]), kindMismatchCondition())),
  ]);
  const n = (status: string) => Number(byStatus.find((r) => r.status === status)?.n ?? 0);
  return { sites: Number(siteCount?.n ?? 0), inService: n("active"), awaitingConfirmation: n("awaiting_confirmation"), mismatches: Number(mismatch?.n ?? 0), outOfService: n("removed") + n("replaced") };
}

/** Facility types in use in the program, for filters. */
export async function listFacilityTypes(actor: Actor): Promise<string[]> {
  assertCan(actor, "inventory.view");
  const programId = staffProgramId(actor);
  const rows = await getDb().selectDistinct({ t: sites.facilityType }).from(sites).where(and(eq(sites.programId, programId), sql`${sites.facilityType} <> ''`));
  return rows.map((r) => r.t).sort((a, b) => a.localeCompare(b));
}
