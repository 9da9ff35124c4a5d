import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import type { Executor } from "@/db/client";
import { assemblies, programSettings, testReports } from "@/db/schema";
import { programRulesFromSettings } from "@/lib/programs/settings";
import { deriveAssemblyFacts, type AssemblyFacts } from "@/lib/rules";

/** Report statuses whose test does not count in the assembly's history. */
const notCounted = new Set(["returned", "superseded"]);

/**
 * What a caller that already holds the assembly's row lock in this transaction passes in, so
 * the row and its program's settings are not read a second time.
 */
export interface LockedAssembly {
  assembly: { id: number; programId: number; status: (typeof assemblies.$inferSelect)["status"]; installedOn: string | null; hazard: (typeof assemblies.$inferSelect)["hazard"]; noticeCycle: string | null };
  settings: typeof programSettings.$inferSelect;
}

/**
 * Recomputes an assembly's derived facts (last test and outcome, next due date, repair
 * deadline) from its whole history with lib/rules, inside the caller's transaction, so the row
 * never disagrees with its reports. Locks the assembly row first: two submissions for one
 * assembly recompute one after the other. A new due cycle clears the notice stage.
 */
export async function recomputeAssemblyFacts(tx: Executor, assemblyId: number, known?: LockedAssembly): Promise<AssemblyFacts> {
  const [assembly] = known
    ? [known.assembly]
    : await tx
        .select({ id: assemblies.id, programId: assemblies.programId, status: assemblies.status, installedOn: assemblies.installedOn, hazard: assemblies.hazard, noticeCycle: assemblies.noticeCycle })
        .from(assemblies)
        .where(eq(assemblies.id, assemblyId))
        .for("update");
  if (!assembly) throw new Error(`Assembly ${assemblyId} not found`);
  const [settings] = known ? [known.settings] : await tx.select().from(programSettings).where(eq(programSettings.programId, assembly.programId));
  if (!settings) throw new Error(`Program ${assembly.programId} has no settings`);
  const reports = await tx
    .select({ testedOn: testReports.testedOn, outcome: testReports.finalOutcome, status: testReports.status })
    .from(testReports)
    .where(and(eq(testReports.assemblyId, assemblyId), inArray(testReports.status, ["awaiting_fee", "queued", "accepted", "returned", "superseded"])))
    .orderBy(asc(testReports.testedOn), asc(testReports.submittedAt));
  const facts = deriveAssemblyFacts(
    {
      status: assembly.status,
      installedOn: assembly.installedOn,
      hazard: assembly.hazard,
      tests: reports.map((r) => ({ testedOn: r.testedOn, outcome: r.outcome, accepted: !notCounted.has(r.status) })),
    },
    programRulesFromSettings(settings),
  );
  const cycle = facts.repairDueOn ?? facts.nextDueOn;
  await tx
    .update(assemblies)
    .set({
      baseState: facts.baseState,
      lastTestedOn: facts.lastTestedOn,
      lastOutcome: facts.lastOutcome,
      lastPassedOn: facts.lastPassedOn,
      nextDueOn: facts.nextDueOn,
      repairDueOn: facts.repairDueOn,
      ...(cycle !== assembly.noticeCycle ? { noticeStage: null, noticeCycle: null } : {}),
      updatedAt: new Date(),
    })
    .where(eq(assemblies.id, assemblyId));
  return facts;
}
