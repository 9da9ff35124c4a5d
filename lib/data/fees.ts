import "server-only";
import { and, desc, eq, inArray, or, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { feePaymentItems, feePayments, feeRefunds, programs, testReports, users } from "@/db/schema";
import type { FeePaymentItemStatus, FeePaymentStatus } from "@/db/schema/payments";
import type { ReportStatus } from "@/db/schema/reports";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";
import { AppError, ConflictError, InputError, NotFoundError, isDuplicateKey } from "@/lib/errors";
import { getPaymentsClient, paymentServiceError } from "@/lib/payments/client";
import { isSupportedCurrency, receiptNumberOf, sumCents } from "@/lib/payments/money";
import { dateInZone } from "@/lib/payments/periods";
import { recordAudit } from "./audit";
import { affected, closeOpenCheckout, closePendingPayment, describeAssembly, openPaymentsHolding, reportLabel } from "./fees-core";

/** The most reports one checkout pays (the payments service takes 100 line items). */
export const MAX_REPORTS_PER_CHECKOUT = 50;

export type FeeScope = "mine" | "company";

/** A billing manager pays for every tester of their company; everyone else for themselves. */
export function isCompanyBillingManager(actor: Actor): actor is Actor & { companyId: number } {
  return actor.role === "tester" && actor.isBillingManager && actor.companyId !== null;
}

function scopeCondition(actor: Actor, scope: FeeScope): SQL {
  if (scope === "company" && isCompanyBillingManager(actor)) return eq(users.companyId, actor.companyId);
  return eq(testReports.testerId, actor.id);
}

export interface OutstandingFee {
  reportId: number;
  report: string;
  programId: number;
  programName: string;
  feeCents: number;
  currency: string;
  testedOn: string;
  submittedAt: string;
  /** The filing date in the program's time zone (formatted here, so server and browser agree). */
  submittedOn: string;
  testerName: string;
  isOwn: boolean;
  assembly: string;
  /** In an open checkout right now (paying again closes that one first). */
  isInOpenCheckout: boolean;
}

/** The fees the actor may pay: their own, or their company's for a billing manager. */
export async function listOutstandingFees(actor: Actor, scope: FeeScope = "mine"): Promise<OutstandingFee[]> {
  assertCan(actor, "fees.pay");
  const db = getDb();
  const rows = await db
    .select({
      reportId: testReports.id,
      reportNumber: testReports.reportNumber,
      revision: testReports.revision,
      programId: testReports.programId,
      programName: programs.name,
      timezone: programs.timezone,
      feeCents: testReports.feeCents,
      currency: testReports.feeCurrency,
      testedOn: testReports.testedOn,
      submittedAt: testReports.submittedAt,
      testerId: testReports.testerId,
      testerName: users.name,
      snapshot: testReports.assemblySnapshot,
    })
    .from(testReports)
    .innerJoin(users, eq(users.id, testReports.testerId))
    .innerJoin(programs, eq(programs.id, testReports.programId))
    .where(and(eq(testReports.feeStatus, "owed"), scopeCondition(actor, scope)))
    .orderBy(testReports.programId, testReports.submittedAt)
    .limit(500);
  const held = new Set<number>();
  if (rows.length) {
    const open = await db
      .select({ reportId: feePaymentItems.reportId })
      .from(feePaymentItems)
      .innerJoin(feePayments, eq(feePayments.id, feePaymentItems.paymentId))
      .where(and(inArray(feePaymentItems.activeReportId, rows.map((r) => r.reportId)), eq(feePayments.status, "pending")));
    for (const o of open) held.add(o.reportId);
  }
  return rows.map((r) => ({
    reportId: r.reportId,
    report: reportLabel(r),
    programId: r.programId,
    programName: r.programName,
    feeCents: r.feeCents,
    currency: r.currency,
    testedOn: r.testedOn,
    submittedAt: r.submittedAt.toISOString(),
    submittedOn: dateInZone(r.submittedAt, r.timezone),
    testerName: r.testerName,
    isOwn: r.testerId === actor.id,
    assembly: describeAssembly(r.snapshot),
    isInOpenCheckout: held.has(r.reportId),
  }));
}

/**
 * A checkout request names reports and nothing else: the amount always comes from each
 * report's fee as captured at submission. Unknown keys are kept so they can be refused.
 */
export const checkoutRequestSchema = z.looseObject({
  reportIds: z
    .array(z.number({ error: "Report ids are numbers." }).int().positive(), { error: "Choose the reports to pay." })
    .min(1, "Choose at least one report to pay.")
    .max(MAX_REPORTS_PER_CHECKOUT, `One checkout pays at most ${MAX_REPORTS_PER_CHECKOUT} reports; pay the rest in a second checkout.`),
});
export type CheckoutRequest = z.infer<typeof checkoutRequestSchema>;

/** A refused checkout is recorded (outside any transaction: nothing else is written). */
async function refuseCheckout(actor: Actor, error: AppError, detail: Record<string, unknown>, programId: number | null = null): Promise<never> {
  await recordAudit(getDb(), { programId, actorId: actor.id, action: "fee.checkout_refused", entityType: "user", entityId: actor.id, after: { code: error.code, message: error.message, ...detail } });
  throw error;
}

const settledWords: Record<string, string> = { paid: "is already paid", waived: "was waived", refunded: "was refunded", none: "has no fee" };

/**
 * Opens one checkout for one program's owed reports. Every id is checked against what the actor
 * may pay (own reports, or the company's for a billing manager); anything else is refused and
 * logged, and nothing is created. Returns the payments service's checkout page address.
 */
export async function startFeeCheckout(actor: Actor, request: CheckoutRequest): Promise<{ paymentId: number; url: string }> {
  assertCan(actor, "fees.pay");
  const reportIds = [...new Set(request.reportIds)];
  const extraKeys = Object.keys(request).filter((k) => k !== "reportIds");
  if (extraKeys.length) {
    await refuseCheckout(actor, new InputError(`A checkout names the reports to pay and nothing else; the amount is computed from each report's fee. Not accepted: ${extraKeys.join(", ")}.`), { reportIds, extraKeys });
  }
  const db = getDb();
  const loadReports = () =>
    db
      .select({ id: testReports.id, programId: testReports.programId, reportNumber: testReports.reportNumber, revision: testReports.revision, feeStatus: testReports.feeStatus, feeCents: testReports.feeCents, currency: testReports.feeCurrency, testerId: testReports.testerId, companyId: users.companyId })
      .from(testReports)
      .innerJoin(users, eq(users.id, testReports.testerId))
      .where(inArray(testReports.id, reportIds));
  const canPay = (r: { testerId: number; companyId: number | null }) => r.testerId === actor.id || (isCompanyBillingManager(actor) && r.companyId === actor.companyId);

  const found = new Map((await loadReports()).map((r) => [r.id, r]));
  const notMine = reportIds.filter((id) => !found.has(id) || !canPay(found.get(id)!));
  if (notMine.length) {
    // Someone else's report is answered like a missing one: its existence is not confirmed.
    const programIds = [...new Set(notMine.map((id) => found.get(id)?.programId).filter((p): p is number => p !== undefined))];
    await refuseCheckout(actor, new NotFoundError(`${notMine.length === 1 ? `Report #${notMine[0]} is` : `Reports #${notMine.join(", #")} are`} not among the fees you can pay. Nothing was charged.`), { reportIds, notPayable: notMine }, programIds.length === 1 ? programIds[0] : null);
  }
  const reports = reportIds.map((id) => found.get(id)!);
  const settled = reports.filter((r) => r.feeStatus !== "owed");
  if (settled.length) {
    const first = settled[0]!;
    await refuseCheckout(actor, new ConflictError(`The fee of report ${reportLabel(first)} ${settledWords[first.feeStatus] ?? "is not owed"}${settled.length > 1 ? ` (and ${settled.length - 1} more)` : ""}. Nothing was charged.`, "fee_not_owed"), { reportIds, notOwed: settled.map((r) => r.id) }, first.programId);
  }
  const programIds = new Set(reports.map((r) => r.programId));
  const currencies = new Set(reports.map((r) => r.currency));
  if (programIds.size > 1) await refuseCheckout(actor, new InputError("One checkout pays one program's fees. Pay each program's reports separately."), { reportIds });
  if (currencies.size > 1) await refuseCheckout(actor, new InputError("These reports were charged in different currencies; pay them in separate checkouts."), { reportIds });
  const programId = reports[0]!.programId;
  const currency = reports[0]!.currency;
  if (!isSupportedCurrency(currency)) await refuseCheckout(actor, new InputError(`Fees in ${currency} cannot be paid online.`), { reportIds }, programId);
  if (reports.some((r) => r.feeCents <= 0)) await refuseCheckout(actor, new ConflictError("One of these reports has no fee to pay.", "fee_not_owed"), { reportIds }, programId);

  // A report left in another open checkout (an abandoned tab, a colleague's) is taken out of it
  // first, and that checkout is closed at the payments service so it can no longer be paid.
  for (const openId of await openPaymentsHolding(reportIds)) {
    const result = await closeOpenCheckout(openId, "canceled", "Replaced by a new checkout.", actor.id);
    if (result === "completing") throw new ConflictError("A payment that includes one of these reports has just been made and is being confirmed. Reload the page in a minute.", "payment_completing");
  }

  const [program] = await db.select({ name: programs.name, prefix: programs.reportPrefix }).from(programs).where(eq(programs.id, programId));
  const now = new Date();
  const amountCents = sumCents(reports.map((r) => r.feeCents));
  const paymentId = await db.transaction(async (tx) => {
    // Re-read under lock: the fees may have changed since the checks above.
    const locked = await tx.select({ id: testReports.id, feeStatus: testReports.feeStatus, feeCents: testReports.feeCents, currency: testReports.feeCurrency }).from(testReports).where(inArray(testReports.id, reportIds)).for("update");
    const changed = locked.filter((l) => {
      const before = found.get(l.id)!;
      return l.feeStatus !== "owed" || l.feeCents !== before.feeCents || l.currency !== before.currency;
    });
    if (changed.length || locked.length !== reportIds.length) throw new ConflictError("The fees of these reports changed a moment ago. Reload the page and choose again. Nothing was charged.", "fee_changed");
    const [payment] = await tx
      .insert(feePayments)
      .values({ programId, payerId: actor.id, companyId: reports.some((r) => r.testerId !== actor.id) ? actor.companyId : null, status: "pending", amountCents, currency, createdAt: now, updatedAt: now })
      .$returningId();
    const id = payment!.id;
    try {
      await tx.insert(feePaymentItems).values(reports.map((r) => ({ paymentId: id, reportId: r.id, activeReportId: r.id, amountCents: r.feeCents, currency, status: "pending" as const, createdAt: now, updatedAt: now })));
    } catch (error) {
      if (isDuplicateKey(error)) throw new ConflictError("Another checkout for one of these reports has just been opened. Reload the page and try again.", "checkout_opening");
      throw error;
    }
    await recordAudit(tx, { programId, actorId: actor.id, action: "fee.checkout_started", entityType: "fee_payment", entityId: id, after: { reportIds, amountCents, currency } });
    return id;
  });

  const appUrl = getEnv().APP_URL.replace(/\/$/, "");
  let session;
  try {
    session = await getPaymentsClient().checkout.sessions.create(
      {
        mode: "payment",
        customer_email: actor.email,
        client_reference_id: `fee-payment-${paymentId}`,
        line_items: reports.map((r) => ({
          quantity: 1,
          price_data: { currency: currency.toLowerCase(), unit_amount: r.feeCents, product_data: { name: `Filing fee, report ${reportLabel(r)}` } },
        })),
        metadata: { zoneward_payment_id: String(paymentId), zoneward_receipt: receiptNumberOf(program?.prefix ?? "ZW", paymentId) },
        payment_intent_data: { description: `${program?.name ?? "Zoneward"} filing fees`, metadata: { zoneward_payment_id: String(paymentId) } },
        success_url: `${appUrl}/tester/fees/return?payment=${paymentId}&session_id={CHECKOUT_SESSION_ID}`,
        cancel_url: `${appUrl}/tester/fees/return?payment=${paymentId}&canceled=1`,
      },
      { idempotencyKey: `zoneward-fee-checkout-${paymentId}` },
    );
  } catch (error) {
    await db.transaction((tx) => closePendingPayment(tx, paymentId, "failed", "The payments service did not open the checkout.", actor.id));
    throw paymentServiceError(error, "The checkout could not be opened");
  }
  // The amount the service will charge must be the one computed here, or nobody pays it.
  if (session.amount_total !== amountCents || session.currency?.toUpperCase() !== currency || !session.url) {
    await getPaymentsClient().checkout.sessions.expire(session.id).catch(() => undefined);
    await db.transaction((tx) => closePendingPayment(tx, paymentId, "failed", "The checkout's amount did not match the fees.", actor.id));
    throw new AppError("The payments service opened a checkout for a different amount, so it was closed. Nothing was charged.", 502, "amount_mismatch");
  }
  const stored = await db
    .update(feePayments)
    .set({ checkoutSessionId: session.id, checkoutUrl: session.url, updatedAt: new Date() })
    .where(and(eq(feePayments.id, paymentId), eq(feePayments.status, "pending")));
  if (affected(stored) !== 1) {
    await getPaymentsClient().checkout.sessions.expire(session.id).catch(() => undefined);
    throw new ConflictError("This checkout was replaced while it opened. Reload the page and try again.", "checkout_replaced");
  }
  return { paymentId, url: session.url };
}

export interface FeePaymentView {
  id: number;
  receiptNumber: string;
  programName: string;
  /** The program's time zone, for showing dates and times as the program office sees them. */
  timezone: string;
  status: FeePaymentStatus;
  amountCents: number;
  refundedCents: number;
  currency: string;
  createdAt: string;
  paidAt: string | null;
  payerName: string;
  isOwnPayment: boolean;
  checkoutUrl: string | null;
  items: { reportId: number; report: string; assembly: string; testerName: string; amountCents: number; itemStatus: FeePaymentItemStatus; reportStatus: ReportStatus; feeStatus: string; refundPending: boolean }[];
}

/** Who may see a payment: its payer, and the billing manager of the company it was made for or by. */
function paymentVisibility(actor: Actor): SQL {
  if (isCompanyBillingManager(actor)) return or(eq(feePayments.payerId, actor.id), eq(feePayments.companyId, actor.companyId), eq(users.companyId, actor.companyId))!;
  return eq(feePayments.payerId, actor.id);
}

async function loadPayments(actor: Actor, where: SQL, limit: number): Promise<FeePaymentView[]> {
  const db = getDb();
  const rows = await db
    .select({ payment: feePayments, payerName: users.name, programName: programs.name, prefix: programs.reportPrefix, timezone: programs.timezone })
    .from(feePayments)
    .innerJoin(users, eq(users.id, feePayments.payerId))
    .innerJoin(programs, eq(programs.id, feePayments.programId))
    .where(and(where, paymentVisibility(actor)))
    .orderBy(desc(feePayments.createdAt))
    .limit(limit);
  if (rows.length === 0) return [];
  const items = await db
    .select({ item: feePaymentItems, reportNumber: testReports.reportNumber, revision: testReports.revision, snapshot: testReports.assemblySnapshot, reportStatus: testReports.status, feeStatus: testReports.feeStatus, testerName: users.name })
    .from(feePaymentItems)
    .innerJoin(testReports, eq(testReports.id, feePaymentItems.reportId))
    .innerJoin(users, eq(users.id, testReports.testerId))
    .where(inArray(feePaymentItems.paymentId, rows.map((r) => r.payment.id)))
    .orderBy(testReports.reportNumber);
  const pendingRefunds = new Set(
    (await db.select({ itemId: feeRefunds.itemId }).from(feeRefunds).where(and(inArray(feeRefunds.paymentId, rows.map((r) => r.payment.id)), eq(feeRefunds.status, "pending")))).map((r) => r.itemId),
  );
  return rows.map(({ payment, payerName, programName, prefix, timezone }) => ({
    id: payment.id,
    receiptNumber: receiptNumberOf(prefix, payment.id),
    programName,
    timezone,
    status: payment.status,
    amountCents: payment.amountCents,
    refundedCents: payment.refundedCents,
    currency: payment.currency,
    createdAt: payment.createdAt.toISOString(),
    paidAt: payment.paidAt?.toISOString() ?? null,
    payerName,
    isOwnPayment: payment.payerId === actor.id,
    checkoutUrl: payment.status === "pending" ? payment.checkoutUrl : null,
    items: items
      .filter((i) => i.item.paymentId === payment.id)
      .map((i) => ({ reportId: i.item.reportId, report: reportLabel(i), assembly: describeAssembly(i.snapshot), testerName: i.testerName, amountCents: i.item.amountCents, itemStatus: i.item.status, reportStatus: i.reportStatus, feeStatus: i.feeStatus, refundPending: pendingRefunds.has(i.item.id) })),
  }));
}

/** One payment as its payer (or their company's billing manager) sees it; 404 for anyone else. */
export async function getFeePayment(actor: Actor, paymentId: number): Promise<FeePaymentView> {
  assertCan(actor, "fees.pay");
  const [payment] = await loadPayments(actor, eq(feePayments.id, paymentId), 1);
  if (!payment) throw new NotFoundError("That payment was not found.");
  return payment;
}

/** Confirmed payments (receipts), newest first. */
export async function listFeeReceipts(actor: Actor, limit = 100): Promise<FeePaymentView[]> {
  assertCan(actor, "fees.pay");
  return loadPayments(actor, eq(feePayments.status, "paid"), limit);
}

/** Checkouts opened and not yet paid or closed, newest first. */
export async function listOpenCheckouts(actor: Actor): Promise<FeePaymentView[]> {
  assertCan(actor, "fees.pay");
  return loadPayments(actor, eq(feePayments.status, "pending"), 20);
}

/**
 * The payer came back from the checkout page without paying: the checkout is closed (here and at
 * the payments service, so it cannot be paid later by mistake) and its reports are free again.
 * Safe to repeat. When the service says it was paid after all, the webhook settles it.
 */
export async function cancelFeeCheckout(actor: Actor, paymentId: number): Promise<FeePaymentView & { isBeingConfirmed: boolean }> {
  const payment = await getFeePayment(actor, paymentId);
  const result = payment.status === "pending" ? await closeOpenCheckout(paymentId, "canceled", "The payer canceled the checkout.", actor.id) : "not_open";
  return { ...(await getFeePayment(actor, paymentId)), isBeingConfirmed: result === "completing" };
}
