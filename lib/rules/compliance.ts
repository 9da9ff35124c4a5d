import { RulesInputError } from './errors';
import { addDays, addMonths, assertIsoDate, daysInMonth, formatIsoDate, isLeapYear, type IsoDate } from './dates';
import { isHazard, type Hazard } from './hazard';

/**
 * When an assembly is next due. 'anniversary': the last passing test plus the test interval
 * (default). 'window': every test belongs in a fixed yearly window (e.g. 01-01 to 05-31; a
 * window may run over the new year, e.g. 11-01 to 02-28) and the due date is the end of a window.
 * Both models are in use by programs [S].
 */
export type DueModel = { kind: 'anniversary' } | { kind: 'window'; startMonthDay: string; endMonthDay: string };

/** A program's compliance settings (each purveyor sets its own; defaults below). */
export interface ProgramRules {
  /** At least once a year: Washington WAC 246-290-490(7)(b) [P]; some programs allow 24 for low-hazard residential (Florida 62-555.360) [P]. */
  testIntervalMonths: number;
  dueModel: DueModel;
  /** "Due soon" this many days before the due date; aligned with the first reminder (30 days) [S]. */
  dueSoonDays: number;
  /** Days from a failed test to the repair deadline, by hazard [S: 7/21, 14, 15, 30 or 60 locally]. */
  repairDays: Record<Hazard, number>;
  /** Days from a test to filing its report [S: 5–30 locally]. */
  reportDeadlineDays: number;
}

/**
 * Defaults: yearly test on the anniversary of the last pass; due soon 30 days ahead; repair
 * within 14 days for a high hazard and 30 for a low hazard [S]; severe follows the high-hazard
 * 14 days (some programs give health hazards 7 [S]); reports filed within 10 days [S].
 */
export const defaultProgramRules: ProgramRules = Object.freeze({
  testIntervalMonths: 12,
  dueModel: Object.freeze({ kind: 'anniversary' as const }),
  dueSoonDays: 30,
  repairDays: Object.freeze({ severe: 14, high: 14, low: 30 }),
  reportDeadlineDays: 10,
});

/** One thing wrong with program settings. */
export interface ProgramRulesProblem {
  path: string;
  message: string;
}

const MONTH_DAY = /^(\d{2})-(\d{2})$/;

function isMonthDay(value: unknown): value is string {
  const match = typeof value === 'string' ? MONTH_DAY.exec(value) : null;
  if (!match) return false;
  const month = Number(match[1]);
  const day = Number(match[2]);
  // 02-29 is allowed: in a common year it falls on 02-28.
  return month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(2024, month);
}

function isWholeNumberBetween(value: unknown, min: number, max: number): value is number {
  return typeof value === 'number' && Number.isInteger(value) && value >= min && value <= max;
}

