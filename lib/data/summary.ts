import "server-only";
import { and, asc, eq, gte, inArray, isNull, lt, lte, min, notInArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { assemblies, testReports } from "@/db/schema";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { InputError } from "@/lib/errors";
import { addDays, addMonths, assemblyKindLabels, assemblyKinds, hazardLabels, hazards, summarizeProgramYear, type ProgramYearSummary, type SummaryAssembly, type SummaryCounts, type SummaryReport } from "@/lib/rules";
import { csvLine } from "./import-csv";
import { getProgramContext } from "./settings";

/**
 * The yearly program summary for the state drinking-water agency, computed by lib/rules'
 * summarizeProgramYear. The figures need each assembly's history only as far back as its last
 * passing test before the year's end, so the data is read in two indexed passes instead of the
 * whole history: (1) every report tested from one test interval plus the longest repair
 * deadline before 1 January to 31 December (test_reports_program_date_idx); (2) the whole
 * history of the few in-service assemblies with no passing test in that window (by
 * test_reports_assembly_idx). Returned and superseded reports do not count, as everywhere.
 */

export interface YearlySummary extends ProgramYearSummary {
  programName: string;
  generatedOn: string;
  years: number[];
  notes: string[];
}

const notCountedStatuses = ["returned", "superseded"] as const;

export async function listSummaryYears(actor: Actor): Promise<number[]> {
  assertCan(actor, "summary.view");
  const context = await getProgramContext(staffProgramId(actor));
  const [first] = await getDb().select({ on: min(testReports.testedOn) }).from(testReports).where(eq(testReports.programId, context.id));
  const currentYear = Number(context.today.slice(0, 4));
  const firstYear = first?.on ? Number(String(first.on).slice(0, 4)) : currentYear;
  const years: number[] = [];
  for (let y = currentYear; y >= Math.max(firstYear, currentYear - 15); y--) years.push(y);
  return years;
}

export async function getYearlySummary(actor: Actor, year: number): Promise<YearlySummary> {
  assertCan(actor, "summary.view");
  const context = await getProgramContext(staffProgramId(actor));
  const currentYear = Number(context.today.slice(0, 4));
  if (!Number.isInteger(year) || year < 1990 || year > currentYear) throw new InputError(`Choose a year from 1990 to ${currentYear}.`, { year: ["Choose a year that has begun."] });
  const db = getDb();
  const yearStart = `${year}-01-01`;
  const yearEnd = `${year}-12-31`;
  const longestRepair = Math.max(context.rules.repairDays.severe, context.rules.repairDays.high, context.rules.repairDays.low);
  const windowStart = addDays(addMonths(yearStart, -context.rules.testIntervalMonths), -longestRepair);

  const assemblyRows = await db
    .select({ id: assemblies.id, kind: assemblies.kind, hazard: assemblies.hazard, installedOn: assemblies.installedOn, removedOn: assemblies.removedOn, status: assemblies.status })
    .from(assemblies)
    // Unconfirmed field registrations and merged duplicates are not (yet) in the inventory.
    .where(and(eq(assemblies.programId, context.id), isNull(assemblies.mergedIntoId), notInArray(assemblies.status, ["awaiting_confirmation"])));
  const summaryAssemblies: SummaryAssembly[] = assemblyRows.map((a) => ({
    id: a.id,
    kind: a.kind,
    hazard: a.hazard,
    installedOn: a.installedOn,
    // Out of service without a recorded date: taken as out before the year (not in service).
    removedOn: a.status === "removed" || a.status === "replaced" ? (a.removedOn ?? "1900-01-01") : null,
  }));
  const known = new Set(assemblyRows.map((a) => a.id));

  const reportColumns = { assemblyId: testReports.assemblyId, testedOn: testReports.testedOn, initialOutcome: testReports.initialOutcome, outcome: testReports.finalOutcome };
  const windowReports = await db
    .select(reportColumns)
    .from(testReports)
    .where(and(eq(testReports.programId, context.id), gte(testReports.testedOn, windowStart), lte(testReports.testedOn, yearEnd), notInArray(testReports.status, [...notCountedStatuses])));
  const passedInWindow = new Set(windowReports.filter((r) => r.outcome === "pass").map((r) => r.assemblyId));
  const needFullHistory = summaryAssemblies
    .filter((a) => !passedInWindow.has(a.id as number) && (a.installedOn === null || a.installedOn <= yearEnd) && (a.removedOn === null || a.removedOn > yearEnd))
    .map((a) => a.id as number);
  const olderReports: typeof windowReports = [];
  for (let i = 0; i < needFullHistory.length; i += 1000) {
    const ids = needFullHistory.slice(i, i + 1000);
    olderReports.push(
      ...(await db
        .select(reportColumns)
        .from(testReports)
        .where(and(inArray(testReports.assemblyId, ids), lt(testReports.testedOn, windowStart), notInArray(testReports.status, [...notCountedStatuses])))
        .orderBy(asc(testReports.assemblyId))),
    );
  }
  const reports: SummaryReport[] = [];
  for (const r of [...windowReports, ...olderReports]) {
    if (!known.has(r.assemblyId)) continue;
    // An incomplete initial test (readings missing) counts as a failed first test.
    reports.push({ assemblyId: r.assemblyId, testedOn: r.testedOn, initialOutcome: r.initialOutcome === "pass" ? "pass" : "fail", outcome: r.outcome });
  }
  const summary = summarizeProgramYear({ year, assemblies: summaryAssemblies, reports, rules: context.rules });
  return {
    ...summary,
    programName: context.name,
    generatedOn: context.today,
    years: [],
    notes: [
      "Counts are of assemblies, not reports. An assembly is counted under its kind and its degree of hazard as they stand in the inventory today.",
      "In service: installed by 31 December (or installation date unknown) and not removed or replaced by then.",
      "Tested: at least one test filed and not returned during the year. Passed on first test: the year's first test passed without repair. Failed: an initial test failed during the year. Repaired: the last failure of the year was followed by a passing test within the year.",
      "Overdue at year end: in service on 31 December and past its test due date or its repair deadline under the program's rules.",
      year === currentYear ? `The year is not over: figures are as of ${context.today}; "overdue at year end" looks ahead to 31 December.` : "",
      "Field registrations not yet confirmed by an inspector are not counted.",
    ].filter(Boolean),
  };
}

export const summaryColumns: { key: keyof SummaryCounts; label: string }[] = [
  { key: "inService", label: "In service at year end" },
  { key: "tested", label: "Tested" },
  { key: "passedOnFirstTest", label: "Passed on first test" },
  { key: "failed", label: "Failed" },
  { key: "repaired", label: "Repaired and passed" },
  { key: "overdue", label: "Overdue at year end" },
  { key: "newInstallations", label: "New installations" },
  { key: "removed", label: "Removed or replaced" },
];

/** The summary as CSV: one line per kind and hazard, then subtotals and the total; formula-safe. */
export function summaryToCsv(summary: YearlySummary): string {
  const header = ["Program", "Year", "Assembly kind", "Kind code", "Degree of hazard", ...summaryColumns.map((c) => c.label)];
  const line = (kindLabel: string, kindCode: string, hazardLabel: string, counts: SummaryCounts) => csvLine([summary.programName, summary.year, kindLabel, kindCode, hazardLabel, ...summaryColumns.map((c) => counts[c.key])]);
  const lines = [csvLine(header)];
  for (const row of summary.rows) lines.push(line(assemblyKindLabels[row.kind], row.kind, hazardLabels[row.hazard], row));
  for (const kind of assemblyKinds) if (summary.rows.some((r) => r.kind === kind)) lines.push(line(assemblyKindLabels[kind], kind, "All hazards", summary.byKind[kind]));
  for (const hazard of hazards) if (summary.rows.some((r) => r.hazard === hazard)) lines.push(line("All kinds", "", hazardLabels[hazard], summary.byHazard[hazard]));
  lines.push(line("All kinds", "", "All hazards", summary.totals));
  return `\uFEFF${lines.join("\r\n")}\r\n`;
}
