import { RulesInputError } from './errors';

/**
 * Calendar dates as 'YYYY-MM-DD' strings, computed in whole days on the proleptic Gregorian
 * calendar. No time zone ever enters: a date is a calendar day, so arithmetic cannot drift by a
 * day around midnight or a DST change. ISO date strings also sort correctly as plain strings,
 * which the database and the hot loops rely on.
 */
export type IsoDate = string;

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
// An offset is required: a datetime without one would be read in the runtime's local zone.
const ISO_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.\d{1,9})?)?(Z|[+-]\d{2}:\d{2})$/;

/** Leap year on the Gregorian calendar. */
export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

/** Days in a month (month 1–12). */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) return isLeapYear(year) ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

/** True for a real calendar date written 'YYYY-MM-DD' (2023-02-29 is not one). */
export function isIsoDate(value: unknown): value is IsoDate {
  if (typeof value !== 'string' || value.length !== 10) return false;
  const match = ISO_DATE.exec(value);
  if (!match) return false;
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  return month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month);
}

/** Guard for date parameters: a malformed date is a clear error naming the field, never a silent NaN. */
export function assertIsoDate(value: unknown, field: string): asserts value is IsoDate {
  if (!isIsoDate(value)) {
    throw new RulesInputError(field, `${field} must be a calendar date written YYYY-MM-DD (got ${JSON.stringify(value)}).`);
  }
}

/** Days since 1970-01-01 for a civil date (H. Hinnant's days_from_civil; exact integer arithmetic). */
export function dayNumberFromParts(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yearOfEra = y - era * 400;
  const monthFromMarch = month > 2 ? month - 3 : month + 9;
  const dayOfYear = Math.floor((153 * monthFromMarch + 2) / 5) + day - 1;
  const dayOfEra = yearOfEra * 365 + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100) + dayOfYear;
  return era * 146097 + dayOfEra - 719468;
}

/** Civil date for a day number (inverse of dayNumberFromParts). */
export function partsFromDayNumber(dayNumber: number): { year: number; month: number; day: number } {
  const z = dayNumber + 719468;
  const era = Math.floor(z / 146097);
  const dayOfEra = z - era * 146097;
  const yearOfEra = Math.floor((dayOfEra - Math.floor(dayOfEra / 1460) + Math.floor(dayOfEra / 36524) - Math.floor(dayOfEra / 146096)) / 365);
  const dayOfYear = dayOfEra - (365 * yearOfEra + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100));
  const monthFromMarch = Math.floor((5 * dayOfYear + 2) / 153);
  const day = dayOfYear - Math.floor((153 * monthFromMarch + 2) / 5) + 1;
  const month = monthFromMarch < 10 ? monthFromMarch + 3 : monthFromMarch - 9;
  const year = yearOfEra + era * 400 + (month <= 2 ? 1 : 0);
  return { year, month, day };
}

/** 'YYYY-MM-DD' from parts (years 0–9999). */
export function formatIsoDate(year: number, month: number, day: number): IsoDate {
  return `${String(year).padStart(4, '0')}-${month < 10 ? '0' : ''}${month}-${day < 10 ? '0' : ''}${day}`;
}

/** Days since 1970-01-01 for an ISO date (the input is trusted to be valid: check with assertIsoDate first). */
export function toDayNumber(date: IsoDate): number {
  return dayNumberFromParts(Number(date.slice(0, 4)), Number(date.slice(5, 7)), Number(date.slice(8, 10)));
}

/** ISO date for a day number. */
export function fromDayNumber(dayNumber: number): IsoDate {
  const { year, month, day } = partsFromDayNumber(dayNumber);
  return formatIsoDate(year, month, day);
}

/** date + days (days may be negative). */
export function addDays(date: IsoDate, days: number): IsoDate {
  return fromDayNumber(toDayNumber(date) + days);
}

/**
 * date + calendar months; a day the target month lacks becomes its last day
 * (2024-02-29 + 12 months = 2025-02-28; 2024-01-31 + 1 month = 2024-02-29).
 */
export function addMonths(date: IsoDate, months: number): IsoDate {
  const year = Number(date.slice(0, 4));
  const month = Number(date.slice(5, 7));
  const day = Number(date.slice(8, 10));
  const monthIndex = year * 12 + (month - 1) + months;
  const targetYear = Math.floor(monthIndex / 12);
  const targetMonth = monthIndex - targetYear * 12 + 1;
  return formatIsoDate(targetYear, targetMonth, Math.min(day, daysInMonth(targetYear, targetMonth)));
}

/** Whole days from `from` to `to` (positive when `to` is later). */
export function daysBetween(from: IsoDate, to: IsoDate): number {
  return toDayNumber(to) - toDayNumber(from);
}

/** The later of two dates (plain string order is date order for ISO dates). */
export function laterDate(a: IsoDate, b: IsoDate): IsoDate {
  return a >= b ? a : b;
}

/** The earlier of two dates. */
export function earlierDate(a: IsoDate, b: IsoDate): IsoDate {
  return a <= b ? a : b;
}

/** Milliseconds since the epoch for an ISO datetime that carries its offset ('…Z' or '…+02:00'). */
export function parseIsoDateTime(value: unknown, field: string): number {
  const match = typeof value === 'string' ? ISO_DATE_TIME.exec(value) : null;
  if (!match || !isIsoDate(`${match[1]}-${match[2]}-${match[3]}`) || Number(match[4]) > 23 || Number(match[5]) > 59 || Number(match[6] ?? 0) > 59) {
    throw new RulesInputError(field, `${field} must be an ISO datetime with its offset, e.g. 2024-05-02T14:30:00Z (got ${JSON.stringify(value)}).`);
  }
  return Date.parse(value as string);
}

/**
 * The date a yearly test is next due: the last passing test plus the interval in calendar
 * months (12 by default: "at least once a year", Washington WAC 246-290-490(7)(b)).
 */
export function nextTestDue(lastPassingTest: IsoDate, intervalMonths = 12): IsoDate {
  assertIsoDate(lastPassingTest, 'lastPassingTest');
  if (!Number.isInteger(intervalMonths) || intervalMonths < 1) {
    throw new RulesInputError('intervalMonths', `intervalMonths must be a whole number of months, at least 1 (got ${String(intervalMonths)}).`);
  }
  return addMonths(lastPassingTest, intervalMonths);
}
