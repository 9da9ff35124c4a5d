// Rows for the filing-fee tests: testers in a company, and reports filed while a fee was due
// ("awaiting_fee", fee "owed", the fee captured on the report), each on a fresh site and
// assembly so no demo record changes. Written straight to the database, as submission would.
import { randomBytes } from "node:crypto";
import { and, eq, ne } from "drizzle-orm";
import { assemblies, companies, programs, sites, testReports, users } from "@/db/schema";
import { testDb } from "./db";
import { unique } from "./http";

export async function userIdOf(email: string): Promise<number> {
  const [user] = await testDb().select({ id: users.id }).from(users).where(eq(users.email, email)).limit(1);
  if (!user) throw new Error(`No user ${email}`);
  return user.id;
}

/** A tester account (no password: tests sign in with a session cookie). */
export async function createTester(options: { companyId?: number | null; isBillingManager?: boolean; name?: string } = {}): Promise<{ id: number; email: string; name: string }> {
  const tag = unique("fee");
  const email = `${tag}@fee-tests.example`;
  const name = options.name ?? `Tester ${tag}`;
  const now = new Date();
  const [row] = await testDb()
    .insert(users)
    .values({ email, name, role: "tester", status: "active", companyId: options.companyId ?? null, isBillingManager: options.isBillingManager ?? false, createdAt: now, updatedAt: now })
    .$returningId();
  return { id: row!.id, email, name };
}

export interface OwedReport {
  id: number;
  reportNumber: string;
  assemblyId: number;
  programId: number;
  feeCents: number;
}

/** A report awaiting its fee, copied from one of the program's seeded reports. */
export async function createOwedReport(options: { testerId: number; programId?: number; feeCents?: number; currency?: string; feeStatus?: "owed" | "paid" | "waived" | "none"; status?: "awaiting_fee" | "queued" }): Promise<OwedReport> {
  const db = testDb();
  const programId = options.programId ?? 1;
  const feeCents = options.feeCents ?? 1500;
  const [program] = await db.select({ prefix: programs.reportPrefix }).from(programs).where(eq(programs.id, programId));
  const [template] = await db.select().from(testReports).where(and(eq(testReports.programId, programId), ne(testReports.status, "superseded"))).limit(1);
  const [templateAssembly] = template ? await db.select().from(assemblies).where(eq(assemblies.id, template.assemblyId)) : [];
  const [templateSite] = templateAssembly ? await db.select().from(sites).where(eq(sites.id, templateAssembly.siteId)) : [];
  if (!program || !template || !templateAssembly || !templateSite) throw new Error(`Program ${programId} has no seeded report to copy`);
  const tag = randomBytes(5).toString("hex").toUpperCase();
  const now = new Date();
  const { id: _siteId, ...siteRow } = templateSite;
  const [site] = await db
    .insert(sites)
    .values({ ...siteRow, accountNumber: `FEE-${tag}`, name: `Fee test site ${tag}`, addressLine1: `${parseInt(tag.slice(0, 3), 16) % 900} Ledger Row`, createdAt: now, updatedAt: now })
    .$returningId();
  const { id: _assemblyId, ...assemblyRow } = templateAssembly;
  const serial = `FT${tag}`;
  const [assembly] = await db
    .insert(assemblies)
    .values({ ...assemblyRow, siteId: site!.id, serial, noticeStage: null, noticeCycle: null, mergedIntoId: null, replacedById: null, createdAt: now, updatedAt: now })
    .$returningId();
  const { id: _reportId, ...reportRow } = template;
  const reportNumber = `${program.prefix}-F${tag}`;
  const [tester] = await db.select({ name: users.name, companyId: users.companyId }).from(users).where(eq(users.id, options.testerId));
  const [company] = tester?.companyId ? await db.select({ name: companies.name }).from(companies).where(eq(companies.id, tester.companyId)) : [];
  const testerSnapshot = { ...(template.testerSnapshot as Record<string, unknown>), name: tester?.name ?? "", company: company?.name ?? null };
  const snapshot = { ...(template.assemblySnapshot as Record<string, unknown>), serial, siteName: `Fee test site ${tag}`, address: `${parseInt(tag.slice(0, 3), 16) % 900} Ledger Row, Quillmere` };
  const [report] = await db
    .insert(testReports)
    .values({
      ...reportRow,
      reportNumber,
      revision: 1,
      supersedesId: null,
      amendsId: null,
      assemblyId: assembly!.id,
      testerId: options.testerId,
      status: options.status ?? "awaiting_fee",
      assemblySnapshot: snapshot,
      testerSnapshot,
      attestedName: tester?.name ?? "",
      submittedAt: now,
      attestedAt: now,
      idempotencyKey: `fee-test-${tag}`,
      verificationCode: `FEE${tag}${randomBytes(4).toString("hex")}`,
      feeCents,
      feeCurrency: options.currency ?? "USD",
      feeStatus: options.feeStatus ?? "owed",
      decidedAt: null,
      decidedBy: null,
      createdAt: now,
      updatedAt: now,
    })
    .$returningId();
  return { id: report!.id, reportNumber, assemblyId: assembly!.id, programId, feeCents };
}

export async function reportFeeState(reportId: number): Promise<{ status: string; feeStatus: string; submittedAt: Date; feeCents: number }> {
  const [row] = await testDb().select({ status: testReports.status, feeStatus: testReports.feeStatus, submittedAt: testReports.submittedAt, feeCents: testReports.feeCents }).from(testReports).where(eq(testReports.id, reportId));
  if (!row) throw new Error(`No report ${reportId}`);
  return row;
}
