import "server-only";
import { aliasedTable, and, asc, eq, gte, inArray, lt, ne, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { companies, feePaymentItems, feePayments, feeRefunds, feeWaivers, programs, programSettings, testReports, users } from "@/db/schema";
import { can, type Actor } from "@/lib/auth/permissions";
import { InputError, NotFoundError } from "@/lib/errors";
import { receiptNumberOf } from "@/lib/payments/money";
import { dateInZone, monthLabel, monthPeriod } from "@/lib/payments/periods";
import { isCompanyBillingManager } from "./fees";
import { describeAssembly, reportLabel } from "./fees-core";
import type { CompanyStatement, StatementLine, StatementSection } from "@/lib/pdf/statement-document";

export type { CompanyStatement, StatementLine, StatementSection };

const MAX_LINES = 2000;

/**
 * A testing company's statement for one calendar month (each program's month in its own time
 * zone): fees charged on its testers' reports, payments, refunds, waivers, and what is owed now.
 * The company's billing manager sees every program; a program admin sees their program only.
 */
export async function getCompanyStatement(actor: Actor, companyId: number, month: string): Promise<CompanyStatement> {
  const isManager = isCompanyBillingManager(actor) && can(actor, "fees.pay_company") && actor.companyId === companyId;
  const isAdmin = can(actor, "fees.manage") && actor.programId !== null;
  if (!isManager && !isAdmin) throw new NotFoundError("That statement was not found.");
  if (!monthPeriod(month, "UTC")) throw new InputError("Choose a month as YYYY-MM.", { month: ["Choose a month as YYYY-MM."] });
  const db = getDb();
  const [company] = await db.select().from(companies).where(eq(companies.id, companyId));
  if (!company) throw new NotFoundError("That statement was not found.");

  const members = await db.select({ id: users.id }).from(users).where(eq(users.companyId, companyId));
  const memberIds = members.map((m) => m.id);
  const programFilter = isManager ? undefined : eq(testReports.programId, actor.programId!);
  const programRows = memberIds.length
    ? await db
        .selectDistinct({ id: programs.id, name: programs.name, timezone: programs.timezone, address: programs.mailingAddress, phone: programs.phone, prefix: programs.reportPrefix })
        .from(testReports)
        .innerJoin(programs, eq(programs.id, testReports.programId))
        .where(and(inArray(testReports.testerId, memberIds), ne(testReports.feeStatus, "none"), programFilter))
        .orderBy(programs.name)
    : [];
  const payer = aliasedTable(users, "payer");
  const sections: StatementSection[] = [];
  for (const program of programRows) {
    const period = monthPeriod(month, program.timezone)!;
    const inProgram = and(eq(testReports.programId, program.id), inArray(testReports.testerId, memberIds));
    const charged = await db
      .select({ id: testReports.id, reportNumber: testReports.reportNumber, revision: testReports.revision, snapshot: testReports.assemblySnapshot, submittedAt: testReports.submittedAt, feeCents: testReports.feeCents, currency: testReports.feeCurrency, feeStatus: testReports.feeStatus, tester: users.name })
      .from(testReports)
      .innerJoin(users, eq(users.id, testReports.testerId))
      .where(and(inProgram, ne(testReports.feeStatus, "none"), gte(testReports.submittedAt, period.startsAt), lt(testReports.submittedAt, period.endsBefore)))
      .orderBy(asc(testReports.submittedAt))
      .limit(MAX_LINES);
    const payments = await db
      .select({ id: feePayments.id, paidAt: feePayments.paidAt, amountCents: feePayments.amountCents, refundedCents: feePayments.refundedCents, currency: feePayments.currency, payerName: payer.name })
      .from(feePayments)
      .innerJoin(payer, eq(payer.id, feePayments.payerId))
      .where(and(eq(feePayments.programId, program.id), eq(feePayments.status, "paid"), or(eq(feePayments.companyId, companyId), inArray(feePayments.payerId, memberIds)), gte(feePayments.paidAt, period.startsAt), lt(feePayments.paidAt, period.endsBefore)))
      .orderBy(asc(feePayments.paidAt))
      .limit(MAX_LINES);
    const itemCounts = new Map<number, number>();
    if (payments.length) {
      for (const i of await db.select({ paymentId: feePaymentItems.paymentId }).from(feePaymentItems).where(inArray(feePaymentItems.paymentId, payments.map((p) => p.id)))) itemCounts.set(i.paymentId, (itemCounts.get(i.paymentId) ?? 0) + 1);
    }
    const refunds = await db
      .select({ id: feeRefunds.id, paymentId: feeRefunds.paymentId, succeededAt: feeRefunds.succeededAt, amountCents: feeRefunds.amountCents, reason: feeRefunds.reason, reportNumber: testReports.reportNumber, revision: testReports.revision, tester: users.name })
      .from(feeRefunds)
      .innerJoin(testReports, eq(testReports.id, feeRefunds.reportId))
      .innerJoin(users, eq(users.id, testReports.testerId))
      .where(and(inProgram, eq(feeRefunds.status, "succeeded"), gte(feeRefunds.succeededAt, period.startsAt), lt(feeRefunds.succeededAt, period.endsBefore)))
      .orderBy(asc(feeRefunds.succeededAt))
      .limit(MAX_LINES);
    const waivers = await db
      .select({ waivedAt: feeWaivers.waivedAt, amountCents: feeWaivers.amountCents, reason: feeWaivers.reason, reportNumber: testReports.reportNumber, revision: testReports.revision, tester: users.name })
      .from(feeWaivers)
      .innerJoin(testReports, eq(testReports.id, feeWaivers.reportId))
      .innerJoin(users, eq(users.id, testReports.testerId))
      .where(and(inProgram, gte(feeWaivers.waivedAt, period.startsAt), lt(feeWaivers.waivedAt, period.endsBefore)))
      .orderBy(asc(feeWaivers.waivedAt))
      .limit(MAX_LINES);
    const outstanding = await db
      .select({ reportNumber: testReports.reportNumber, revision: testReports.revision, snapshot: testReports.assemblySnapshot, submittedAt: testReports.submittedAt, feeCents: testReports.feeCents, tester: users.name })
      .from(testReports)
      .innerJoin(users, eq(users.id, testReports.testerId))
      .where(and(inProgram, eq(testReports.feeStatus, "owed")))
      .orderBy(asc(testReports.submittedAt))
      .limit(MAX_LINES);
    const day = (d: Date | null) => (d ? dateInZone(d, program.timezone) : "");
    const feeWords: Record<string, string> = { owed: "owed", paid: "paid", waived: "waived", refunded: "refunded" };
    const section: StatementSection = {
      programId: program.id,
      programName: program.name,
      programAddress: program.address,
      programPhone: program.phone,
      currency: charged[0]?.currency ?? (await currencyOf(program.id)),
      charged: charged.map((r) => ({ date: day(r.submittedAt), reference: reportLabel(r), description: describeAssembly(r.snapshot), who: r.tester, amountCents: r.feeCents, note: feeWords[r.feeStatus] })),
      payments: payments.map((p) => ({ date: day(p.paidAt), reference: receiptNumberOf(program.prefix, p.id), description: `${itemCounts.get(p.id) ?? 0} ${itemCounts.get(p.id) === 1 ? "report" : "reports"}`, who: p.payerName, amountCents: p.amountCents, note: p.refundedCents ? `partly refunded` : undefined })),
      refunds: refunds.map((r) => ({ date: day(r.succeededAt), reference: reportLabel(r), description: r.reason, who: r.tester, amountCents: r.amountCents, note: receiptNumberOf(program.prefix, r.paymentId) })),
      waivers: waivers.map((w) => ({ date: day(w.waivedAt), reference: reportLabel(w), description: w.reason, who: w.tester, amountCents: w.amountCents })),
      outstanding: outstanding.map((r) => ({ date: day(r.submittedAt), reference: reportLabel(r), description: describeAssembly(r.snapshot), who: r.tester, amountCents: r.feeCents })),
      totals: { charged: 0, paid: 0, refunded: 0, waived: 0, outstanding: 0 },
    };
    const sum = (lines: StatementLine[]) => lines.reduce((total, l) => total + l.amountCents, 0);
    section.totals = { charged: sum(section.charged), paid: sum(section.payments), refunded: sum(section.refunds), waived: sum(section.waivers), outstanding: sum(section.outstanding) };
    sections.push(section);
  }
  return {
    company: { id: company.id, name: company.name, address: company.address, email: company.email, phone: company.phone },
    month,
    monthLabel: monthLabel(month),
    generatedOn: dateInZone(new Date(), programRows[0]?.timezone ?? "UTC"),
    sections,
    isProgramView: !isManager,
  };
}

async function currencyOf(programId: number): Promise<string> {
  const [row] = await getDb().select({ currency: programSettings.currency }).from(programSettings).where(eq(programSettings.programId, programId));
  return row?.currency ?? "USD";
}
