import "server-only";
import { and, asc, count, eq, gte, isNull, lt, lte, ne, or, sql, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, sites, testReports } from "@/db/schema";
import { assemblyKinds, hazards } from "@/db/schema/inventory";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { addDays, addMonths, complianceStates, complianceThresholds, type ComplianceState } from "@/lib/rules";
import { getProgramContext } from "./settings";

/**
 * The compliance picture. Each state is the SQL twin of lib/rules' complianceStateOn, whose
 * comment defines every state as one comparison of the stored facts with today's thresholds
 * (t = complianceThresholds(today, rules)):
 *
 *   inactive                base_state = 'inactive'
 *   repair_overdue          base_state = 'failed' AND repair_due_on <  t.today
 *   failed_awaiting_repair  base_state = 'failed' AND NOT (repair_due_on < t.today)
 *   never_tested            base_state = 'active' AND next_due_on IS NULL
 *   overdue                 base_state = 'active' AND next_due_on <  t.today
 *   due_soon                base_state = 'active' AND next_due_on BETWEEN t.today AND t.dueSoonUntil
 *   current                 base_state = 'active' AND next_due_on >  t.dueSoonUntil
 *
 * Counted over assemblies_due_idx (program_id, base_state, next_due_on) and
 * assemblies_repair_idx (program_id, base_state, repair_due_on): index-only range scans, so the
 * picture needs no nightly job and is right on the day it is opened.
 */

export const complianceFilterSchema = z.object({
  kind: z.enum(assemblyKinds).optional().catch(undefined),
  hazard: z.enum(hazards).optional().catch(undefined),
  facilityType: z.string().trim().max(60).optional().catch(undefined),
});
export type ComplianceFilter = z.infer<typeof complianceFilterSchema>;

export interface ComplianceCounts {
  today: string;
  dueSoonUntil: string;
  counts: Record<ComplianceState, number>;
  /** Assemblies in service (everything but inactive). */
  inService: number;
}

function stateCondition(state: ComplianceState, t: { today: string; dueSoonUntil: string }): SQL {
  switch (state) {
    case "inactive":
      // A merged field registration is not an assembly of its own: it counts nowhere.
      return and(eq(assemblies.baseState, "inactive"), isNull(assemblies.mergedIntoId))!;
    case "repair_overdue":
      return and(eq(assemblies.baseState, "failed"), lt(assemblies.repairDueOn, t.today))!;
    case "failed_awaiting_repair":
      return and(eq(assemblies.baseState, "failed"), or(isNull(assemblies.repairDueOn), gte(assemblies.repairDueOn, t.today)))!;
    case "never_tested":
      return and(eq(assemblies.baseState, "active"), isNull(assemblies.nextDueOn))!;
    case "overdue":
      return and(eq(assemblies.baseState, "active"), lt(assemblies.nextDueOn, t.today))!;
    case "due_soon":
      return and(eq(assemblies.baseState, "active"), gte(assemblies.nextDueOn, t.today), lte(assemblies.nextDueOn, t.dueSoonUntil))!;
    case "current":
      return and(eq(assemblies.baseState, "active"), sql`${assemblies.nextDueOn} > ${t.dueSoonUntil}`)!;
  }
}

function filterConditions(programId: number, filter: ComplianceFilter): SQL[] {
  const where: SQL[] = [eq(assemblies.programId, programId)];
  if (filter.kind) where.push(eq(assemblies.kind, filter.kind));
  if (filter.hazard) where.push(eq(assemblies.hazard, filter.hazard));
  if (filter.facilityType) where.push(eq(sites.facilityType, filter.facilityType));
  return where;
}

