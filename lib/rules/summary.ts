import { RulesInputError } from './errors';
import { assertIsoDate, formatIsoDate, type IsoDate } from './dates';
import { assemblyKinds, isAssemblyKind, type AssemblyKind } from './field-test';
import { hazards, isHazard, type Hazard } from './hazard';
import { complianceStateOn, defaultProgramRules, deriveAssemblyFacts, type AssemblyTestRecord, type ProgramRules } from './compliance';

/** An assembly as the yearly summary needs it (one row of the inventory; hazard as it stands now). */
export interface SummaryAssembly {
  id: string | number;
  kind: AssemblyKind;
  hazard: Hazard;
  installedOn: IsoDate | null;
  /** Date taken out of service (removed or replaced); null = still in service. */
  removedOn: IsoDate | null;
}

/** A report as the summary needs it: its initial grade and its final outcome (the retest's after a repair). */
export interface SummaryReport {
  assemblyId: string | number;
  testedOn: IsoDate;
  initialOutcome: 'pass' | 'fail';
  outcome: 'pass' | 'fail';
  /** false = returned or refused: not counted. */
  accepted?: boolean;
}

/** The figures of one row (assemblies counted, not reports). */
export interface SummaryCounts {
  /** Installed on or before 31 December (or installation unknown) and not removed by then. */
  inService: number;
  /** At least one counted test during the year. */
  tested: number;
  /** The assembly's first test of the year passed without repair. */
  passedOnFirstTest: number;
  /** At least one initial test failed during the year. */
  failed: number;
  /** Failed during the year and its last failure was followed by a pass within the year (retest after repair on the same report, or a later passing test). */
  repaired: number;
  /** In service at year end and overdue for its test or its repair on 31 December. */
  overdue: number;
  /** Installed during the year. */
  newInstallations: number;
  /** Removed or replaced during the year. */
  removed: number;
}

/** A row by kind and hazard. */
export interface SummaryRow extends SummaryCounts {
  kind: AssemblyKind;
  hazard: Hazard;
}

/** The year's figures: rows by kind × hazard (only those with something to count), subtotals, totals. */
export interface ProgramYearSummary {
  year: number;
  rows: SummaryRow[];
  byKind: Record<AssemblyKind, SummaryCounts>;
  byHazard: Record<Hazard, SummaryCounts>;
  totals: SummaryCounts;
}

/** Input of the yearly summary; reports must include the history up to the year's end (earlier years count for "overdue"). */
export interface ProgramYearInput {
  year: number;
  assemblies: readonly SummaryAssembly[];
  reports: readonly SummaryReport[];
  rules?: ProgramRules;
}

const emptyCounts = (): SummaryCounts => ({ inService: 0, tested: 0, passedOnFirstTest: 0, failed: 0, repaired: 0, overdue: 0, newInstallations: 0, removed: 0 });

function addCounts(target: SummaryCounts, source: SummaryCounts): void {
  for (const key of Object.keys(target) as (keyof SummaryCounts)[]) target[key] += source[key];
}

/**
 * The figures of the yearly program summary for the state drinking-water agency (Washington
 * annual summary forms [P]; Oregon, due 31 March [P]): per kind and hazard, assemblies in
 * service at year end, tested, passed on the first test, failed, repaired, overdue at year end,
 * new installations and removals.
 */
