import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { feePaymentItems, feePayments, feeRefunds, paymentWebhookEvents, testReports } from "@/db/schema";
import type { Stripe } from "@/lib/payments/client";
import { isDuplicateKey } from "@/lib/errors";
import { recordAudit } from "./audit";
import { affected, closePendingPayment, requestItemRefund, sendFeeReceipt } from "./fees-core";

export interface WebhookOutcome {
  outcome: string;
  isDuplicate: boolean;
}

interface Applied {
  outcome: string;
  detail?: Record<string, unknown>;
  /** Work that must not run inside the transaction: mail, calls to the payments service. */
  receiptFor?: number;
  refundItems?: number[];
}

const isDuplicateEvent = (error: unknown): boolean => {
  for (let current: unknown = error, depth = 0; current && depth < 5; depth++) {
    const { code, message } = current as { code?: string; message?: string };
    if (code === "ER_DUP_ENTRY" && String(message).includes("payment_webhook_events_event_uq")) return true;
    current = (current as { cause?: unknown }).cause;
  }
  return false;
};

/**
 * Applies one verified webhook event exactly once. The event's id goes into a unique index in
 * the same transaction as its effect: a replay, or two deliveries of the same event at the same
 * moment, commit at most one effect (the second insert waits for the first, then collides).
 * Payment is confirmed only here, never by the payer's return to the site.
 */
export async function handlePaymentWebhook(event: Stripe.Event): Promise<WebhookOutcome> {
  const object = event.data.object as { id?: unknown };
  const objectId = typeof object.id === "string" ? object.id : "";
  let applied: Applied;
  try {
    applied = await getDb().transaction(async (tx) => {
      await tx.insert(paymentWebhookEvents).values({ eventId: event.id, type: event.type, objectId, outcome: "received", receivedAt: new Date() });
      const result = await applyEvent(tx, event);
      await tx
        .update(paymentWebhookEvents)
        .set({ outcome: result.outcome, detail: result.detail ?? null })
        .where(eq(paymentWebhookEvents.eventId, event.id));
      return result;
    });
  } catch (error) {
    if (isDuplicateEvent(error)) return { outcome: "duplicate", isDuplicate: true };
    throw error;
  }
  if (applied.receiptFor) await sendFeeReceipt(applied.receiptFor);
  for (const itemId of applied.refundItems ?? []) {
    // Money received for a fee that was settled meanwhile goes back automatically.
    await requestItemRefund(itemId, "Automatic refund: this fee was already settled when the payment arrived.", null).catch((error: unknown) => {
      console.error("[payments] automatic refund failed for item", itemId, error instanceof Error ? error.message : error);
    });
  }
  return { outcome: applied.outcome, isDuplicate: false };
}

async function applyEvent(tx: Transaction, event: Stripe.Event): Promise<Applied> {
  switch (event.type) {
    case "checkout.session.completed":
    case "checkout.session.async_payment_succeeded":
      return applySessionPaid(tx, event.data.object);
    case "checkout.session.expired":
      return applySessionClosed(tx, event.data.object, "expired");
    case "checkout.session.async_payment_failed":
      return applySessionClosed(tx, event.data.object, "failed");
    case "refund.created":
    case "refund.updated":
    case "refund.failed":
      return applyRefund(tx, event.data.object);
    default:
      // Acknowledged and recorded, so the service stops retrying; nothing here depends on it.
      return { outcome: "ignored" };
  }
}

/**
 * The payment a session belongs to: by the session id stored when the checkout opened, or, if
 * storing it failed after the service created the session, by the payment id we put in its
 * metadata (only while that payment has no other session).
 */
async function lockPaymentForSession(tx: Transaction, session: Stripe.Checkout.Session) {
  const [bySession] = await tx.select().from(feePayments).where(eq(feePayments.checkoutSessionId, session.id)).for("update");
  if (bySession) return bySession;
  const paymentId = Number(session.metadata?.zoneward_payment_id ?? NaN);
  if (!Number.isSafeInteger(paymentId)) return undefined;
  const [byMetadata] = await tx.select().from(feePayments).where(eq(feePayments.id, paymentId)).for("update");
  if (!byMetadata || byMetadata.checkoutSessionId !== null) return undefined;
  await tx.update(feePayments).set({ checkoutSessionId: session.id, updatedAt: new Date() }).where(eq(feePayments.id, paymentId));
  return { ...byMetadata, checkoutSessionId: session.id };
}

