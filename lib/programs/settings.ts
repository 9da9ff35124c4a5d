// Program settings (a database row) → the plain rule data lib/rules works with. Pure.
import { defaultRuleSet, ruleSetById, type NoticeSchedule, type ProgramRules, type RuleSet } from "@/lib/rules";

export interface ProgramSettingsLike {
  testIntervalMonths: number;
  dueModel: "anniversary" | "window";
  windowStart: string;
  windowEnd: string;
  dueSoonDays: number;
  repairDaysSevere: number;
  repairDaysHigh: number;
  repairDaysLow: number;
  reportDeadlineDays: number;
  reminderDaysBefore: number;
  overdueDaysAfter: number;
  finalDaysAfter: number;
  repairReminderDaysBefore: number;
  ruleSetEdition: string;
}

export function programRulesFromSettings(s: ProgramSettingsLike): ProgramRules {
  return {
    testIntervalMonths: s.testIntervalMonths,
    dueModel: s.dueModel === "window" ? { kind: "window", startMonthDay: s.windowStart, endMonthDay: s.windowEnd } : { kind: "anniversary" },
    dueSoonDays: s.dueSoonDays,
    repairDays: { severe: s.repairDaysSevere, high: s.repairDaysHigh, low: s.repairDaysLow },
    reportDeadlineDays: s.reportDeadlineDays,
  };
}

export function noticeScheduleFromSettings(s: ProgramSettingsLike): NoticeSchedule {
  return {
    reminderDaysBefore: s.reminderDaysBefore,
    overdueDaysAfter: s.overdueDaysAfter,
    finalDaysAfter: s.finalDaysAfter,
    repairReminderDaysBefore: s.repairReminderDaysBefore,
  };
}

/** The edition in force: a published one by id, or one of the program's local editions. */
export function ruleSetForEdition(edition: string, localEditions: readonly { edition: string; data: unknown }[] = []): RuleSet {
  const published = ruleSetById(edition);
  if (published) return published;
  const local = localEditions.find((e) => e.edition === edition);
  return (local?.data as RuleSet | undefined) ?? defaultRuleSet;
}

// A formatter per zone, made once: building one costs more than a whole look-up of a program.
const dayFormatters = new Map<string, Intl.DateTimeFormat>();
function dayFormatter(timezone: string): Intl.DateTimeFormat {
  let formatter = dayFormatters.get(timezone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat("en-CA", { timeZone: timezone, year: "numeric", month: "2-digit", day: "2-digit" });
    dayFormatters.set(timezone, formatter);
  }
  return formatter;
}

/** "Today" in the program's time zone, as YYYY-MM-DD. */
export function todayInZone(timezone: string, now: Date = new Date()): string {
  const parts = dayFormatter(timezone).formatToParts(now);
  const get = (type: string) => parts.find((p) => p.type === type)?.value ?? "";
  return `${get("year")}-${get("month")}-${get("day")}`;
}
