import { RulesInputError } from './errors';
import { addDays, assertIsoDate, isIsoDate, type IsoDate } from './dates';
import type { BaseState } from './compliance';

/** Kinds of owner notice. */
export type NoticeKind = 'reminder' | 'overdue' | 'final' | 'repair_reminder';

/** Every notice kind, in the order of their stages. */
export const noticeKinds: readonly NoticeKind[] = Object.freeze(['reminder', 'overdue', 'final', 'repair_reminder'] as const);

/** When each notice goes out, in days relative to the due date (or the repair due date). */
export interface NoticeSchedule {
  reminderDaysBefore: number;
  overdueDaysAfter: number;
  finalDaysAfter: number;
  repairReminderDaysBefore: number;
}

/**
 * Defaults: reminder 30 days before due, overdue notice the day after, final notice at 30 days
 * overdue [S: local programs use 30–45 days before, and 30 / 2 weeks or 45 / 30 / 15 days];
 * repair reminder 7 days before the repair deadline [M].
 */
export const defaultNoticeSchedule: NoticeSchedule = Object.freeze({
  reminderDaysBefore: 30,
  overdueDaysAfter: 1,
  finalDaysAfter: 30,
  repairReminderDaysBefore: 7,
});

/** One thing wrong with a notice schedule. */
export interface NoticeScheduleProblem {
  field: keyof NoticeSchedule | '';
  message: string;
}

const MAX_SCHEDULE_DAYS = 366;

/**
 * Problems with a notice schedule (empty = usable). Days are whole and not negative; the
 * stages must come in order without overlap: reminder on or before the due date, overdue from
 * at least the day after it (the due date itself is still on time), final strictly after overdue.
 */
export function validateNoticeSchedule(schedule: unknown): NoticeScheduleProblem[] {
  if (schedule === null || typeof schedule !== 'object') return [{ field: '', message: 'A notice schedule must be an object.' }];
  const candidate = schedule as Record<string, unknown>;
  const problems: NoticeScheduleProblem[] = [];
  const fields: Array<[keyof NoticeSchedule, string]> = [
    ['reminderDaysBefore', 'The reminder'],
    ['overdueDaysAfter', 'The overdue notice'],
    ['finalDaysAfter', 'The final notice'],
    ['repairReminderDaysBefore', 'The repair reminder'],
  ];
  for (const [field, name] of fields) {
    const value = candidate[field];
    if (typeof value !== 'number' || !Number.isInteger(value)) problems.push({ field, message: `${name} needs a whole number of days (got ${JSON.stringify(value)}).` });
    else if (value < 0) problems.push({ field, message: `${name} cannot be a negative number of days (got ${value}).` });
    else if (value > MAX_SCHEDULE_DAYS) problems.push({ field, message: `${name} is more than ${MAX_SCHEDULE_DAYS} days from its date (got ${value}).` });
  }
  if (problems.length > 0) return problems;
  const overdue = candidate.overdueDaysAfter as number;
  const final = candidate.finalDaysAfter as number;
  if (overdue < 1) problems.push({ field: 'overdueDaysAfter', message: 'The overdue notice must go out at least 1 day after the due date: on the due date the test is still on time.' });
  if (final <= overdue) problems.push({ field: 'finalDaysAfter', message: `The final notice (${final} days after due) must come after the overdue notice (${overdue} days after due).` });
  return problems;
}

const validatedSchedules = new WeakSet<object>();

function assertNoticeSchedule(schedule: NoticeSchedule): void {
  if (validatedSchedules.has(schedule)) return;
  const problems = validateNoticeSchedule(schedule);
  if (problems.length > 0) throw new RulesInputError(`schedule.${problems[0]!.field}`, problems.map((problem) => problem.message).join(' '));
  validatedSchedules.add(schedule);
}

/**
 * The identity of one notice: each notice is sent once per kind per due cycle. The cycle is the
 * due date the notice is about (the repair due date for a repair reminder), so a new passing
 * test (new due date) starts a fresh cycle. Store it with a unique index and the batch is safe
 * to re-run.
 */
export function noticeKey(assemblyId: string | number, kind: NoticeKind, dueCycle: IsoDate): string {
  return `${assemblyId}:${kind}:${dueCycle}`;
}

/** What the planner needs of an assembly: its id and its stored compliance facts. */
export interface NoticeCandidate {
  id: string | number;
  baseState: BaseState;
  nextDueOn: IsoDate | null;
  repairDueOn: IsoDate | null;
  /** false = no e-mail address on file: the notice is planned as a letter. */
  ownerHasEmail?: boolean;
}

/** A notice to send today. */
export interface PlannedNotice {
  key: string;
  kind: NoticeKind;
  assemblyId: string | number;
  /** The due date (or repair due date) the notice is about. */
  dueCycle: IsoDate;
  channel: 'email' | 'letter';
}

/**
 * Date bounds for today: a due date on or before `finalIfDueOnOrBefore` is at the final stage,
 * and so on. SQL can select the candidates with the same comparisons.
 */
export interface NoticeThresholds {
  today: IsoDate;
  reminderIfDueOnOrBefore: IsoDate;
  overdueIfDueOnOrBefore: IsoDate;
  finalIfDueOnOrBefore: IsoDate;
  repairReminderIfDueOnOrBefore: IsoDate;
}