async function applySessionPaid(tx: Transaction, session: Stripe.Checkout.Session): Promise<Applied> {
  const payment = await lockPaymentForSession(tx, session);
  if (!payment) return { outcome: "unknown_session" };
  if (session.payment_status !== "paid") return { outcome: "awaiting_payment" };
  if (payment.status === "paid") return { outcome: "already_paid" };
  const detail = { paymentId: payment.id, amountTotal: session.amount_total, currency: session.currency };
  if (session.amount_total !== payment.amountCents || (session.currency ?? "").toUpperCase() !== payment.currency) {
    // Never apply money that does not match what was asked for; the admin sees the audit entry.
    await recordAudit(tx, { programId: payment.programId, action: "fee.payment_mismatch", entityType: "fee_payment", entityId: payment.id, before: { amountCents: payment.amountCents, currency: payment.currency }, after: { amountCents: session.amount_total, currency: session.currency } });
    return { outcome: "amount_mismatch", detail };
  }
  const now = new Date();
  const paymentIntentId = typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null);
  const wasClosed = payment.status !== "pending";
  await tx.update(feePayments).set({ status: "paid", paymentIntentId, paidAt: now, closedAt: now, failureReason: null, updatedAt: now }).where(eq(feePayments.id, payment.id));

  const items = await tx.select().from(feePaymentItems).where(eq(feePaymentItems.paymentId, payment.id)).for("update");
  const reports = items.length
    ? await tx
        .select({ id: testReports.id, status: testReports.status, feeStatus: testReports.feeStatus, feeCents: testReports.feeCents, feeCurrency: testReports.feeCurrency, programId: testReports.programId })
        .from(testReports)
        .where(inArray(testReports.id, items.map((i) => i.reportId)))
        .for("update")
    : [];
  const reportById = new Map(reports.map((r) => [r.id, r]));
  const applied: number[] = [];
  const unapplied: number[] = [];
  for (const item of items) {
    const report = reportById.get(item.reportId);
    let isActive = item.status === "pending";
    if (!isActive && item.status === "released") {
      // Paid after the checkout was closed here: take the report back if no other payment holds it.
      try {
        isActive = affected(await tx.update(feePaymentItems).set({ activeReportId: item.reportId, status: "pending", updatedAt: now }).where(and(eq(feePaymentItems.id, item.id), eq(feePaymentItems.status, "released")))) === 1;
      } catch (error) {
        // Another payment holds the report now (its unique index said so); anything else is real.
        if (!isDuplicateKey(error)) throw error;
        isActive = false;
      }
    }
    // The report must still owe exactly this amount in this program: never the wrong report, never twice.
    const matches = report && report.feeStatus === "owed" && report.programId === payment.programId && report.feeCents === item.amountCents && report.feeCurrency === item.currency;
    if (isActive && matches) {
      const moved = await tx
        .update(testReports)
        .set({ feeStatus: "paid", status: report.status === "awaiting_fee" ? "queued" : report.status, updatedAt: now })
        .where(and(eq(testReports.id, item.reportId), eq(testReports.feeStatus, "owed")));
      if (affected(moved) === 1) {
        await tx.update(feePaymentItems).set({ status: "paid", updatedAt: now }).where(eq(feePaymentItems.id, item.id));
        await recordAudit(tx, { programId: payment.programId, action: "report.fee_paid", entityType: "test_report", entityId: item.reportId, before: { status: report.status, feeStatus: "owed" }, after: { status: report.status === "awaiting_fee" ? "queued" : report.status, feeStatus: "paid", paymentId: payment.id, amountCents: item.amountCents } });
        applied.push(item.reportId);
        continue;
      }
    }
    await tx.update(feePaymentItems).set({ status: "unapplied", activeReportId: null, updatedAt: now }).where(eq(feePaymentItems.id, item.id));
    unapplied.push(item.id);
  }
  await recordAudit(tx, { programId: payment.programId, action: "fee.payment_confirmed", entityType: "fee_payment", entityId: payment.id, before: { status: payment.status }, after: { status: "paid", amountCents: payment.amountCents, currency: payment.currency, paymentIntentId, reportsPaid: applied, itemsUnapplied: unapplied, wasClosed } });
  return { outcome: unapplied.length ? "paid_partly_unapplied" : "paid", detail: { ...detail, applied, unapplied }, receiptFor: payment.id, refundItems: unapplied };
}