/** How many assemblies are in each state today, for the program or a filter of it. */
export async function getComplianceCounts(actor: Actor, filter: ComplianceFilter = {}): Promise<ComplianceCounts> {
  assertCan(actor, "compliance.view");
  const context = await getProgramContext(staffProgramId(actor));
  const t = complianceThresholds(context.today, context.rules);
  const db = getDb();
  const base = filterConditions(context.id, filter);
  const results = await Promise.all(
    complianceStates.map(async (state) => {
      const query = db.select({ n: count() }).from(assemblies);
      const joined = filter.facilityType ? query.innerJoin(sites, eq(sites.id, assemblies.siteId)) : query;
      const [row] = await joined.where(and(...base, stateCondition(state, t)));
      return [state, Number(row?.n ?? 0)] as const;
    }),
  );
  const counts = Object.fromEntries(results) as Record<ComplianceState, number>;
  const inService = complianceStates.filter((s) => s !== "inactive").reduce((sum, s) => sum + counts[s], 0);
  return { today: context.today, dueSoonUntil: t.dueSoonUntil, counts, inService };
}

export interface MonthTally {
  month: string;
  filed: number;
  passed: number;
  failed: number;
}

/**
 * Tests per month over the last 24 months (by test date), for the whole program: filed (every
 * report but a superseded revision), passed (final outcome, counted reports) and failed (the
 * initial test failed). Index-only ranges of test_reports_tally_idx (program_id, tested_on,
 * status, …). The 23 closed months are counted once a day per program and kept in memory (a
 * report filed late for a closed month shows the next day); the current month is counted live.
 */
export async function getMonthlyTests(actor: Actor): Promise<MonthTally[]> {
  assertCan(actor, "compliance.view");
  const context = await getProgramContext(staffProgramId(actor));
  const firstMonth = `${addMonths(context.today, -23).slice(0, 7)}-01`;
  const currentMonth = `${context.today.slice(0, 7)}-01`;
  const cacheKey = `${context.id}:${context.today}`;
  let closed = closedMonthsCache.get(cacheKey);
  if (!closed) {
    closed = await tallyMonths(context.id, firstMonth, addDays(currentMonth, -1));
    for (const key of closedMonthsCache.keys()) if (key.startsWith(`${context.id}:`)) closedMonthsCache.delete(key);
    closedMonthsCache.set(cacheKey, closed);
  }
  const current = await tallyMonths(context.id, currentMonth, context.today);
  const months: MonthTally[] = [];
  for (let i = 0; i < 24; i++) {
    const key = addMonths(firstMonth, i).slice(0, 7);
    const r = closed.get(key) ?? current.get(key);
    months.push({ month: key, filed: r?.filed ?? 0, passed: r?.passed ?? 0, failed: r?.failed ?? 0 });
  }
  return months;
}

const closedMonthsCache = new Map<string, Map<string, MonthTally>>();

async function tallyMonths(programId: number, from: string, to: string): Promise<Map<string, MonthTally>> {
  const month = sql<string>`DATE_FORMAT(${testReports.testedOn}, '%Y-%m')`;
  const rows = await getDb()
    .select({
      month,
      filed: count(),
      passed: sql<number>`SUM(${testReports.finalOutcome} = 'pass' AND ${testReports.status} <> 'returned')`,
      failed: sql<number>`SUM(${testReports.initialOutcome} = 'fail')`,
    })
    .from(testReports)
    .where(and(eq(testReports.programId, programId), gte(testReports.testedOn, from), lte(testReports.testedOn, to), ne(testReports.status, "superseded")))
    .groupBy(month);
  return new Map(rows.map((r) => [r.month, { month: r.month, filed: Number(r.filed), passed: Number(r.passed ?? 0), failed: Number(r.failed ?? 0) }]));
}

export const overdueListSchema = complianceFilterSchema.extend({
  list: z.enum(["overdue", "repair_overdue", "due_soon", "never_tested", "failed_awaiting_repair"]).optional().default("overdue").catch("overdue"),
  stage: z.enum(["none", "reminder", "overdue", "final"]).optional().catch(undefined),
  /** Keyset: the last row's due date and id. */
  after: z.string().max(40).optional(),
});
export type OverdueListQuery = z.infer<typeof overdueListSchema>;

export interface OverdueRow {
  assemblyId: number;
  siteId: number;
  siteName: string;
  address: string;
  accountNumber: string;
  kind: string;
  serial: string;
  location: string;
  hazard: string;
  dueOn: string | null;
  daysLate: number | null;
  lastTestedOn: string | null;
  noticeStage: string | null;
}

