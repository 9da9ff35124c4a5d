import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { getDb, type Executor } from "@/db/client";
import { feePaymentItems, feePayments, feeRefunds, programs, testReports, users } from "@/db/schema";
import type { FeePaymentStatus } from "@/db/schema/payments";
import { getEnv } from "@/lib/env";
import { AppError, ConflictError, isDuplicateKey } from "@/lib/errors";
import { sendEmailQuietly } from "@/lib/mail/send";
import { getPaymentsClient, paymentServiceError } from "@/lib/payments/client";
import { formatMoney, receiptNumberOf } from "@/lib/payments/money";
import { dateInZone } from "@/lib/payments/periods";
import FeeReceiptEmail, { subjectOfFeeReceipt } from "@/emails/fee-receipt";
import { recordAudit } from "./audit";

/**
 * What the fee pages, the webhook and the admin share: closing an open checkout, asking the
 * payments service for a refund, and the e-mailed receipt. Not for pages to call directly.
 */

export interface AssemblySnapshotLike {
  kind?: string;
  serial?: string;
  address?: string;
  siteName?: string;
}

/** "RP · serial TA123456 · 12 Quarry Lane, Quillmere" from a report's snapshot. */
export function describeAssembly(snapshot: unknown): string {
  const s = (snapshot ?? {}) as AssemblySnapshotLike;
  return [s.kind, s.serial ? `serial ${s.serial}` : null, s.address ?? s.siteName].filter(Boolean).join(" · ");
}

export const reportLabel = (r: { reportNumber: string; revision: number }) => (r.revision > 1 ? `${r.reportNumber} rev. ${r.revision}` : r.reportNumber);

export function affected(result: unknown): number {
  const header = Array.isArray(result) ? (result[0] as { affectedRows?: number }) : (result as { affectedRows?: number });
  return header?.affectedRows ?? 0;
}

/** Releases the reports of a payment that will not be paid, so they can be paid again. */
export async function closePendingPayment(tx: Executor, paymentId: number, status: Extract<FeePaymentStatus, "canceled" | "expired" | "failed">, reason: string, actorId: number | null): Promise<boolean> {
  const now = new Date();
  const moved = await tx
    .update(feePayments)
    .set({ status, closedAt: now, failureReason: reason.slice(0, 300), updatedAt: now })
    .where(and(eq(feePayments.id, paymentId), eq(feePayments.status, "pending")));
  if (affected(moved) !== 1) return false;
  await tx
    .update(feePaymentItems)
    .set({ status: "released", activeReportId: null, updatedAt: now })
    .where(and(eq(feePaymentItems.paymentId, paymentId), eq(feePaymentItems.status, "pending")));
  const [payment] = await tx.select({ programId: feePayments.programId }).from(feePayments).where(eq(feePayments.id, paymentId));
  await recordAudit(tx, { programId: payment?.programId, actorId, action: `fee.checkout_${status}`, entityType: "fee_payment", entityId: paymentId, after: { status, reason } });
  return true;
}

/** A checkout that was just opened may not have its session yet; older ones without one are dead. */
const OPENING_GRACE_MS = 2 * 60_000;

/**
 * Closes an open checkout: here first (its reports are free again at once, and the service's
 * own "expired" event then finds nothing to do), then at the payments service so nobody can
 * still pay it. Returns "completing" when the service says it was paid already: its webhook
 * then settles the payment (taking the reports back if they are still owed, else refunding).
 */
export async function closeOpenCheckout(paymentId: number, status: "canceled" | "expired", reason: string, actorId: number | null): Promise<"closed" | "completing" | "not_open"> {
  const db = getDb();
  const [payment] = await db.select().from(feePayments).where(eq(feePayments.id, paymentId));
  if (!payment || payment.status !== "pending") return "not_open";
  if (!payment.checkoutSessionId && Date.now() - payment.createdAt.getTime() < OPENING_GRACE_MS) {
    throw new ConflictError("A checkout for these reports is being opened right now. Please wait a moment and try again.", "checkout_opening");
  }
  const isClosed = await db.transaction((tx) => closePendingPayment(tx, paymentId, payment.checkoutSessionId ? status : "failed", payment.checkoutSessionId ? reason : "The checkout was never opened.", actorId));
  if (!isClosed) return "not_open";
  if (!payment.checkoutSessionId) return "closed";
  const stripe = getPaymentsClient();
  try {
    await stripe.checkout.sessions.expire(payment.checkoutSessionId);
  } catch (error) {
    // Refused: the session is closed already (paid, or expired by the service). Ask which.
    try {
      const session = await stripe.checkout.sessions.retrieve(payment.checkoutSessionId);
      if (session.status === "complete") return "completing";
    } catch {
      // Unreachable: the service expires unpaid sessions itself; a late payment is settled by its webhook.
      console.error("[payments] could not close checkout", payment.checkoutSessionId, error instanceof Error ? error.message : error);
    }
  }
  return "closed";
}

/**
 * Asks the payments service to refund one item of a paid payment. The refund row is written
 * first (its unique active item allows one live refund per item), the service is called with
 * our own idempotency key, and the fee changes only when the refund's webhook confirms it.
 */
