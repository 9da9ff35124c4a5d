import "server-only";
import { aliasedTable, and, desc, eq, inArray, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { companies, feePaymentItems, feePayments, feeRefunds, feeWaivers, programs, programSettings, testReports, users } from "@/db/schema";
import type { FeeRefundStatus } from "@/db/schema/payments";
import type { ReportStatus } from "@/db/schema/reports";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { ConflictError, NotFoundError } from "@/lib/errors";
import { isPaymentsStandIn } from "@/lib/payments/client";
import { receiptNumberOf } from "@/lib/payments/money";
import { recordAudit } from "./audit";
import { affected, closeOpenCheckout, describeAssembly, openPaymentsHolding, reportLabel, requestItemRefund } from "./fees-core";

export const feeReasonSchema = z.object({
  reason: z.string({ error: "Give a reason." }).trim().min(5, "Give a reason of at least 5 characters (it goes into the audit log).").max(500, "Keep the reason under 500 characters."),
});

export type FeeView = "owed" | "paid" | "refunded" | "waived";

export interface FeeTotals {
  currency: string;
  owed: { count: number; cents: number };
  paid: { count: number; cents: number };
  refunded: { count: number; cents: number };
  waived: { count: number; cents: number };
  refundsPending: number;
}

export interface AdminFeeRow {
  reportId: number;
  report: string;
  testerName: string;
  companyName: string | null;
  assembly: string;
  amountCents: number;
  currency: string;
  reportStatus: ReportStatus;
  /** When the fee was charged (submitted), paid, refunded or waived, by view. */
  at: string;
  receiptNumber: string | null;
  paidBy: string | null;
  refundStatus: FeeRefundStatus | null;
  note: string | null;
  isInOpenCheckout: boolean;
}

/** The program's fees: totals for each state and the newest rows of one of them. */
export async function getProgramFees(actor: Actor, view: FeeView, limit = 200): Promise<{ totals: FeeTotals; rows: AdminFeeRow[]; programCurrency: string; feeCents: number; isStandIn: boolean; prefix: string; timezone: string }> {
  assertCan(actor, "fees.manage");
  const programId = staffProgramId(actor);
  const db = getDb();
  const [program] = await db
    .select({ prefix: programs.reportPrefix, timezone: programs.timezone, fee: programSettings.filingFeeCents, currency: programSettings.currency })
    .from(programs)
    .innerJoin(programSettings, eq(programSettings.programId, programs.id))
    .where(eq(programs.id, programId));
  const settings = { fee: program?.fee ?? 0, currency: program?.currency ?? "USD" };
  const prefix = program?.prefix ?? "ZW";

  const [owed] = await db
    .select({ count: sql<number>`COUNT(*)`, cents: sql<number>`COALESCE(SUM(${testReports.feeCents}), 0)` })
    .from(testReports)
    .where(and(eq(testReports.programId, programId), eq(testReports.status, "awaiting_fee"), eq(testReports.feeStatus, "owed")));
  const [paid] = await db
    .select({ count: sql<number>`COUNT(*)`, cents: sql<number>`COALESCE(SUM(${feePaymentItems.amountCents}), 0)` })
    .from(feePaymentItems)
    .innerJoin(feePayments, eq(feePayments.id, feePaymentItems.paymentId))
    .where(and(eq(feePayments.programId, programId), eq(feePaymentItems.status, "paid")));
  const [refunded] = await db
    .select({ count: sql<number>`COUNT(*)`, cents: sql<number>`COALESCE(SUM(${feeRefunds.amountCents}), 0)` })
    .from(feeRefunds)
    .innerJoin(feePayments, eq(feePayments.id, feeRefunds.paymentId))
    .where(and(eq(feePayments.programId, programId), eq(feeRefunds.status, "succeeded")));
  const [pendingRefunds] = await db
    .select({ count: sql<number>`COUNT(*)` })
    .from(feeRefunds)
    .innerJoin(feePayments, eq(feePayments.id, feeRefunds.paymentId))
    .where(and(eq(feePayments.programId, programId), eq(feeRefunds.status, "pending")));
  const [waived] = await db
    .select({ count: sql<number>`COUNT(*)`, cents: sql<number>`COALESCE(SUM(${feeWaivers.amountCents}), 0)` })
    .from(feeWaivers)
    .where(eq(feeWaivers.programId, programId));
  const n = (v: unknown) => Number(v ?? 0);
  const totals: FeeTotals = {
    currency: settings.currency,
    owed: { count: n(owed?.count), cents: n(owed?.cents) },
    paid: { count: n(paid?.count), cents: n(paid?.cents) },
    refunded: { count: n(refunded?.count), cents: n(refunded?.cents) },
    waived: { count: n(waived?.count), cents: n(waived?.cents) },
    refundsPending: n(pendingRefunds?.count),
  };

  const payer = aliasedTable(users, "payer");
  const base = {
    reportId: testReports.id,
    reportNumber: testReports.reportNumber,
    revision: testReports.revision,
    testerName: users.name,
    companyName: companies.name,
    snapshot: testReports.assemblySnapshot,
    reportStatus: testReports.status,
  };
  let rows: AdminFeeRow[] = [];
  const toRow = (r: { reportId: number; reportNumber: string; revision: number; testerName: string; companyName: string | null; snapshot: unknown; reportStatus: ReportStatus }, extra: Partial<AdminFeeRow> & Pick<AdminFeeRow, "amountCents" | "currency" | "at">): AdminFeeRow => ({
    reportId: r.reportId,
    report: reportLabel(r),
    testerName: r.testerName,
    companyName: r.companyName,
    assembly: describeAssembly(r.snapshot),
    reportStatus: r.reportStatus,
    receiptNumber: null,
    paidBy: null,
    refundStatus: null,
    note: null,
    isInOpenCheckout: false,
    ...extra,
  });
  if (view === "owed") {
    const list = await db
      .select({ ...base, amountCents: testReports.feeCents, currency: testReports.feeCurrency, at: testReports.submittedAt })
      .from(testReports)
      .innerJoin(users, eq(users.id, testReports.testerId))
      .leftJoin(companies, eq(companies.id, users.companyId))
      .where(and(eq(testReports.programId, programId), eq(testReports.status, "awaiting_fee"), eq(testReports.feeStatus, "owed")))
      .orderBy(testReports.submittedAt)
      .limit(limit);
    const held = new Set<number>();
    const holding = await openPaymentsHolding(list.map((r) => r.reportId));
    if (holding.length) {
      const heldRows = await db.select({ reportId: feePaymentItems.reportId }).from(feePaymentItems).where(and(eq(feePaymentItems.status, "pending"), inArray(feePaymentItems.paymentId, holding)));
      for (const h of heldRows) held.add(h.reportId);
    }
    rows = list.map((r) => toRow(r, { amountCents: r.amountCents, currency: r.currency, at: r.at.toISOString(), isInOpenCheckout: held.has(r.reportId) }));
  } else if (view === "paid") {
    const list = await db
      .select({ ...base, amountCents: feePaymentItems.amountCents, currency: feePaymentItems.currency, at: feePayments.paidAt, paymentId: feePayments.id, paidBy: payer.name, itemId: feePaymentItems.id })
      .from(feePaymentItems)
      .innerJoin(feePayments, eq(feePayments.id, feePaymentItems.paymentId))
      .innerJoin(testReports, eq(testReports.id, feePaymentItems.reportId))
      .innerJoin(users, eq(users.id, testReports.testerId))
      .innerJoin(payer, eq(payer.id, feePayments.payerId))
      .leftJoin(companies, eq(companies.id, users.companyId))
      .where(and(eq(feePayments.programId, programId), eq(feePaymentItems.status, "paid")))
      .orderBy(desc(feePayments.paidAt))
      .limit(limit);
    const pending = list.length
      ? new Set((await db.select({ itemId: feeRefunds.itemId }).from(feeRefunds).where(and(eq(feeRefunds.status, "pending"), inArray(feeRefunds.itemId, list.map((r) => r.itemId))))).map((r) => r.itemId))
      : new Set<number>();
    rows = list.map((r) => toRow(r, { amountCents: r.amountCents, currency: r.currency, at: r.at?.toISOString() ?? "", receiptNumber: receiptNumberOf(prefix, r.paymentId), paidBy: r.paidBy, refundStatus: pending.has(r.itemId) ? "pending" : null }));
  } else if (view === "refunded") {
    const list = await db
      .select({ ...base, amountCents: feeRefunds.amountCents, currency: feeRefunds.currency, at: feeRefunds.createdAt, succeededAt: feeRefunds.succeededAt, paymentId: feeRefunds.paymentId, status: feeRefunds.status, reason: feeRefunds.reason, failure: feeRefunds.failureReason })
      .from(feeRefunds)
      .innerJoin(feePayments, eq(feePayments.id, feeRefunds.paymentId))
      .innerJoin(testReports, eq(testReports.id, feeRefunds.reportId))
      .innerJoin(users, eq(users.id, testReports.testerId))
      .leftJoin(companies, eq(companies.id, users.companyId))
      .where(eq(feePayments.programId, programId))
      .orderBy(desc(feeRefunds.createdAt))
      .limit(limit);
    rows = list.map((r) => toRow(r, { amountCents: r.amountCents, currency: r.currency, at: (r.succeededAt ?? r.at).toISOString(), receiptNumber: receiptNumberOf(prefix, r.paymentId), refundStatus: r.status, note: r.failure ? `${r.reason} (failed: ${r.failure})` : r.reason }));
  } else {
    const list = await db
      .select({ ...base, amountCents: feeWaivers.amountCents, currency: feeWaivers.currency, at: feeWaivers.waivedAt, reason: feeWaivers.reason, waivedBy: payer.name })
      .from(feeWaivers)
      .innerJoin(testReports, eq(testReports.id, feeWaivers.reportId))
      .innerJoin(users, eq(users.id, testReports.testerId))
      .innerJoin(payer, eq(payer.id, feeWaivers.waivedBy))
      .leftJoin(companies, eq(companies.id, users.companyId))
      .where(eq(feeWaivers.programId, programId))
      .orderBy(desc(feeWaivers.waivedAt))
      .limit(limit);
    rows = list.map((r) => toRow(r, { amountCents: r.amountCents, currency: r.currency, at: r.at.toISOString(), note: `${r.reason} (waived by ${r.waivedBy})` }));
  }
  return { totals, rows, programCurrency: settings.currency, feeCents: Number(settings.fee), isStandIn: isPaymentsStandIn(), prefix, timezone: program?.timezone ?? "UTC" };
}

/** Testing companies with testers who have filed in the admin's program (for statements). */
export async function listProgramCompanies(actor: Actor): Promise<{ id: number; name: string }[]> {
  assertCan(actor, "fees.manage");
  const programId = staffProgramId(actor);
  return getDb()
    .selectDistinct({ id: companies.id, name: companies.name })
    .from(companies)
    .innerJoin(users, eq(users.companyId, companies.id))
    .innerJoin(testReports, and(eq(testReports.testerId, users.id), eq(testReports.programId, programId)))
    .orderBy(companies.name);
}

async function programReportOrThrow(actor: Actor, reportId: number) {
  const programId = staffProgramId(actor);
  const [report] = await getDb()
    .select({ id: testReports.id, programId: testReports.programId, reportNumber: testReports.reportNumber, revision: testReports.revision, feeStatus: testReports.feeStatus, feeCents: testReports.feeCents, currency: testReports.feeCurrency, status: testReports.status })
    .from(testReports)
    .where(and(eq(testReports.id, reportId), eq(testReports.programId, programId)));
  if (!report) throw new NotFoundError("That report was not found in your program.");
  return report;
}

/**
 * Waives an owed fee with a reason: the report goes to the review queue as if paid. An open
 * checkout holding it is closed at the payments service first; if it was paid meanwhile the
 * waiver is refused (refund the payment instead).
 */
export async function waiveReportFee(actor: Actor, reportId: number, reason: string): Promise<{ feeStatus: "waived"; status: ReportStatus }> {
  assertCan(actor, "fees.manage");
  const report = await programReportOrThrow(actor, reportId);
  if (report.feeStatus !== "owed") throw new ConflictError(`The fee of report ${reportLabel(report)} is ${report.feeStatus === "none" ? "not charged" : report.feeStatus}; only an owed fee can be waived.`, "fee_not_owed");
  for (const openId of await openPaymentsHolding([reportId])) {
    const result = await closeOpenCheckout(openId, "canceled", "The fee was waived.", actor.id);
    if (result === "completing") throw new ConflictError("This fee has just been paid and the payment is being confirmed. Refund it once it shows as paid instead.", "payment_completing");
  }
  const now = new Date();
  return getDb().transaction(async (tx) => {
    const [locked] = await tx.select({ feeStatus: testReports.feeStatus, status: testReports.status, feeCents: testReports.feeCents, currency: testReports.feeCurrency }).from(testReports).where(eq(testReports.id, reportId)).for("update");
    if (!locked || locked.feeStatus !== "owed") throw new ConflictError("The fee changed a moment ago; reload the page.", "fee_changed");
    const status: ReportStatus = locked.status === "awaiting_fee" ? "queued" : locked.status;
    const moved = await tx.update(testReports).set({ feeStatus: "waived", status, updatedAt: now }).where(and(eq(testReports.id, reportId), eq(testReports.feeStatus, "owed")));
    if (affected(moved) !== 1) throw new ConflictError("The fee changed a moment ago; reload the page.", "fee_changed");
    await tx.insert(feeWaivers).values({ programId: report.programId, reportId, amountCents: locked.feeCents, currency: locked.currency, reason, waivedBy: actor.id, waivedAt: now });
    await recordAudit(tx, { programId: report.programId, actorId: actor.id, action: "report.fee_waived", entityType: "test_report", entityId: reportId, before: { status: locked.status, feeStatus: "owed" }, after: { status, feeStatus: "waived", amountCents: locked.feeCents, currency: locked.currency, reason } });
    return { feeStatus: "waived" as const, status };
  });
}

/**
 * Refunds a paid fee through the payments service. The fee shows as refunded once the refund's
 * webhook arrives; the report keeps its place in review or its decision either way.
 */
export async function refundReportFee(actor: Actor, reportId: number, reason: string): Promise<{ refundId: number; status: "pending" }> {
  assertCan(actor, "fees.manage");
  const report = await programReportOrThrow(actor, reportId);
  if (report.feeStatus !== "paid") throw new ConflictError(`The fee of report ${reportLabel(report)} is ${report.feeStatus === "none" ? "not charged" : report.feeStatus}; only a paid fee can be refunded.`, "fee_not_paid");
  const [item] = await getDb()
    .select({ id: feePaymentItems.id })
    .from(feePaymentItems)
    .innerJoin(feePayments, eq(feePayments.id, feePaymentItems.paymentId))
    .where(and(eq(feePaymentItems.reportId, reportId), eq(feePaymentItems.status, "paid"), eq(feePayments.programId, report.programId)));
  if (!item) throw new ConflictError("No online payment of this fee was found to refund.", "fee_not_paid");
  const { refundId } = await requestItemRefund(item.id, reason, actor.id);
  return { refundId, status: "pending" };
}