/** The stage bounds for `today` under a schedule. */
export function noticeThresholds(today: IsoDate, schedule: NoticeSchedule = defaultNoticeSchedule): NoticeThresholds {
  assertIsoDate(today, 'today');
  assertNoticeSchedule(schedule);
  return {
    today,
    reminderIfDueOnOrBefore: addDays(today, schedule.reminderDaysBefore),
    overdueIfDueOnOrBefore: addDays(today, -schedule.overdueDaysAfter),
    finalIfDueOnOrBefore: addDays(today, -schedule.finalDaysAfter),
    repairReminderIfDueOnOrBefore: addDays(today, schedule.repairReminderDaysBefore),
  };
}

function assertCandidateDate(value: unknown, index: number, field: string): void {
  if (value !== null && !isIsoDate(value)) {
    throw new RulesInputError(`assemblies.${index}.${field}`, `assemblies[${index}].${field} must be a date written YYYY-MM-DD or null (got ${JSON.stringify(value)}).`);
  }
}

/**
 * The stage an assembly's current cycle has reached today, or null (nothing due yet, or inactive,
 * or no due date known). Failed assemblies get the repair cycle only: a routine "test due"
 * notice for an assembly just tested and failed would mislead; the repair reminder runs from
 * repairReminderDaysBefore days before the repair deadline up to the deadline itself (after it
 * the repair is overdue and goes to the inspector's list).
 */
export function noticeStageDue(assembly: NoticeCandidate, thresholds: NoticeThresholds): { kind: NoticeKind; dueCycle: IsoDate } | null {
  if (assembly.baseState === 'failed') {
    const repairDueOn = assembly.repairDueOn;
    if (repairDueOn === null || repairDueOn < thresholds.today || repairDueOn > thresholds.repairReminderIfDueOnOrBefore) return null;
    return { kind: 'repair_reminder', dueCycle: repairDueOn };
  }
  if (assembly.baseState !== 'active') return null;
  const dueOn = assembly.nextDueOn;
  if (dueOn === null) return null;
  if (dueOn <= thresholds.finalIfDueOnOrBefore) return { kind: 'final', dueCycle: dueOn };
  if (dueOn <= thresholds.overdueIfDueOnOrBefore) return { kind: 'overdue', dueCycle: dueOn };
  if (dueOn <= thresholds.reminderIfDueOnOrBefore) return { kind: 'reminder', dueCycle: dueOn };
  return null;
}

/** Planner input. */
export interface NoticePlanInput {
  today: IsoDate;
  schedule?: NoticeSchedule;
  assemblies: readonly NoticeCandidate[];
  /** Keys (noticeKey) of every notice already sent; a Set so each look-up is O(1). */
  alreadySent: ReadonlySet<string>;
}

/**
 * Exactly the notices to send today, in input order.
 * - Only the furthest stage reached today is sent: a batch that did not run for some days
 *   sends the overdue notice and never a stale reminder with it.
 * - Nothing is sent for a cycle where that stage, or a later one, was already sent: re-running
 *   the same day (alreadySent holding what was sent) plans nothing, and a stage is never sent
 *   after a later one.
 * - Inactive assemblies and assemblies with no due date get none.
 */
export function planNotices({ today, schedule = defaultNoticeSchedule, assemblies, alreadySent }: NoticePlanInput): PlannedNotice[] {
  const thresholds = noticeThresholds(today, schedule);
  const planned: PlannedNotice[] = [];
  for (let index = 0; index < assemblies.length; index++) {
    const assembly = assemblies[index]!;
    if (assembly.baseState === 'inactive') continue;
    assertCandidateDate(assembly.nextDueOn, index, 'nextDueOn');
    assertCandidateDate(assembly.repairDueOn, index, 'repairDueOn');
    const stage = noticeStageDue(assembly, thresholds);
    if (stage === null) continue;
    const key = noticeKey(assembly.id, stage.kind, stage.dueCycle);
    if (alreadySent.has(key)) continue;
    if (stage.kind === 'reminder' && (alreadySent.has(noticeKey(assembly.id, 'overdue', stage.dueCycle)) || alreadySent.has(noticeKey(assembly.id, 'final', stage.dueCycle)))) continue;
    if (stage.kind === 'overdue' && alreadySent.has(noticeKey(assembly.id, 'final', stage.dueCycle))) continue;
    planned.push({ key, kind: stage.kind, assemblyId: assembly.id, dueCycle: stage.dueCycle, channel: assembly.ownerHasEmail === false ? 'letter' : 'email' });
  }
  return planned;
}

/**
 * The furthest notice already sent for the assembly's current cycle (its nextDueOn, or its
 * repairDueOn while failed), or null: the "notice stage" of the overdue list.
 */
export function noticeStageOf(assembly: Pick<NoticeCandidate, 'id' | 'baseState' | 'nextDueOn' | 'repairDueOn'>, alreadySent: ReadonlySet<string>): NoticeKind | null {
  if (assembly.baseState === 'inactive') return null;
  if (assembly.baseState === 'failed') {
    return assembly.repairDueOn !== null && alreadySent.has(noticeKey(assembly.id, 'repair_reminder', assembly.repairDueOn)) ? 'repair_reminder' : null;
  }
  if (assembly.nextDueOn === null) return null;
  for (const kind of ['final', 'overdue', 'reminder'] as const) {
    if (alreadySent.has(noticeKey(assembly.id, kind, assembly.nextDueOn))) return kind;
  }
  return null;
}
