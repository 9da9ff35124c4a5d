import "server-only";
import { and, eq, inArray, or, sql, type SQL } from "drizzle-orm";
import { assemblies } from "@/db/schema";
import { allowedKinds, assemblyKinds, complianceStateOn, hazards, protectionWarnings, type AssemblyKind, type ComplianceState, type Hazard, type ProgramRules } from "@/lib/rules";

/**
 * The SQL form of lib/rules' containment table: an assembly whose kind is not among
 * allowedKinds(hazard, backpressurePossible). Built from lib/rules itself, so the inventory's
 * "kind does not match the hazard" list and the warning on each assembly never disagree.
 */
export function kindMismatchCondition(): SQL {
  const cases: SQL[] = [];
  for (const hazard of hazards) {
    for (const backpressure of [true, false]) {
      const allowed = allowedKinds(hazard, backpressure);
      const disallowed = assemblyKinds.filter((k) => !allowed.includes(k));
      if (disallowed.length === 0) continue;
      cases.push(and(eq(assemblies.hazard, hazard), eq(assemblies.backpressurePossible, backpressure), inArray(assemblies.kind, disallowed))!);
    }
  }
  return or(...cases) ?? sql`FALSE`;
}

/** The warnings shown beside an assembly (the purveyor decides; these only point). */
export function warningsForAssembly(a: { kind: AssemblyKind; hazard: Hazard; backpressurePossible: boolean }): string[] {
  return protectionWarnings({ kind: a.kind, hazard: a.hazard, backpressurePossible: a.backpressurePossible });
}

/** True when the kind is not accepted for the hazard (the severe-hazard "confirm the in-plant air gap" reminder aside). */
export function hasKindMismatch(a: { kind: AssemblyKind; hazard: Hazard; backpressurePossible: boolean }): boolean {
  return !allowedKinds(a.hazard, a.backpressurePossible).includes(a.kind);
}

export interface StoredFacts {
  baseState: "active" | "failed" | "inactive";
  lastTestedOn: string | null;
  lastOutcome: "pass" | "fail" | null;
  lastPassedOn: string | null;
  nextDueOn: string | null;
  repairDueOn: string | null;
}

export function stateOf(facts: StoredFacts, today: string, rules: ProgramRules): ComplianceState {
  return complianceStateOn(facts, today, rules);
}
