import "server-only";
import { count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { assemblies, owners, programs, siteOwners, sites } from "@/db/schema";
import { assertCan, type Actor } from "@/lib/auth/permissions";

/** The sites an owner's account speaks for, across programs. */
export async function listOwnerSites(actor: Actor) {
  assertCan(actor, "owner.portal");
  return getDb()
    .select({
      siteId: sites.id,
      siteName: sites.name,
      accountNumber: sites.accountNumber,
      addressLine1: sites.addressLine1,
      city: sites.city,
      programName: programs.name,
      assemblyCount: count(assemblies.id),
    })
    .from(owners)
    .innerJoin(siteOwners, eq(siteOwners.ownerId, owners.id))
    .innerJoin(sites, eq(sites.id, siteOwners.siteId))
    .innerJoin(programs, eq(programs.id, sites.programId))
    .leftJoin(assemblies, eq(assemblies.siteId, sites.id))
    .where(eq(owners.userId, actor.id))
    .groupBy(sites.id, programs.name)
    .orderBy(sites.addressLine1);
}
