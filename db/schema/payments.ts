import { char, datetime, index, int, json, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { programs } from "./programs";
import { testReports } from "./reports";
import { companies, users } from "./users";

export const feePaymentStatuses = ["pending", "paid", "canceled", "expired", "failed"] as const;
export type FeePaymentStatus = (typeof feePaymentStatuses)[number];
export const feePaymentItemStatuses = ["pending", "paid", "released", "refunded", "unapplied"] as const;
export type FeePaymentItemStatus = (typeof feePaymentItemStatuses)[number];
export const feeRefundStatuses = ["pending", "succeeded", "failed"] as const;
export type FeeRefundStatus = (typeof feeRefundStatuses)[number];

/**
 * One checkout: the filing fees of one program's reports, in that program's currency, paid in
 * one go. The amount is the sum of the reports' captured fees, computed on the server; the
 * payment counts as paid only when the payments service's signed webhook says so.
 */
export const feePayments = mysqlTable(
  "fee_payments",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    /** The tester who started the checkout. */
    payerId: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    /** Set when a billing manager paid on the company's account (their company at the time). */
    companyId: int({ unsigned: true }).references(() => companies.id),
    status: mysqlEnum(feePaymentStatuses).notNull().default("pending"),
    /** Integer minor units (cents); never a float. */
    amountCents: int({ unsigned: true }).notNull(),
    currency: char({ length: 3 }).notNull(),
    refundedCents: int({ unsigned: true }).notNull().default(0),
    /** The payments service's Checkout Session, set once it is created. */
    checkoutSessionId: varchar({ length: 255 }),
    checkoutUrl: varchar({ length: 2048 }),
    paymentIntentId: varchar({ length: 255 }),
    paidAt: datetime({ fsp: 3 }),
    closedAt: datetime({ fsp: 3 }),
    /** Why a checkout could not be opened or was closed without payment. */
    failureReason: varchar({ length: 300 }),
    receiptSentAt: datetime({ fsp: 3 }),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [
    uniqueIndex("fee_payments_session_uq").on(t.checkoutSessionId),
    index("fee_payments_payer_idx").on(t.payerId, t.createdAt),
    index("fee_payments_company_idx").on(t.companyId, t.paidAt),
    index("fee_payments_program_idx").on(t.programId, t.status, t.paidAt),
    index("fee_payments_intent_idx").on(t.paymentIntentId),
  ],
);

/**
 * One report's fee inside a payment. `activeReportId` equals `reportId` while the item is
 * pending or paid and is NULL otherwise: its unique index means a report is in at most one open
 * or paid payment at any time, so no report can be paid twice (MariaDB has no partial indexes;
 * NULLs do not collide in a unique index).
 */
export const feePaymentItems = mysqlTable(
  "fee_payment_items",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    paymentId: int({ unsigned: true })
      .notNull()
      .references(() => feePayments.id),
    reportId: int({ unsigned: true })
      .notNull()
      .references(() => testReports.id),
    activeReportId: int({ unsigned: true }),
    amountCents: int({ unsigned: true }).notNull(),
    currency: char({ length: 3 }).notNull(),
    status: mysqlEnum(feePaymentItemStatuses).notNull().default("pending"),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("fee_payment_items_payment_report_uq").on(t.paymentId, t.reportId), uniqueIndex("fee_payment_items_active_report_uq").on(t.activeReportId), index("fee_payment_items_report_idx").on(t.reportId)],
);

/**
 * A refund of one report's paid fee, asked for through the payments service and recorded as
 * done only on its webhook. `activeItemId` (unique, NULL once failed) allows one live refund per
 * paid item.
 */
export const feeRefunds = mysqlTable(
  "fee_refunds",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    paymentId: int({ unsigned: true })
      .notNull()
      .references(() => feePayments.id),
    itemId: int({ unsigned: true })
      .notNull()
      .references(() => feePaymentItems.id),
    reportId: int({ unsigned: true })
      .notNull()
      .references(() => testReports.id),
    activeItemId: int({ unsigned: true }),
    amountCents: int({ unsigned: true }).notNull(),
    currency: char({ length: 3 }).notNull(),
    status: mysqlEnum(feeRefundStatuses).notNull().default("pending"),
    reason: text().notNull(),
    /** Null for an automatic refund of a fee that could not be applied. */
    requestedBy: int({ unsigned: true }).references(() => users.id),
    providerRefundId: varchar({ length: 255 }),
    failureReason: varchar({ length: 300 }),
    succeededAt: datetime({ fsp: 3 }),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("fee_refunds_provider_uq").on(t.providerRefundId), uniqueIndex("fee_refunds_active_item_uq").on(t.activeItemId), index("fee_refunds_payment_idx").on(t.paymentId), index("fee_refunds_report_idx").on(t.reportId)],
);

/** A fee the program admin waived, with the reason (also in the audit log). One per report. */
export const feeWaivers = mysqlTable(
  "fee_waivers",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    reportId: int({ unsigned: true })
      .notNull()
      .references(() => testReports.id),
    amountCents: int({ unsigned: true }).notNull(),
    currency: char({ length: 3 }).notNull(),
    reason: text().notNull(),
    waivedBy: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    waivedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("fee_waivers_report_uq").on(t.reportId), index("fee_waivers_program_idx").on(t.programId, t.waivedAt)],
);

/**
 * Every webhook event handled, by the payments service's event id. The row is inserted in the
 * same transaction as the event's effect: a replayed event, or the same event delivered twice at
 * once, hits the unique index and changes nothing.
 */
export const paymentWebhookEvents = mysqlTable(
  "payment_webhook_events",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    eventId: varchar({ length: 255 }).notNull(),
    type: varchar({ length: 100 }).notNull(),
    /** The session or refund the event is about. */
    objectId: varchar({ length: 255 }).notNull().default(""),
    outcome: varchar({ length: 40 }).notNull(),
    detail: json(),
    receivedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("payment_webhook_events_event_uq").on(t.eventId), index("payment_webhook_events_object_idx").on(t.objectId)],
);

export type FeePayment = typeof feePayments.$inferSelect;
export type FeePaymentItem = typeof feePaymentItems.$inferSelect;
export type FeeRefund = typeof feeRefunds.$inferSelect;
export type FeeWaiver = typeof feeWaivers.$inferSelect;
