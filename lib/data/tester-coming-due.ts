import "server-only";
import { and, asc, between, eq, gte, inArray, max, or, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { assemblies, programs, sites, testReports } from "@/db/schema";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { addDays, addMonths, daysBetween, type AssemblyKind } from "@/lib/rules";
import { listApprovedPrograms } from "./tester-programs";

export const COMING_DUE_DAYS = 60;

export interface ComingDueAssembly {
  id: number;
  programName: string;
  kind: AssemblyKind;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  lastTestedOn: string | null;
  lastOutcome: "pass" | "fail" | null;
  nextDueOn: string | null;
  repairDueOn: string | null;
  /** "repair": the tester's last test failed and the repair deadline runs; "due": the yearly test. */
  why: "repair" | "due";
  /** Days from today to the date that matters (negative = past it). */
  daysLeft: number;
  site: { name: string; addressLine1: string; city: string; accountNumber: string; contactName: string; contactPhone: string };
}

/**
 * Assemblies whose latest test was this tester's and whose next test falls due within `days`
 * (60 by default), plus those the tester failed that still await repair: the tester's book of
 * customers to call this month. The tester's own tests come from the (tester_id, tested_at)
 * index; the due dates are the facts kept on each assembly row.
 */
export async function listComingDue(actor: Actor, options: { days?: number; limit?: number } = {}): Promise<{ today: string; until: string; rows: ComingDueAssembly[] }> {
  assertCan(actor, "tester.home");
  const approved = await listApprovedPrograms(actor);
  const today = approved[0]?.today ?? new Date().toISOString().slice(0, 10);
  const until = addDays(today, options.days ?? COMING_DUE_DAYS);
  if (approved.length === 0) return { today, until, rows: [] };
  const db = getDb();
  // Three years back covers a two-year interval with room for a late test.
  const since = new Date(`${addMonths(today, -36)}T00:00:00Z`);
  const mine = db
    .select({ assemblyId: testReports.assemblyId, lastByMe: max(testReports.testedOn).as("last_by_me") })
    .from(testReports)
    .where(and(eq(testReports.testerId, actor.id), gte(testReports.testedAt, since), inArray(testReports.status, ["awaiting_fee", "queued", "accepted"])))
    .groupBy(testReports.assemblyId)
    .as("mine");
  const rows = await db
    .select({
      id: assemblies.id,
      programName: programs.shortName,
      kind: assemblies.kind,
      make: assemblies.make,
      model: assemblies.model,
      size: assemblies.size,
      serial: assemblies.serial,
      location: assemblies.location,
      lastTestedOn: assemblies.lastTestedOn,
      lastOutcome: assemblies.lastOutcome,
      nextDueOn: assemblies.nextDueOn,
      repairDueOn: assemblies.repairDueOn,
      baseState: assemblies.baseState,
      siteName: sites.name,
      addressLine1: sites.addressLine1,
      city: sites.city,
      accountNumber: sites.accountNumber,
      contactName: sites.contactName,
      contactPhone: sites.contactPhone,
    })
    .from(assemblies)
    .innerJoin(mine, eq(mine.assemblyId, assemblies.id))
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .innerJoin(programs, eq(programs.id, assemblies.programId))
    .where(
      and(
        inArray(
          assemblies.programId,
          approved.map((p) => p.id),
        ),
        // The tester's test is still the latest one: someone else has not tested it since.
        sql`${assemblies.lastTestedOn} = ${mine.lastByMe}`,
        or(and(eq(assemblies.baseState, "active"), between(assemblies.nextDueOn, today, until)), eq(assemblies.baseState, "failed")),
      ),
    )
    .orderBy(sql`${assemblies.baseState} = 'failed' DESC`, asc(sql`COALESCE(${assemblies.repairDueOn}, ${assemblies.nextDueOn})`))
    .limit(options.limit ?? 500);
  return {
    today,
    until,
    rows: rows.map(({ siteName, addressLine1, city, accountNumber, contactName, contactPhone, baseState, ...row }) => {
      const why = baseState === "failed" ? "repair" : "due";
      const target = why === "repair" ? row.repairDueOn : row.nextDueOn;
      return { ...row, why, daysLeft: target ? daysBetween(today, target) : 0, site: { name: siteName, addressLine1, city, accountNumber, contactName, contactPhone } };
    }),
  };
}
