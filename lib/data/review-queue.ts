import "server-only";
import { and, asc, count, desc, eq, gt, lt, min, or, sql, type Placeholder, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, testReports } from "@/db/schema";
import { assemblyKinds } from "@/db/schema/inventory";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { InputError } from "@/lib/errors";
import { prepared } from "./prepared";
import type { SuspiciousSignal, ValidityIssue } from "@/lib/rules";
import type { AssemblySnapshot, TesterSnapshot } from "./report-detail";

/**
 * The review queue: the program's reports with status 'queued', oldest first. Every page is one
 * range scan of test_reports_queue_idx (program_id, status, submitted_at) from a keyset cursor;
 * the queue itself is bounded by what is waiting (a busy day adds about 2,000), never by the
 * years of history behind it, so counts and filters over it stay cheap at 1.5 million reports.
 */

export const queueSorts = ["oldest", "newest", "tested_oldest", "tested_newest"] as const;
export type QueueSort = (typeof queueSorts)[number];

export const queueFilterSchema = z.object({
  kind: z.enum(assemblyKinds, { message: "Choose an assembly kind from the list." }).optional().catch(undefined),
  grade: z.enum(["pass", "fail", "repaired"], { message: "Choose pass, fail or passed after repair." }).optional().catch(undefined),
  testerId: z.coerce.number().int().positive().optional().catch(undefined),
  /** Waiting longer than this many days. */
  age: z.coerce.number().int().min(1).max(365).optional().catch(undefined),
  flags: z.enum(["clean", "flagged", "signals", "credentials", "errors"]).optional().catch(undefined),
});
export type QueueFilter = z.infer<typeof queueFilterSchema>;

export const queuePageSchema = queueFilterSchema.extend({
  sort: z.enum(queueSorts).default("oldest").catch("oldest"),
  cursor: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(5).max(100).default(25).catch(25),
});
export type QueuePageQuery = z.infer<typeof queuePageSchema>;

const certificationCodes = new Set(["certification_missing", "certification_expired", "certification_not_yet_valid", "certification_invalid_on_test_date"]);
const kitCodes = new Set(["kit_verification_missing", "kit_verification_expired", "kit_verified_after_test", "kit_invalid_on_test_date"]);

export interface QueueRow {
  id: number;
  reportNumber: string;
  revision: number;
  submittedAt: string;
  testedOn: string;
  waitingDays: number;
  kind: string;
  serial: string;
  location: string;
  siteName: string;
  address: string;
  siteId: number;
  assemblyId: number;
  isUnconfirmedAssembly: boolean;
  testerId: number;
  testerName: string;
  company: string | null;
  initialOutcome: "pass" | "fail" | "incomplete";
  finalOutcome: "pass" | "fail";
  wasRepaired: boolean;
  /** The tester's certification and the kit's verification on the test date, from the stored findings. */
  certification: { isValid: boolean; messages: string[] };
  kit: { isValid: boolean; messages: string[] };
  /** Plausibility findings other than the two above. */
  warnings: { severity: "error" | "warning"; message: string }[];
  signals: { code: string; message: string }[];
  isClean: boolean;
}

export interface QueuePage {
  rows: QueueRow[];
  /** Everything waiting in the program. */
  total: number;
  /** Waiting and matching the filter. */
  matching: number;
  nextCursor: string | null;
}

/**
 * The values a queue WHERE compares with: plain values for a one-off statement, or placeholders
 * for a prepared one (the grade and flag filters are fixed SQL, so they belong to the shape).
 */
interface QueueBinds {
  programId: number | Placeholder;
  kind?: QueueFilter["kind"] | Placeholder;
  testerId?: number | Placeholder;
  submittedBefore?: Date | Placeholder;
}

function bindsOf(programId: number, filter: QueueFilter, now: Date): QueueBinds {
  return { programId, kind: filter.kind, testerId: filter.testerId, submittedBefore: filter.age ? new Date(now.getTime() - filter.age * 86_400_000) : undefined };
}

