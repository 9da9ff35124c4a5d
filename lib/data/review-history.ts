import "server-only";
import { asc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { reportReadings, reviews, testReports, users } from "@/db/schema";
import { familyOf, kpaToPsid, psidToKpa, type AssemblyKind, type RuleSet } from "@/lib/rules";
import type { TesterSnapshot } from "./report-detail";

/** One report in an assembly's history, newest last. */
export interface HistoryReport {
  id: number;
  reportNumber: string;
  revision: number;
  testedOn: string;
  status: string;
  reason: string;
  initialOutcome: "pass" | "fail" | "incomplete";
  finalOutcome: "pass" | "fail";
  wasRepaired: boolean;
  testerName: string;
  decidedBy: string | null;
  /** Returned and superseded reports do not count in the assembly's record. */
  isCounted: boolean;
}

export interface SeriesPoint {
  reportId: number;
  testedOn: string;
  /** In the display unit; null = the valve did not open (plotted as a fail at zero). */
  value: number | null;
  phase: "initial" | "retest";
  isCounted: boolean;
}

/** One differential over the years, with the minimum it is held to now. */
export interface ReadingSeries {
  key: string;
  label: string;
  unit: "psid" | "kPa" | "in.";
  minimum: number | null;
  points: SeriesPoint[];
}

export interface AssemblyHistory {
  reports: HistoryReport[];
  series: ReadingSeries[];
}

const notCounted = new Set(["returned", "superseded"]);

type ReadingColumn = "reliefOpening" | "check1" | "check2" | "airInletOpening" | "checkDifferential" | "airGapInches";

interface SeriesSpec {
  column: ReadingColumn;
  label: string;
  isPressure: boolean;
  minimum: (ruleSet: RuleSet, kind: AssemblyKind) => number | null;
  /** The column that says the valve did not open. */
  didNotOpen?: "reliefDidNotOpen" | "airInletDidNotOpen";
}

const specsByFamily: Record<string, SeriesSpec[]> = {
  rp: [
    { column: "reliefOpening", label: "Relief valve opening point", isPressure: true, minimum: (r) => r.rp.reliefMin, didNotOpen: "reliefDidNotOpen" },
    { column: "check1", label: "Check #1 differential", isPressure: true, minimum: (r) => r.rp.check1Min },
    { column: "check2", label: "Check #2 differential (direction of flow)", isPressure: true, minimum: (r) => r.rp.check2FlowMin },
  ],
  dc: [
    { column: "check1", label: "Check #1 differential", isPressure: true, minimum: (r) => r.dc.check1Min },
    { column: "check2", label: "Check #2 differential", isPressure: true, minimum: (r) => r.dc.check2Min },
  ],
  vb: [
    { column: "airInletOpening", label: "Air inlet opening point", isPressure: true, minimum: (r, kind) => (kind === "SVB" ? r.svb.airInletMin : r.pvb.airInletMin), didNotOpen: "airInletDidNotOpen" },
    { column: "checkDifferential", label: "Check valve differential", isPressure: true, minimum: (r, kind) => (kind === "SVB" ? r.svb.checkMin : r.pvb.checkMin) },
  ],
  ag: [{ column: "airGapInches", label: "Air gap above the flood-level rim", isPressure: false, minimum: () => null }],
};

function toDisplay(value: number, from: "psid" | "kPa", to: "psid" | "kPa"): number {
  if (from === to) return value;
  const converted = to === "kPa" ? psidToKpa(value) : kpaToPsid(value);
  return Math.round(converted * 10) / 10;
}

/**
 * An assembly's reports with their as-found and retest readings, as series for a chart: each
 * differential over the years, in the program's unit, with today's minimum. One indexed read of
 * the reports (test_reports_assembly_idx) and one of their readings.
 */
export async function loadAssemblyHistory(assemblyId: number, kind: AssemblyKind, ruleSet: RuleSet, displayUnit: "psid" | "kPa"): Promise<AssemblyHistory> {
  const db = getDb();
  const rows = await db
    .select({
      id: testReports.id,
      reportNumber: testReports.reportNumber,
      revision: testReports.revision,
      testedOn: testReports.testedOn,
      status: testReports.status,
      reason: testReports.reason,
      unit: testReports.unit,
      initialOutcome: testReports.initialOutcome,
      finalOutcome: testReports.finalOutcome,
      wasRepaired: testReports.wasRepaired,
      testerSnapshot: testReports.testerSnapshot,
      decidedBy: users.name,
    })
    .from(testReports)
    .leftJoin(reviews, eq(reviews.reportId, testReports.id))
    .leftJoin(users, eq(users.id, reviews.inspectorId))
    .where(eq(testReports.assemblyId, assemblyId))
    .orderBy(asc(testReports.testedOn), asc(testReports.submittedAt));
  const readings = rows.length ? await db.select().from(reportReadings).where(inArray(reportReadings.reportId, rows.map((r) => r.id))) : [];
  const specs = specsByFamily[familyOf(kind)] ?? [];
  const series: ReadingSeries[] = specs.map((spec) => {
    const minimum = spec.minimum(ruleSet, kind);
    return {
      key: spec.column,
      label: spec.label,
      unit: spec.isPressure ? displayUnit : "in.",
      minimum: minimum === null ? null : spec.isPressure ? toDisplay(minimum, "psid", displayUnit) : null,
      points: [],
    };
  });
  const reportById = new Map(rows.map((r) => [r.id, r]));
  for (const reading of readings.sort((a, b) => (a.phase === b.phase ? 0 : a.phase === "initial" ? -1 : 1))) {
    const report = reportById.get(reading.reportId);
    if (!report) continue;
    specs.forEach((spec, index) => {
      const raw = reading[spec.column];
      const didNotOpen = spec.didNotOpen ? Boolean(reading[spec.didNotOpen]) : false;
      if (raw === null && !didNotOpen) return;
      const value = didNotOpen ? null : spec.isPressure ? toDisplay(Number(raw), report.unit, displayUnit) : Number(raw);
      series[index]!.points.push({ reportId: report.id, testedOn: report.testedOn, value, phase: reading.phase, isCounted: !notCounted.has(report.status) });
    });
  }
  for (const s of series) s.points.sort((a, b) => (a.testedOn < b.testedOn ? -1 : a.testedOn > b.testedOn ? 1 : a.phase === "initial" ? -1 : 1));
  return {
    reports: rows.map((r) => ({
      id: r.id,
      reportNumber: r.reportNumber,
      revision: r.revision,
      testedOn: r.testedOn,
      status: r.status,
      reason: r.reason,
      initialOutcome: r.initialOutcome,
      finalOutcome: r.finalOutcome,
      wasRepaired: r.wasRepaired,
      testerName: (r.testerSnapshot as TesterSnapshot).name,
      decidedBy: r.decidedBy,
      isCounted: !notCounted.has(r.status),
    })),
    series: series.filter((s) => s.points.length > 0),
  };
}