export function summarizeProgramYear({ year, assemblies, reports, rules = defaultProgramRules }: ProgramYearInput): ProgramYearSummary {
  if (!Number.isInteger(year) || year < 1900 || year > 9999) throw new RulesInputError('year', `year must be a four-digit year (got ${String(year)}).`);
  const yearStart = formatIsoDate(year, 1, 1);
  const yearEnd = formatIsoDate(year, 12, 31);

  const reportsByAssembly = new Map<string, SummaryReport[]>();
  const knownAssemblies = new Set(assemblies.map((assembly) => String(assembly.id)));
  reports.forEach((report, index) => {
    assertIsoDate(report.testedOn, `reports.${index}.testedOn`);
    const key = String(report.assemblyId);
    if (!knownAssemblies.has(key)) throw new RulesInputError(`reports.${index}.assemblyId`, `Report ${index + 1} is for assembly ${key}, which is not in the assembly list.`);
    if (report.accepted === false || report.testedOn > yearEnd) return;
    (reportsByAssembly.get(key) ?? reportsByAssembly.set(key, []).get(key)!).push(report);
  });

  const cells = new Map<string, SummaryCounts>();
  assemblies.forEach((assembly, index) => {
    if (!isAssemblyKind(assembly.kind)) throw new RulesInputError(`assemblies.${index}.kind`, `Unknown assembly kind ${JSON.stringify(assembly.kind)}.`);
    if (!isHazard(assembly.hazard)) throw new RulesInputError(`assemblies.${index}.hazard`, `Unknown hazard ${JSON.stringify(assembly.hazard)}.`);
    if (assembly.installedOn !== null) assertIsoDate(assembly.installedOn, `assemblies.${index}.installedOn`);
    if (assembly.removedOn !== null) assertIsoDate(assembly.removedOn, `assemblies.${index}.removedOn`);
    const cellKey = `${assembly.kind}|${assembly.hazard}`;
    const counts = cells.get(cellKey) ?? cells.set(cellKey, emptyCounts()).get(cellKey)!;

    const isInstalledByYearEnd = assembly.installedOn === null || assembly.installedOn <= yearEnd;
    const isInServiceAtYearEnd = isInstalledByYearEnd && (assembly.removedOn === null || assembly.removedOn > yearEnd);
    if (isInServiceAtYearEnd) counts.inService++;
    if (assembly.installedOn !== null && assembly.installedOn >= yearStart && assembly.installedOn <= yearEnd) counts.newInstallations++;
    if (assembly.removedOn !== null && assembly.removedOn >= yearStart && assembly.removedOn <= yearEnd) counts.removed++;

    const history = (reportsByAssembly.get(String(assembly.id)) ?? []).sort((a, b) => (a.testedOn < b.testedOn ? -1 : a.testedOn > b.testedOn ? 1 : 0));
    const inYear = history.filter((report) => report.testedOn >= yearStart);
    if (inYear.length > 0) {
      counts.tested++;
      if (inYear[0]!.initialOutcome === 'pass') counts.passedOnFirstTest++;
      let lastFailure = -1;
      inYear.forEach((report, position) => {
        if (report.initialOutcome === 'fail') lastFailure = position;
      });
      if (lastFailure >= 0) {
        counts.failed++;
        const isRepaired = inYear[lastFailure]!.outcome === 'pass' || inYear.slice(lastFailure + 1).some((report) => report.outcome === 'pass');
        if (isRepaired) counts.repaired++;
      }
    }

    if (isInServiceAtYearEnd) {
      const tests: AssemblyTestRecord[] = history.map((report) => ({ testedOn: report.testedOn, outcome: report.outcome }));
      const facts = deriveAssemblyFacts({ status: 'active', installedOn: assembly.installedOn, hazard: assembly.hazard, tests }, rules);
      const state = complianceStateOn(facts, yearEnd, rules);
      if (state === 'overdue' || state === 'repair_overdue') counts.overdue++;
    }
  });

  const rows: SummaryRow[] = [];
  const byKind = Object.fromEntries(assemblyKinds.map((kind) => [kind, emptyCounts()])) as Record<AssemblyKind, SummaryCounts>;
  const byHazard = Object.fromEntries(hazards.map((hazard) => [hazard, emptyCounts()])) as Record<Hazard, SummaryCounts>;
  const totals = emptyCounts();
  for (const kind of assemblyKinds) {
    for (const hazard of hazards) {
      const counts = cells.get(`${kind}|${hazard}`);
      if (!counts) continue;
      rows.push({ kind, hazard, ...counts });
      addCounts(byKind[kind], counts);
      addCounts(byHazard[hazard], counts);
      addCounts(totals, counts);
    }
  }
  return { year, rows, byKind, byHazard, totals };
}