export const OVERDUE_PAGE_SIZE = 50;

/**
 * An attention list (overdue by default), most overdue first, with the notice stage reached in
 * the current cycle and the site to act on. Walks the same index as the counts, in due-date order.
 */
export async function listOverdueAssemblies(actor: Actor, query: OverdueListQuery): Promise<{ rows: OverdueRow[]; next: string | null; today: string }> {
  assertCan(actor, "compliance.view");
  const context = await getProgramContext(staffProgramId(actor));
  const t = complianceThresholds(context.today, context.rules);
  const isRepairList = query.list === "repair_overdue" || query.list === "failed_awaiting_repair";
  const dateColumn = isRepairList ? assemblies.repairDueOn : assemblies.nextDueOn;
  const where: SQL[] = [...filterConditions(context.id, query), stateCondition(query.list, t)];
  if (query.stage === "none") where.push(isNull(assemblies.noticeStage));
  else if (query.stage) where.push(eq(assemblies.noticeStage, query.stage));
  if (query.after) {
    const [date, id] = query.after.split("_");
    const afterId = Number(id);
    if (date && /^\d{4}-\d{2}-\d{2}$/.test(date) && Number.isInteger(afterId)) where.push(or(sql`${dateColumn} > ${date}`, and(eq(dateColumn, date), sql`${assemblies.id} > ${afterId}`))!);
    else if (date === "null" && Number.isInteger(afterId)) where.push(sql`${assemblies.id} > ${afterId}`);
  }
  const rows = await getDb()
    .select({
      assemblyId: assemblies.id,
      siteId: sites.id,
      siteName: sites.name,
      addressLine1: sites.addressLine1,
      city: sites.city,
      accountNumber: sites.accountNumber,
      kind: assemblies.kind,
      serial: assemblies.serial,
      location: assemblies.location,
      hazard: assemblies.hazard,
      dueOn: dateColumn,
      lastTestedOn: assemblies.lastTestedOn,
      noticeStage: assemblies.noticeStage,
    })
    .from(assemblies)
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .where(and(...where))
    .orderBy(asc(dateColumn), asc(assemblies.id))
    .limit(OVERDUE_PAGE_SIZE + 1);
  const page = rows.slice(0, OVERDUE_PAGE_SIZE);
  const todayMs = Date.parse(`${context.today}T00:00:00Z`);
  const last = page.at(-1);
  return {
    today: context.today,
    rows: page.map((r) => ({
      assemblyId: r.assemblyId,
      siteId: r.siteId,
      siteName: r.siteName,
      address: `${r.addressLine1}, ${r.city}`,
      accountNumber: r.accountNumber,
      kind: r.kind,
      serial: r.serial,
      location: r.location,
      hazard: r.hazard,
      dueOn: r.dueOn,
      daysLate: r.dueOn ? Math.round((todayMs - Date.parse(`${r.dueOn}T00:00:00Z`)) / 86_400_000) : null,
      lastTestedOn: r.lastTestedOn,
      noticeStage: r.noticeStage,
    })),
    next: rows.length > OVERDUE_PAGE_SIZE && last ? `${last.dueOn ?? "null"}_${last.assemblyId}` : null,
  };
}

/** Overdue assemblies by the notice stage they have reached (for the picture's stage strip). */
export async function countOverdueByNoticeStage(actor: Actor, filter: ComplianceFilter = {}): Promise<Record<"none" | "reminder" | "overdue" | "final", number>> {
  assertCan(actor, "compliance.view");
  const context = await getProgramContext(staffProgramId(actor));
  const t = complianceThresholds(context.today, context.rules);
  const query = getDb().select({ stage: assemblies.noticeStage, n: count() }).from(assemblies);
  const joined = filter.facilityType ? query.innerJoin(sites, eq(sites.id, assemblies.siteId)) : query;
  const rows = await joined.where(and(...filterConditions(context.id, filter), stateCondition("overdue", t))).groupBy(assemblies.noticeStage);
  const out = { none: 0, reminder: 0, overdue: 0, final: 0 };
  for (const r of rows) out[r.stage ?? "none"] += Number(r.n);
  return out;
}