/** Problems with program settings (empty = usable). */
export function validateProgramRules(rules: unknown): ProgramRulesProblem[] {
  const problems: ProgramRulesProblem[] = [];
  if (rules === null || typeof rules !== 'object') return [{ path: '', message: 'Program rules must be an object.' }];
  const candidate = rules as Partial<ProgramRules>;
  if (!isWholeNumberBetween(candidate.testIntervalMonths, 1, 120)) {
    problems.push({ path: 'testIntervalMonths', message: 'The test interval must be a whole number of months from 1 to 120.' });
  }
  if (!isWholeNumberBetween(candidate.dueSoonDays, 0, 366)) problems.push({ path: 'dueSoonDays', message: '"Due soon" must be a whole number of days from 0 to 366.' });
  if (!isWholeNumberBetween(candidate.reportDeadlineDays, 0, 366)) problems.push({ path: 'reportDeadlineDays', message: 'The report deadline must be a whole number of days from 0 to 366.' });
  for (const hazard of ['severe', 'high', 'low'] as const) {
    if (!isWholeNumberBetween(candidate.repairDays?.[hazard], 1, 366)) {
      problems.push({ path: `repairDays.${hazard}`, message: `The repair deadline for a ${hazard} hazard must be a whole number of days from 1 to 366.` });
    }
  }
  const model = candidate.dueModel;
  if (!model || (model.kind !== 'anniversary' && model.kind !== 'window')) {
    problems.push({ path: 'dueModel.kind', message: "The due-date model must be 'anniversary' or 'window'." });
  } else if (model.kind === 'window') {
    if (!isMonthDay(model.startMonthDay)) problems.push({ path: 'dueModel.startMonthDay', message: 'The window start must be a day of the year written MM-DD.' });
    if (!isMonthDay(model.endMonthDay)) problems.push({ path: 'dueModel.endMonthDay', message: 'The window end must be a day of the year written MM-DD.' });
    if (model.startMonthDay === model.endMonthDay) problems.push({ path: 'dueModel.endMonthDay', message: 'The window must be longer than one day.' });
    if (typeof candidate.testIntervalMonths === 'number' && candidate.testIntervalMonths % 12 !== 0) {
      problems.push({ path: 'testIntervalMonths', message: 'With a yearly window the test interval must be whole years (12, 24, …).' });
    }
  }
  return problems;
}

const validatedRules = new WeakSet<object>();

function assertProgramRules(rules: ProgramRules): void {
  if (validatedRules.has(rules)) return;
  const problems = validateProgramRules(rules);
  if (problems.length > 0) throw new RulesInputError(`rules.${problems[0]!.path}`, problems.map((problem) => problem.message).join(' '));
  validatedRules.add(rules);
}

function monthDayInYear(year: number, monthDay: string): IsoDate {
  const month = Number(monthDay.slice(0, 2));
  const day = Number(monthDay.slice(3, 5));
  return formatIsoDate(year, month, month === 2 && day === 29 && !isLeapYear(year) ? 28 : day);
}

/**
 * Next due date after a passing test on `passedOn`.
 * Anniversary: passedOn + testIntervalMonths (calendar months, end-of-month clamped).
 * Window: the end of the N-th window that STARTS after the test, N = interval in years. A test
 * inside this year's window, or between windows, is thus always due again by the end of the
 * next window to open: no early test skips a window and no test outside a window gives a
 * shortened cycle that ends before a full window has passed.
 */
export function dueDateAfterPass(passedOn: IsoDate, rules: ProgramRules = defaultProgramRules): IsoDate {
  assertIsoDate(passedOn, 'passedOn');
  assertProgramRules(rules);
  const model = rules.dueModel;
  if (model.kind === 'anniversary') return addMonths(passedOn, rules.testIntervalMonths);
  const year = Number(passedOn.slice(0, 4));
  const firstYear = monthDayInYear(year, model.startMonthDay) > passedOn ? year : year + 1;
  const windowYear = firstYear + rules.testIntervalMonths / 12 - 1;
  const wrapsYearEnd = model.endMonthDay < model.startMonthDay;
  return monthDayInYear(wrapsYearEnd ? windowYear + 1 : windowYear, model.endMonthDay);
}

/** Lifecycle status of an assembly in the inventory. */
export type AssemblyStatus = 'active' | 'awaiting_confirmation' | 'removed' | 'replaced' | 'inactive';

const countedStatuses = new Set<string>(['active']);
const knownStatuses = new Set<string>(['active', 'awaiting_confirmation', 'removed', 'replaced', 'inactive']);

/** A test in the assembly's history: the report's final outcome (the retest's, after a repair). */
export interface AssemblyTestRecord {
  testedOn: IsoDate;
  outcome: 'pass' | 'fail';
  /** false = returned or refused by the inspector: it does not count. Undefined or true counts. */
  accepted?: boolean;
}

/** An event after which a test is due at once: reinstallation, relocation, a backflow incident (Washington WAC 246-290-490(7)(b); Oregon OAR 333-061-0070(6)). */
export interface AssemblyEvent {
  on: IsoDate;
  kind: 'relocated' | 'reinstalled' | 'incident';
}

