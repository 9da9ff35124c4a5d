/** Statement periods: calendar months in a program's time zone, as UTC instants. Pure. */

export interface MonthPeriod {
  month: string;
  first: string;
  last: string;
  /** The first instant of the month in the zone, and the first instant of the next month. */
  startsAt: Date;
  endsBefore: Date;
}

const monthPattern = /^(\d{4})-(0[1-9]|1[0-2])$/;

export function isMonth(value: string): boolean {
  return monthPattern.test(value);
}

/** How far the zone's wall clock is ahead of UTC at an instant, in milliseconds. */
export function zoneOffsetMs(instant: number, timeZone: string): number {
  const parts = new Intl.DateTimeFormat("en-US", { timeZone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" }).formatToParts(new Date(instant));
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? 0);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return asUtc - Math.floor(instant / 1000) * 1000;
}

/** The UTC instant of local midnight starting `date` (YYYY-MM-DD) in the zone. */
export function startOfDayInZone(date: string, timeZone: string): Date {
  const [y, m, d] = date.split("-").map(Number) as [number, number, number];
  const wall = Date.UTC(y, m - 1, d);
  let guess = wall - zoneOffsetMs(wall, timeZone);
  // A second pass settles days where the offset changes (daylight saving) near midnight.
  guess = wall - zoneOffsetMs(guess, timeZone);
  return new Date(guess);
}

export function monthPeriod(month: string, timeZone: string): MonthPeriod | null {
  const match = monthPattern.exec(month);
  if (!match) return null;
  const year = Number(match[1]);
  const m = Number(match[2]);
  const days = new Date(Date.UTC(year, m, 0)).getUTCDate();
  const next = m === 12 ? `${year + 1}-01-01` : `${year}-${String(m + 1).padStart(2, "0")}-01`;
  return { month, first: `${month}-01`, last: `${month}-${String(days).padStart(2, "0")}`, startsAt: startOfDayInZone(`${month}-01`, timeZone), endsBefore: startOfDayInZone(next, timeZone) };
}

/** "November 2026". */
export function monthLabel(month: string): string {
  const [y, m] = month.split("-").map(Number) as [number, number];
  return new Date(Date.UTC(y, m - 1, 1)).toLocaleDateString("en-US", { month: "long", year: "numeric", timeZone: "UTC" });
}

/** The month (YYYY-MM) an instant falls in, in the zone. */
export function monthOf(instant: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit" }).formatToParts(instant);
  return `${parts.find((p) => p.type === "year")?.value}-${parts.find((p) => p.type === "month")?.value}`;
}

/** The last `count` months up to and including `month`, newest first. */
export function recentMonths(month: string, count: number): string[] {
  const [y, m] = month.split("-").map(Number) as [number, number];
  return Array.from({ length: count }, (_, i) => {
    const d = new Date(Date.UTC(y, m - 1 - i, 1));
    return `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, "0")}`;
  });
}

/** "2026-11-04" for an instant, in the zone. */
export function dateInZone(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(instant);
}
