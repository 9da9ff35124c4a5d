// Display helpers shared by the staff pages (server and browser). Pure.

const monthNames = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** "2026-03-05" → "5 Mar 2026"; empty for null. */
export function formatDay(date: string | null | undefined): string {
  if (!date) return "";
  const [y, m, d] = date.slice(0, 10).split("-");
  return `${Number(d)} ${monthNames[Number(m) - 1] ?? m} ${y}`;
}

/** "2026-03" → "Mar 2026" (or "Mar" with short). */
export function formatMonth(month: string, short = false): string {
  const [y, m] = month.split("-");
  const name = monthNames[Number(m) - 1] ?? m;
  return short ? `${name}` : `${name} ${y}`;
}

/** An instant in the program's time zone: "5 Mar 2026, 14:07". */
export function formatInstant(iso: string | null | undefined, timezone: string): string {
  if (!iso) return "";
  return new Intl.DateTimeFormat("en-GB", { timeZone: timezone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hour12: false }).format(new Date(iso));
}

export function formatCount(n: number): string {
  return n.toLocaleString("en-US");
}

/** Whole days between two calendar days (b − a). */
export function daysBetween(a: string, b: string): number {
  return Math.round((Date.parse(`${b.slice(0, 10)}T00:00:00Z`) - Date.parse(`${a.slice(0, 10)}T00:00:00Z`)) / 86_400_000);
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatCount(n)} ${n === 1 ? one : many}`;
}

export const hazardShort: Record<string, string> = { severe: "Severe", high: "High", low: "Low" };

export const stateTone: Record<string, "pass" | "fail" | "caution" | "neutral" | "muted" | "brand"> = {
  current: "pass",
  due_soon: "caution",
  overdue: "fail",
  failed_awaiting_repair: "caution",
  repair_overdue: "fail",
  never_tested: "muted",
  inactive: "neutral",
};

export const stateLabel: Record<string, string> = {
  current: "Current",
  due_soon: "Due soon",
  overdue: "Overdue",
  failed_awaiting_repair: "Failed, awaiting repair",
  repair_overdue: "Repair overdue",
  never_tested: "Never tested",
  inactive: "Out of service",
};

export const noticeStageLabel: Record<string, string> = { reminder: "Reminder sent", overdue: "Overdue notice sent", final: "Final notice sent" };