/** What the compliance facts are derived from. */
export interface AssemblyHistory {
  status: AssemblyStatus;
  installedOn: IsoDate | null;
  hazard: Hazard;
  tests: readonly AssemblyTestRecord[];
  events?: readonly AssemblyEvent[];
}

/** 'inactive': not in service (or not yet confirmed); 'failed': last counted test failed; 'active': otherwise. */
export type BaseState = 'active' | 'failed' | 'inactive';

/** The facts kept on the assembly row, recomputed whenever its history changes. */
export interface AssemblyFacts {
  lastTestedOn: IsoDate | null;
  lastOutcome: 'pass' | 'fail' | null;
  lastPassedOn: IsoDate | null;
  /** null = never tested and installation date unknown. Kept (not advanced) while failed. */
  nextDueOn: IsoDate | null;
  /** Set only while baseState is 'failed'. */
  repairDueOn: IsoDate | null;
  baseState: BaseState;
}

/**
 * The assembly row's compliance facts from its history.
 * - Only tests with accepted !== false count; same-day tests keep the order given (pass reports
 *   in filing order).
 * - nextDueOn: dueDateAfterPass(last pass); never passed → installedOn (new installations are
 *   due at installation: Washington WAC 246-290-490(7)(b)), or null when that is unknown; pulled forward to an
 *   event (relocation, reinstallation, incident) after the last pass.
 * - After a failed test nextDueOn stays where it was and repairDueOn = the FIRST failure since
 *   the last pass + repairDays[hazard]: failing again does not extend the repair deadline.
 * - status other than 'active' → baseState 'inactive' with no due dates (history facts kept).
 */
export function deriveAssemblyFacts(history: AssemblyHistory, rules: ProgramRules = defaultProgramRules): AssemblyFacts {
  assertProgramRules(rules);
  if (!knownStatuses.has(history.status)) throw new RulesInputError('status', `Unknown assembly status ${JSON.stringify(history.status)}.`);
  if (!isHazard(history.hazard)) throw new RulesInputError('hazard', `Unknown hazard ${JSON.stringify(history.hazard)}.`);
  if (history.installedOn !== null) assertIsoDate(history.installedOn, 'installedOn');

  const counted: AssemblyTestRecord[] = [];
  history.tests.forEach((test, index) => {
    assertIsoDate(test.testedOn, `tests.${index}.testedOn`);
    if (test.outcome !== 'pass' && test.outcome !== 'fail') throw new RulesInputError(`tests.${index}.outcome`, "A test's outcome must be 'pass' or 'fail'.");
    if (test.accepted !== false) counted.push(test);
  });
  counted.sort((a, b) => (a.testedOn < b.testedOn ? -1 : a.testedOn > b.testedOn ? 1 : 0));

  const last = counted[counted.length - 1];
  let lastPassIndex = -1;
  for (let index = counted.length - 1; index >= 0; index--) {
    if (counted[index]!.outcome === 'pass') {
      lastPassIndex = index;
      break;
    }
  }
  const lastPassedOn = lastPassIndex >= 0 ? counted[lastPassIndex]!.testedOn : null;
  const lastTestedOn = last ? last.testedOn : null;
  const lastOutcome = last ? last.outcome : null;

  if (!countedStatuses.has(history.status)) {
    return { lastTestedOn, lastOutcome, lastPassedOn, nextDueOn: null, repairDueOn: null, baseState: 'inactive' };
  }

  let nextDueOn = lastPassedOn !== null ? dueDateAfterPass(lastPassedOn, rules) : history.installedOn;
  (history.events ?? []).forEach((event, index) => {
    assertIsoDate(event.on, `events.${index}.on`);
    if (lastPassedOn !== null && event.on <= lastPassedOn) return;
    if (nextDueOn === null || event.on < nextDueOn) nextDueOn = event.on;
  });

  if (lastOutcome === 'fail') {
    const firstFailure = counted[lastPassIndex + 1]!;
    return {
      lastTestedOn,
      lastOutcome,
      lastPassedOn,
      nextDueOn,
      repairDueOn: addDays(firstFailure.testedOn, rules.repairDays[history.hazard]),
      baseState: 'failed',
    };
  }
  return { lastTestedOn, lastOutcome, lastPassedOn, nextDueOn, repairDueOn: null, baseState: 'active' };
}