async function applySessionClosed(tx: Transaction, session: Stripe.Checkout.Session, status: "expired" | "failed"): Promise<Applied> {
  const payment = await lockPaymentForSession(tx, session);
  if (!payment) return { outcome: "unknown_session" };
  const isClosed = await closePendingPayment(tx, payment.id, status, status === "expired" ? "The checkout expired unpaid." : "The payment failed.", null);
  return { outcome: isClosed ? status : "no_change", detail: { paymentId: payment.id } };
}

async function applyRefund(tx: Transaction, refund: Stripe.Refund): Promise<Applied> {
  const byMetadata = Number(refund.metadata?.zoneward_refund_id ?? NaN);
  const [row] = await tx
    .select()
    .from(feeRefunds)
    .where(Number.isSafeInteger(byMetadata) ? eq(feeRefunds.id, byMetadata) : eq(feeRefunds.providerRefundId, refund.id))
    .for("update");
  if (!row || (row.providerRefundId && row.providerRefundId !== refund.id)) return { outcome: "unknown_refund" };
  const now = new Date();
  const [payment] = await tx.select({ programId: feePayments.programId }).from(feePayments).where(eq(feePayments.id, row.paymentId));
  if (refund.status === "succeeded") {
    if (row.status === "succeeded") return { outcome: "already_refunded" };
    if (refund.amount !== row.amountCents) {
      await recordAudit(tx, { programId: payment?.programId, action: "fee.refund_mismatch", entityType: "fee_refund", entityId: row.id, before: { amountCents: row.amountCents }, after: { amountCents: refund.amount } });
      return { outcome: "amount_mismatch", detail: { refundId: row.id } };
    }
    await tx.update(feeRefunds).set({ status: "succeeded", providerRefundId: refund.id, succeededAt: now, updatedAt: now }).where(eq(feeRefunds.id, row.id));
    const [item] = await tx.select({ status: feePaymentItems.status }).from(feePaymentItems).where(eq(feePaymentItems.id, row.itemId)).for("update");
    await tx.update(feePaymentItems).set({ status: "refunded", updatedAt: now }).where(eq(feePaymentItems.id, row.itemId));
    const [current] = await tx.select({ refundedCents: feePayments.refundedCents }).from(feePayments).where(eq(feePayments.id, row.paymentId)).for("update");
    await tx.update(feePayments).set({ refundedCents: (current?.refundedCents ?? 0) + row.amountCents, updatedAt: now }).where(eq(feePayments.id, row.paymentId));
    // Only a fee this payment settled becomes "refunded"; the report keeps its place in review.
    if (item?.status === "paid") {
      await tx.update(testReports).set({ feeStatus: "refunded", updatedAt: now }).where(and(eq(testReports.id, row.reportId), eq(testReports.feeStatus, "paid")));
    }
    await recordAudit(tx, { programId: payment?.programId, action: "report.fee_refunded", entityType: "test_report", entityId: row.reportId, before: { feeStatus: item?.status === "paid" ? "paid" : "unapplied" }, after: { feeStatus: "refunded", refundId: row.id, amountCents: row.amountCents, providerRefundId: refund.id } });
    return { outcome: "refunded", detail: { refundId: row.id } };
  }
  if (refund.status === "failed" || refund.status === "canceled") {
    if (row.status !== "pending") return { outcome: "no_change" };
    await tx
      .update(feeRefunds)
      .set({ status: "failed", activeItemId: null, providerRefundId: refund.id, failureReason: String(refund.failure_reason ?? refund.status).slice(0, 300), updatedAt: now })
      .where(eq(feeRefunds.id, row.id));
    await recordAudit(tx, { programId: payment?.programId, action: "fee.refund_failed", entityType: "test_report", entityId: row.reportId, after: { refundId: row.id, reason: refund.failure_reason ?? refund.status } });
    return { outcome: "refund_failed", detail: { refundId: row.id } };
  }
  if (!row.providerRefundId) await tx.update(feeRefunds).set({ providerRefundId: refund.id, updatedAt: now }).where(eq(feeRefunds.id, row.id));
  return { outcome: "refund_pending" };
}