/** The shared WHERE of the queue and a filter. */
function queueConditions(binds: QueueBinds, filter: QueueFilter): SQL[] {
  const where: SQL[] = [eq(testReports.programId, binds.programId), eq(testReports.status, "queued")];
  if (binds.kind !== undefined) where.push(eq(testReports.assemblyKind, binds.kind));
  if (filter.grade === "pass") where.push(eq(testReports.finalOutcome, "pass"), eq(testReports.wasRepaired, false));
  if (filter.grade === "fail") where.push(eq(testReports.finalOutcome, "fail"));
  if (filter.grade === "repaired") where.push(eq(testReports.finalOutcome, "pass"), eq(testReports.wasRepaired, true));
  if (binds.testerId !== undefined) where.push(eq(testReports.testerId, binds.testerId));
  if (binds.submittedBefore !== undefined) where.push(lt(testReports.submittedAt, binds.submittedBefore));
  if (filter.flags === "clean") where.push(eq(testReports.isClean, true));
  if (filter.flags === "flagged") where.push(gt(testReports.warningCount, 0));
  if (filter.flags === "signals") where.push(sql`JSON_LENGTH(${testReports.signals}) > 0`);
  if (filter.flags === "errors") where.push(sql`JSON_SEARCH(${testReports.validity}, 'one', 'error', NULL, '$[*].severity') IS NOT NULL`);
  if (filter.flags === "credentials") {
    where.push(
      sql`(JSON_SEARCH(${testReports.validity}, 'one', 'certification%', NULL, '$[*].code') IS NOT NULL OR JSON_SEARCH(${testReports.validity}, 'one', 'kit%', NULL, '$[*].code') IS NOT NULL
        OR JSON_SEARCH(${testReports.signals}, 'one', 'certification%', NULL, '$[*].code') IS NOT NULL OR JSON_SEARCH(${testReports.signals}, 'one', 'kit%', NULL, '$[*].code') IS NOT NULL)`,
    );
  }
  return where;
}

/** The same WHERE with a placeholder for every value the filter sets. */
function placeholderBinds(filter: QueueFilter): QueueBinds {
  return {
    programId: sql.placeholder("programId"),
    kind: filter.kind ? sql.placeholder("kind") : undefined,
    testerId: filter.testerId ? sql.placeholder("testerId") : undefined,
    submittedBefore: filter.age ? sql.placeholder("submittedBefore") : undefined,
  };
}

/** The placeholder values for a filter (timestamps as the column stores them). */
function placeholderValues(programId: number, filter: QueueFilter, now: Date): Record<string, unknown> {
  const binds = bindsOf(programId, filter, now);
  return {
    programId,
    kind: binds.kind,
    testerId: binds.testerId,
    submittedBefore: binds.submittedBefore instanceof Date ? testReports.submittedAt.mapToDriverValue(binds.submittedBefore) : undefined,
  };
}

/** What changes a queue statement's SQL (never a value), as a cache key. */
function shapeOf(filter: QueueFilter): string {
  return [filter.kind ? "k" : "", filter.grade ?? "", filter.testerId ? "t" : "", filter.age ? "a" : "", filter.flags ?? ""].join("|");
}

interface Cursor {
  v: string;
  id: number;
}

function encodeCursor(cursor: Cursor): string {
  return Buffer.from(JSON.stringify(cursor)).toString("base64url");
}

function decodeCursor(raw: string | undefined): Cursor | null {
  if (!raw) return null;
  try {
    const parsed = JSON.parse(Buffer.from(raw, "base64url").toString("utf8")) as Cursor;
    if (typeof parsed.v !== "string" || !Number.isInteger(parsed.id)) throw new Error("bad cursor");
    return parsed;
  } catch {
    throw new InputError("The page link is out of date: go back to the first page.", { cursor: ["Unreadable cursor."] });
  }
}

function splitFindings(validity: ValidityIssue[], signals: SuspiciousSignal[]) {
  const certification: string[] = [];
  const kit: string[] = [];
  const warnings: QueueRow["warnings"] = [];
  for (const issue of validity) {
    if (certificationCodes.has(issue.code)) certification.push(issue.message);
    else if (kitCodes.has(issue.code)) kit.push(issue.message);
    else warnings.push({ severity: issue.severity, message: issue.message });
  }
  const otherSignals: QueueRow["signals"] = [];
  for (const signal of signals) {
    if (certificationCodes.has(signal.code)) certification.push(signal.message);
    else if (kitCodes.has(signal.code)) kit.push(signal.message);
    else otherSignals.push({ code: signal.code, message: signal.message });
  }
  return { certification: { isValid: certification.length === 0, messages: certification }, kit: { isValid: kit.length === 0, messages: kit }, warnings, signals: otherSignals };
}

