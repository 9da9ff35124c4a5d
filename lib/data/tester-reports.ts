import "server-only";
import { and, asc, desc, eq, gte, inArray, like, lte, ne, or, sql, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, reviews, sites, testReports } from "@/db/schema";
import { reportStatuses } from "@/db/schema/reports";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { NotFoundError } from "@/lib/errors";
import { isIsoDate } from "@/lib/rules";
import { prefixPattern } from "./assemblies-search";

export const reportSortKeys = ["testedOn", "submittedAt", "reportNumber", "status", "outcome"] as const;
export type ReportSortKey = (typeof reportSortKeys)[number];

const isoDate = z.string().refine(isIsoDate, { message: "Write dates as YYYY-MM-DD." });

export const myReportsQuerySchema = z
  .object({
    page: z.coerce.number().int().min(1).max(10_000).default(1),
    pageSize: z.coerce.number().int().min(5).max(100).default(20),
    sort: z.enum(reportSortKeys, { message: "Sort by testedOn, submittedAt, reportNumber, status or outcome." }).default("testedOn"),
    dir: z.enum(["asc", "desc"]).default("desc"),
    /** Comma-separated statuses; "open" = waiting for review or fee; "all" includes superseded revisions. */
    status: z
      .string()
      .default("")
      .transform((value, context) => {
        if (value === "" || value === "current") return null;
        if (value === "all") return [...reportStatuses];
        if (value === "open") return ["awaiting_fee", "queued"] as (typeof reportStatuses)[number][];
        const parts = value.split(",").map((s) => s.trim());
        const known = new Set<string>(reportStatuses);
        if (parts.some((p) => !known.has(p))) {
          context.addIssue({ code: "custom", message: `Filter by ${reportStatuses.join(", ")}, "open" or "all".` });
          return z.NEVER;
        }
        return parts as (typeof reportStatuses)[number][];
      }),
    from: isoDate.optional(),
    to: isoDate.optional(),
    /** A report number or serial, from its start. */
    q: z.string().trim().max(40).default(""),
  })
  .refine((v) => !v.from || !v.to || v.from <= v.to, { path: ["to"], message: "The end date is before the start date." });

export interface MyReportRow {
  id: number;
  reportNumber: string;
  revision: number;
  status: (typeof reportStatuses)[number];
  testedOn: string;
  submittedAt: string;
  initialOutcome: "pass" | "fail" | "incomplete";
  finalOutcome: "pass" | "fail";
  wasRepaired: boolean;
  warningCount: number;
  assemblyId: number;
  kind: string;
  serial: string;
  addressLine1: string;
  city: string;
  siteName: string;
  /** The inspector's reasons, for a returned report. */
  returnReasons: string[];
}

export interface MyReportsPage {
  rows: MyReportRow[];
  total: number;
  page: number;
  pageSize: number;
  pageCount: number;
}

/**
 * The tester's own reports, one page at a time, sorted and filtered on the server. Superseded
 * revisions are left out unless asked for (the newest revision stands for the report).
 */