export async function requestItemRefund(itemId: number, reason: string, requestedBy: number | null): Promise<{ refundId: number }> {
  const db = getDb();
  const now = new Date();
  const created = await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ item: feePaymentItems, payment: feePayments })
      .from(feePaymentItems)
      .innerJoin(feePayments, eq(feePayments.id, feePaymentItems.paymentId))
      .where(eq(feePaymentItems.id, itemId))
      .for("update");
    if (!row) throw new AppError("That payment item does not exist.", 404, "not_found");
    if (row.payment.status !== "paid" || !row.payment.paymentIntentId) throw new ConflictError("Only a confirmed payment can be refunded.");
    if (row.item.status !== "paid" && row.item.status !== "unapplied") throw new ConflictError("This fee has already been refunded.");
    try {
      const [inserted] = await tx
        .insert(feeRefunds)
        .values({ paymentId: row.payment.id, itemId, reportId: row.item.reportId, activeItemId: itemId, amountCents: row.item.amountCents, currency: row.item.currency, status: "pending", reason, requestedBy, createdAt: now, updatedAt: now })
        .$returningId();
      await recordAudit(tx, { programId: row.payment.programId, actorId: requestedBy, action: "fee.refund_requested", entityType: "test_report", entityId: row.item.reportId, after: { paymentId: row.payment.id, amountCents: row.item.amountCents, currency: row.item.currency, reason } });
      return { refundId: inserted!.id, paymentIntentId: row.payment.paymentIntentId, amountCents: row.item.amountCents, reportId: row.item.reportId, paymentId: row.payment.id, programId: row.payment.programId };
    } catch (error) {
      if (isDuplicateKey(error)) throw new ConflictError("A refund of this fee is already under way.", "refund_pending");
      throw error;
    }
  });
  try {
    const refund = await getPaymentsClient().refunds.create(
      { payment_intent: created.paymentIntentId, amount: created.amountCents, metadata: { zoneward_refund_id: String(created.refundId), zoneward_report_id: String(created.reportId) } },
      { idempotencyKey: `zoneward-fee-refund-${created.refundId}` },
    );
    await db.update(feeRefunds).set({ providerRefundId: refund.id, updatedAt: new Date() }).where(eq(feeRefunds.id, created.refundId));
  } catch (error) {
    await db.transaction(async (tx) => {
      await tx
        .update(feeRefunds)
        .set({ status: "failed", activeItemId: null, failureReason: error instanceof Error ? error.message.slice(0, 300) : "refused", updatedAt: new Date() })
        .where(and(eq(feeRefunds.id, created.refundId), eq(feeRefunds.status, "pending")));
      await recordAudit(tx, { programId: created.programId, actorId: requestedBy, action: "fee.refund_refused", entityType: "test_report", entityId: created.reportId, after: { refundId: created.refundId } });
    });
    throw paymentServiceError(error, "The refund could not be made");
  }
  return { refundId: created.refundId };
}

/** The receipt e-mail of a confirmed payment, sent once (the mail service keeps the key). */
export async function sendFeeReceipt(paymentId: number): Promise<void> {
  const db = getDb();
  const [row] = await db
    .select({ payment: feePayments, payerName: users.name, payerEmail: users.email, programName: programs.name, prefix: programs.reportPrefix, replyTo: programs.replyToEmail, phone: programs.phone, timezone: programs.timezone })
    .from(feePayments)
    .innerJoin(users, eq(users.id, feePayments.payerId))
    .innerJoin(programs, eq(programs.id, feePayments.programId))
    .where(eq(feePayments.id, paymentId));
  if (!row || row.payment.status !== "paid" || !row.payment.paidAt) return;
  const items = await db
    .select({ reportNumber: testReports.reportNumber, revision: testReports.revision, snapshot: testReports.assemblySnapshot, amountCents: feePaymentItems.amountCents, status: feePaymentItems.status, testerName: users.name })
    .from(feePaymentItems)
    .innerJoin(testReports, eq(testReports.id, feePaymentItems.reportId))
    .innerJoin(users, eq(users.id, testReports.testerId))
    .where(eq(feePaymentItems.paymentId, paymentId))
    .orderBy(asc(testReports.reportNumber));
  const currency = row.payment.currency;
  const appUrl = getEnv().APP_URL.replace(/\/$/, "");
  const receiptNumber = receiptNumberOf(row.prefix, paymentId);
  const id = await sendEmailQuietly({
    to: row.payerEmail,
    subject: subjectOfFeeReceipt({ programName: row.programName, receiptNumber }),
    fromName: row.programName,
    replyTo: row.replyTo,
    idempotencyKey: `fee-receipt-${paymentId}`,
    react: FeeReceiptEmail({
      payerName: row.payerName,
      programName: row.programName,
      programPhone: row.phone || undefined,
      replyTo: row.replyTo,
      receiptNumber,
      paidAt: dateInZone(row.payment.paidAt, row.timezone),
      total: formatMoney(row.payment.amountCents, currency),
      paymentReference: row.payment.paymentIntentId ?? "",
      lines: items.map((i) => ({ report: reportLabel(i), assembly: describeAssembly(i.snapshot), tester: i.testerName, amount: formatMoney(i.amountCents, currency), isApplied: i.status !== "unapplied" })),
      receiptsUrl: `${appUrl}/tester/fees/receipts`,
    }),
  });
  if (id) await db.update(feePayments).set({ receiptSentAt: new Date() }).where(eq(feePayments.id, paymentId));
}

/** Open checkouts that hold any of these reports (for closing before a new checkout or a waiver). */
export async function openPaymentsHolding(reportIds: number[]): Promise<number[]> {
  if (reportIds.length === 0) return [];
  const rows = await getDb()
    .selectDistinct({ paymentId: feePaymentItems.paymentId })
    .from(feePaymentItems)
    .innerJoin(feePayments, eq(feePayments.id, feePaymentItems.paymentId))
    .where(and(inArray(feePaymentItems.activeReportId, reportIds), eq(feePayments.status, "pending")));
  return rows.map((r) => r.paymentId);
}