function buildPageStatement(filter: QueueFilter, sort: QueueSort, hasCursor: boolean) {
  const where = queueConditions(placeholderBinds(filter), filter);
  // Each sort is a column plus the id as tie-breaker, so a cursor names one exact place.
  const byTested = sort === "tested_oldest" || sort === "tested_newest";
  const isDescending = sort === "newest" || sort === "tested_newest";
  const column = byTested ? testReports.testedOn : testReports.submittedAt;
  if (hasCursor) {
    const beyond = isDescending ? lt : gt;
    where.push(or(beyond(column, sql.placeholder("cursorValue")), and(eq(column, sql.placeholder("cursorValue")), beyond(testReports.id, sql.placeholder("cursorId"))))!);
  }
  const order = isDescending ? [desc(column), desc(testReports.id)] : [asc(column), asc(testReports.id)];
  return getDb()
    .select({
      id: testReports.id,
      reportNumber: testReports.reportNumber,
      revision: testReports.revision,
      submittedAt: testReports.submittedAt,
      testedOn: testReports.testedOn,
      assemblyId: testReports.assemblyId,
      siteId: assemblies.siteId,
      assemblyStatus: assemblies.status,
      kind: assemblies.kind,
      testerId: testReports.testerId,
      assemblySnapshot: testReports.assemblySnapshot,
      testerSnapshot: testReports.testerSnapshot,
      initialOutcome: testReports.initialOutcome,
      finalOutcome: testReports.finalOutcome,
      wasRepaired: testReports.wasRepaired,
      validity: testReports.validity,
      signals: testReports.signals,
      isClean: testReports.isClean,
      // The counts ride along on every row: uncorrelated, so the database works each out once,
      // and the page costs one statement.
      ...queueCounts(filter),
    })
    .from(testReports)
    .innerJoin(assemblies, eq(assemblies.id, testReports.assemblyId))
    .where(and(...where))
    .orderBy(...order)
    .limit(sql.placeholder("limit"))
    .prepare();
}

/** Everything queued, and what the filter matches: each count reads its own index range. */
function queueCounts(filter: QueueFilter) {
  const db = getDb();
  const all = db.select({ n: count() }).from(testReports).where(and(eq(testReports.programId, sql.placeholder("programId")), eq(testReports.status, "queued")));
  // Every filter is on the report itself (it carries the kind it tested): no join to count.
  const matching = db.select({ n: count() }).from(testReports).where(and(...queueConditions(placeholderBinds(filter), filter)));
  return { total: sql<number>`(${all})`, matching: sql<number>`(${matching})` };
}

/** The two counts alone, for a page with no rows to carry them. */
function buildCountStatement(filter: QueueFilter) {
  return getDb().select(queueCounts(filter)).from(sql`DUAL`).prepare();
}

export async function listReviewQueue(actor: Actor, query: QueuePageQuery, now = new Date()): Promise<QueuePage> {
  assertCan(actor, "reports.review");
  const programId = staffProgramId(actor);
  const cursor = decodeCursor(query.cursor);
  const byTested = query.sort === "tested_oldest" || query.sort === "tested_newest";
  // Prepared once per shape (which filters are set, the sort, whether there is a cursor): at
  // most a few hundred, each built on its first request.
  const page = prepared(`queue.page|${shapeOf(query)}|${query.sort}|${cursor ? "c" : ""}`, () => buildPageStatement(query, query.sort, Boolean(cursor)));
  const values = placeholderValues(programId, query, now);
  const cursorValues = cursor ? { cursorValue: byTested ? cursor.v : testReports.submittedAt.mapToDriverValue(new Date(cursor.v)), cursorId: cursor.id } : {};

  const rows = await page.execute({ ...values, ...cursorValues, limit: query.limit + 1 });
  const [countRow] = rows.length > 0 ? rows : await prepared(`queue.count|${shapeOf(query)}`, () => buildCountStatement(query)).execute(values);
  const hasMore = rows.length > query.limit;
  const pageRows = rows.slice(0, query.limit);
  const last = pageRows.at(-1);
  return {
    rows: pageRows.map((r) => {
      const site = r.assemblySnapshot as AssemblySnapshot;
      const tester = r.testerSnapshot as TesterSnapshot;
      return {
        id: r.id,
        reportNumber: r.reportNumber,
        revision: r.revision,
        submittedAt: r.submittedAt.toISOString(),
        testedOn: r.testedOn,
        waitingDays: Math.max(0, Math.floor((now.getTime() - r.submittedAt.getTime()) / 86_400_000)),
        kind: r.kind,
        serial: site.serial,
        location: site.location,
        siteName: site.siteName,
        address: site.address,
        siteId: r.siteId,
        assemblyId: r.assemblyId,
        isUnconfirmedAssembly: r.assemblyStatus === "awaiting_confirmation",
        testerId: r.testerId,
        testerName: tester.name,
        company: tester.company,
        initialOutcome: r.initialOutcome,
        finalOutcome: r.finalOutcome,
        wasRepaired: r.wasRepaired,
        ...splitFindings((r.validity as ValidityIssue[]) ?? [], (r.signals as SuspiciousSignal[]) ?? []),
        isClean: r.isClean,
      };
    }),
    total: Number(countRow?.total ?? 0),
    matching: Number(countRow?.matching ?? 0),
    nextCursor: hasMore && last ? encodeCursor({ v: byTested ? last.testedOn : last.submittedAt.toISOString(), id: last.id }) : null,
  };
}

