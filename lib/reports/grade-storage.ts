// How a report's grade is kept in the database: every finding (rule, result, what was observed,
// what was required) but not the rule's label or source, which follow from the rule id and the
// rule-set edition recorded on the report. Pure.
import { labelOfRule, type Finding, type Grade, type ReportGrade, type RuleSet } from "@/lib/rules";

type StoredFinding = [rule: string, passed: 0 | 1, observed: number | boolean | null, required: string];

interface StoredPhase {
  o: Grade["outcome"];
  f: StoredFinding[];
  m?: string[];
}

export interface StoredGrade {
  v: 1;
  outcome: ReportGrade["outcome"];
  passedAfterRepair: boolean;
  initial: StoredPhase;
  retest?: StoredPhase;
}

function storePhase(grade: Grade): StoredPhase {
  const phase: StoredPhase = { o: grade.outcome, f: grade.findings.map((f) => [f.rule, f.passed ? 1 : 0, f.observed ?? null, f.required ?? ""]) };
  if (grade.missing.length) phase.m = [...grade.missing];
  return phase;
}

export function storeGrade(grade: ReportGrade): StoredGrade {
  return { v: 1, outcome: grade.outcome, passedAfterRepair: grade.passedAfterRepair, initial: storePhase(grade.initial), ...(grade.retest ? { retest: storePhase(grade.retest) } : {}) };
}

export interface DisplayFinding extends Finding {
  label: string;
}

export interface DisplayPhase {
  outcome: Grade["outcome"];
  findings: DisplayFinding[];
  missing: string[];
}

function expandPhase(phase: StoredPhase, ruleSet: RuleSet | undefined): DisplayPhase {
  return {
    outcome: phase.o,
    missing: phase.m ?? [],
    findings: phase.f.map(([rule, passed, observed, required]) => ({
      rule,
      passed: passed === 1,
      observed,
      required,
      label: labelOfRule(rule),
      source: ruleSet?.sources?.[rule as keyof RuleSet["sources"]] ?? "",
    })),
  };
}

export function expandGrade(stored: StoredGrade, ruleSet?: RuleSet): { outcome: StoredGrade["outcome"]; passedAfterRepair: boolean; initial: DisplayPhase; retest?: DisplayPhase } {
  return {
    outcome: stored.outcome,
    passedAfterRepair: stored.passedAfterRepair,
    initial: expandPhase(stored.initial, ruleSet),
    ...(stored.retest ? { retest: expandPhase(stored.retest, ruleSet) } : {}),
  };
}