/** An assembly's compliance state on a given day. */
export type ComplianceState = 'current' | 'due_soon' | 'overdue' | 'failed_awaiting_repair' | 'repair_overdue' | 'never_tested' | 'inactive';

/** Every state, in the order the compliance picture shows them. */
export const complianceStates: readonly ComplianceState[] = Object.freeze([
  'current',
  'due_soon',
  'overdue',
  'failed_awaiting_repair',
  'repair_overdue',
  'never_tested',
  'inactive',
] as const);

/** Plain labels of the states. */
export const complianceStateLabels: Readonly<Record<ComplianceState, string>> = Object.freeze({
  current: 'Current',
  due_soon: 'Due soon',
  overdue: 'Overdue',
  failed_awaiting_repair: 'Failed, awaiting repair',
  repair_overdue: 'Repair overdue',
  never_tested: 'Never tested',
  inactive: 'Inactive',
});

/** The dates today's states are decided by (bind them as SQL parameters). */
export interface ComplianceThresholds {
  today: IsoDate;
  /** A due date on or before this (and not before today) is "due soon". */
  dueSoonUntil: IsoDate;
}

/** The comparison dates for `today`, so SQL can count each state with indexed comparisons. */
export function complianceThresholds(today: IsoDate, rules: ProgramRules = defaultProgramRules): ComplianceThresholds {
  assertIsoDate(today, 'today');
  assertProgramRules(rules);
  return { today, dueSoonUntil: addDays(today, rules.dueSoonDays) };
}

/**
 * An assembly's state on `today`, from its stored facts. Every state is one comparison of
 * stored columns with the thresholds, checked in this order, so SQL can mirror it exactly
 * (t = complianceThresholds(today)):
 *
 *   inactive                base_state = 'inactive'
 *   repair_overdue          base_state = 'failed' AND repair_due_on <  t.today
 *   failed_awaiting_repair  base_state = 'failed' AND repair_due_on >= t.today
 *   never_tested            base_state = 'active' AND next_due_on IS NULL
 *   overdue                 base_state = 'active' AND next_due_on <  t.today
 *   due_soon                base_state = 'active' AND next_due_on BETWEEN t.today AND t.dueSoonUntil
 *   current                 base_state = 'active' AND next_due_on >  t.dueSoonUntil
 *
 * The due date itself is still on time (overdue from the day after); an index on
 * (program_id, base_state, next_due_on) and one on (program_id, base_state, repair_due_on)
 * serve every count.
 */
export function complianceStateOn(facts: AssemblyFacts, today: IsoDate, rules: ProgramRules = defaultProgramRules): ComplianceState {
  const thresholds = complianceThresholds(today, rules);
  return complianceStateWithThresholds(facts, thresholds);
}

/** complianceStateOn with thresholds computed once (for loops over many assemblies). */
export function complianceStateWithThresholds(facts: AssemblyFacts, thresholds: ComplianceThresholds): ComplianceState {
  if (facts.baseState === 'inactive') return 'inactive';
  if (facts.baseState === 'failed') {
    return facts.repairDueOn !== null && facts.repairDueOn < thresholds.today ? 'repair_overdue' : 'failed_awaiting_repair';
  }
  if (facts.nextDueOn === null) return 'never_tested';
  if (facts.nextDueOn < thresholds.today) return 'overdue';
  if (facts.nextDueOn <= thresholds.dueSoonUntil) return 'due_soon';
  return 'current';
}