/** The largest set "accept all clean passes" takes in one confirmation. */
export const CLEAN_PASS_LIMIT = 5000;

/**
 * The clean passes in a filter, oldest first: what "accept all clean passes" will accept. The
 * inspector confirms this exact list; reports arriving afterwards are not in it.
 */
export async function listCleanPassIds(actor: Actor, filter: QueueFilter, now = new Date()): Promise<{ ids: number[]; count: number; isCapped: boolean }> {
  assertCan(actor, "reports.review");
  const programId = staffProgramId(actor);
  const clean = { ...filter, flags: "clean" as const };
  const where = [...queueConditions(bindsOf(programId, clean, now), clean), eq(testReports.finalOutcome, "pass")];
  const rows = await getDb()
    .select({ id: testReports.id })
    .from(testReports)
    .where(and(...where))
    .orderBy(asc(testReports.submittedAt), asc(testReports.id))
    .limit(CLEAN_PASS_LIMIT + 1);
  const isCapped = rows.length > CLEAN_PASS_LIMIT;
  const ids = rows.slice(0, CLEAN_PASS_LIMIT).map((r) => r.id);
  return { ids, count: ids.length, isCapped };
}

export interface QueueStats {
  waiting: number;
  oldestSubmittedAt: string | null;
  cleanPasses: number;
  flagged: number;
  failed: number;
}

/** The queue at a glance (one range scan of the queue index). */
export async function getQueueStats(actor: Actor): Promise<QueueStats> {
  assertCan(actor, "reports.review");
  const programId = staffProgramId(actor);
  const [row] = await getDb()
    .select({
      waiting: count(),
      oldest: min(testReports.submittedAt),
      clean: sql<number>`COALESCE(SUM(${testReports.isClean} AND ${testReports.finalOutcome} = 'pass'), 0)`,
      flagged: sql<number>`COALESCE(SUM(${testReports.warningCount} > 0), 0)`,
      failed: sql<number>`COALESCE(SUM(${testReports.finalOutcome} = 'fail'), 0)`,
    })
    .from(testReports)
    .where(and(eq(testReports.programId, programId), eq(testReports.status, "queued")));
  return {
    waiting: Number(row?.waiting ?? 0),
    oldestSubmittedAt: row?.oldest ? new Date(row.oldest).toISOString() : null,
    cleanPasses: Number(row?.clean ?? 0),
    flagged: Number(row?.flagged ?? 0),
    failed: Number(row?.failed ?? 0),
  };
}

/** Testers with something waiting, for the tester filter. */
export async function listQueueTesters(actor: Actor): Promise<{ id: number; name: string; waiting: number }[]> {
  assertCan(actor, "reports.review");
  const programId = staffProgramId(actor);
  const rows = await getDb()
    .select({ id: testReports.testerId, name: sql<string>`MIN(JSON_UNQUOTE(JSON_EXTRACT(${testReports.testerSnapshot}, '$.name')))`, waiting: count() })
    .from(testReports)
    .where(and(eq(testReports.programId, programId), eq(testReports.status, "queued")))
    .groupBy(testReports.testerId);
  return rows.map((r) => ({ id: r.id, name: r.name, waiting: Number(r.waiting) })).sort((a, b) => a.name.localeCompare(b.name));
}

/** The oldest waiting report other than this one: where "next" goes after a decision. */
export async function findNextQueuedReport(actor: Actor, afterReportId: number): Promise<number | null> {
  assertCan(actor, "reports.review");
  const programId = staffProgramId(actor);
  const [row] = await getDb()
    .select({ id: testReports.id })
    .from(testReports)
    .where(and(eq(testReports.programId, programId), eq(testReports.status, "queued"), sql`${testReports.id} <> ${afterReportId}`))
    .orderBy(asc(testReports.submittedAt), asc(testReports.id))
    .limit(1);
  return row?.id ?? null;
}