export async function listMyReports(actor: Actor, query: z.infer<typeof myReportsQuerySchema>): Promise<MyReportsPage> {
  assertCan(actor, "reports.read_own");
  const db = getDb();
  const filters: (SQL | undefined)[] = [eq(testReports.testerId, actor.id)];
  filters.push(query.status ? inArray(testReports.status, query.status) : ne(testReports.status, "superseded"));
  if (query.from) filters.push(gte(testReports.testedOn, query.from));
  if (query.to) filters.push(lte(testReports.testedOn, query.to));
  if (query.q) filters.push(or(like(testReports.reportNumber, prefixPattern(query.q)), like(assemblies.serial, prefixPattern(query.q))));
  const where = and(...filters);
  const direction = query.dir === "asc" ? asc : desc;
  // testedAt (not testedOn) so the (tester_id, tested_at) index serves the default order.
  const sortColumn = { testedOn: testReports.testedAt, submittedAt: testReports.submittedAt, reportNumber: testReports.reportNumber, status: testReports.status, outcome: testReports.finalOutcome }[query.sort];
  const [rows, [counted]] = await Promise.all([
    db
      .select({
        id: testReports.id,
        reportNumber: testReports.reportNumber,
        revision: testReports.revision,
        status: testReports.status,
        testedOn: testReports.testedOn,
        submittedAt: testReports.submittedAt,
        initialOutcome: testReports.initialOutcome,
        finalOutcome: testReports.finalOutcome,
        wasRepaired: testReports.wasRepaired,
        warningCount: testReports.warningCount,
        assemblyId: testReports.assemblyId,
        kind: assemblies.kind,
        serial: assemblies.serial,
        addressLine1: sites.addressLine1,
        city: sites.city,
        siteName: sites.name,
        reasons: reviews.reasons,
        decision: reviews.decision,
      })
      .from(testReports)
      .innerJoin(assemblies, eq(assemblies.id, testReports.assemblyId))
      .innerJoin(sites, eq(sites.id, assemblies.siteId))
      .leftJoin(reviews, eq(reviews.reportId, testReports.id))
      .where(where)
      .orderBy(direction(sortColumn), direction(testReports.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db
      .select({ n: sql<number>`COUNT(*)` })
      .from(testReports)
      .innerJoin(assemblies, eq(assemblies.id, testReports.assemblyId))
      .where(where),
  ]);
  const total = Number(counted?.n ?? 0);
  return {
    rows: rows.map(({ reasons, decision, ...r }) => ({ ...r, submittedAt: r.submittedAt.toISOString(), returnReasons: decision === "returned" ? ((reasons as string[] | null) ?? []) : [] })),
    total,
    page: query.page,
    pageSize: query.pageSize,
    pageCount: Math.max(1, Math.ceil(total / query.pageSize)),
  };
}

export interface ReturnedReport {
  id: number;
  reportNumber: string;
  revision: number;
  testedOn: string;
  addressLine1: string;
  city: string;
  kind: string;
  serial: string;
  reasons: string[];
  note: string | null;
  decidedAt: string;
}

/** Returned reports waiting for the tester's correction, oldest decision first. */
export async function listReturnedReports(actor: Actor): Promise<ReturnedReport[]> {
  assertCan(actor, "reports.read_own");
  const rows = await getDb()
    .select({
      id: testReports.id,
      reportNumber: testReports.reportNumber,
      revision: testReports.revision,
      testedOn: testReports.testedOn,
      addressLine1: sites.addressLine1,
      city: sites.city,
      kind: assemblies.kind,
      serial: assemblies.serial,
      reasons: reviews.reasons,
      note: reviews.note,
      decidedAt: reviews.decidedAt,
    })
    .from(testReports)
    .innerJoin(assemblies, eq(assemblies.id, testReports.assemblyId))
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .leftJoin(reviews, eq(reviews.reportId, testReports.id))
    .where(and(eq(testReports.testerId, actor.id), eq(testReports.status, "returned")))
    .orderBy(asc(reviews.decidedAt))
    .limit(50);
  return rows.map((r) => ({ ...r, reasons: (r.reasons as string[] | null) ?? [], decidedAt: r.decidedAt ? r.decidedAt.toISOString() : "" }));
}

/** Counts of the tester's reports by status (superseded revisions left out). */
export async function countMyReportsByStatus(actor: Actor): Promise<Record<string, number>> {
  assertCan(actor, "reports.read_own");
  const rows = await getDb()
    .select({ status: testReports.status, n: sql<number>`COUNT(*)` })
    .from(testReports)
    .where(and(eq(testReports.testerId, actor.id), inArray(testReports.status, ["awaiting_fee", "queued", "returned"])))
    .groupBy(testReports.status);
  return Object.fromEntries(rows.map((r) => [r.status, Number(r.n)]));
}

export interface ReportHistoryEntry {
  id: number;
  reportNumber: string;
  revision: number;
  status: (typeof reportStatuses)[number];
  submittedAt: string;
  relation: "revision" | "amendment" | "amended";
}

/** Every revision of the report (same number) and the amendments linking to it or from it. */
export async function getMyReportHistory(actor: Actor, reportId: number): Promise<ReportHistoryEntry[]> {
  assertCan(actor, "reports.read_own");
  const db = getDb();
  const [report] = await db
    .select({ id: testReports.id, reportNumber: testReports.reportNumber, amendsId: testReports.amendsId, assemblyId: testReports.assemblyId })
    .from(testReports)
    .where(and(eq(testReports.id, reportId), eq(testReports.testerId, actor.id)))
    .limit(1);
  if (!report) throw new NotFoundError("No such report.");
  const columns = { id: testReports.id, reportNumber: testReports.reportNumber, revision: testReports.revision, status: testReports.status, submittedAt: testReports.submittedAt, amendsId: testReports.amendsId };
  const [revisions, amendments, amended] = await Promise.all([
    db.select(columns).from(testReports).where(and(eq(testReports.reportNumber, report.reportNumber), eq(testReports.testerId, actor.id))).orderBy(asc(testReports.revision)),
    // An amendment is for the same assembly: its index finds it without scanning every report.
    db.select(columns).from(testReports).where(and(eq(testReports.assemblyId, report.assemblyId), eq(testReports.amendsId, report.id), eq(testReports.testerId, actor.id))),
    report.amendsId ? db.select(columns).from(testReports).where(and(eq(testReports.id, report.amendsId), eq(testReports.testerId, actor.id))) : Promise.resolve([]),
  ]);
  const entry = (relation: ReportHistoryEntry["relation"]) => (r: (typeof revisions)[number]): ReportHistoryEntry => ({ id: r.id, reportNumber: r.reportNumber, revision: r.revision, status: r.status, submittedAt: r.submittedAt.toISOString(), relation });
  return [...amended.map(entry("amended")), ...revisions.map(entry("revision")), ...amendments.map(entry("amendment"))];
}
