// Paying filing fees through the payments SDK against the local stand-in: the checkout, the
// signed webhook that alone confirms payment, replays and concurrent deliveries, forged
// signatures, canceling, and a company's billing manager paying for a colleague.
import { and, eq, sql } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { auditLog, companies, feePaymentItems, feePayments, paymentWebhookEvents } from "@/db/schema";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { createOwedReport, createTester, reportFeeState } from "../helpers/fees-factory";
import { as, unique } from "../helpers/http";
import { waitForMessage } from "../helpers/mail";
import { eventually, getStandInSession, payStandInSession, replayWebhook, sendBadlySignedWebhook, sessionIdFromUrl, waitForStandInIdle } from "../helpers/payments";

afterAll(closeTestDb);

async function auditCount(action: string, entityId: number | string): Promise<number> {
  const [row] = await testDb()
    .select({ n: sql<number>`COUNT(*)` })
    .from(auditLog)
    .where(and(eq(auditLog.action, action), eq(auditLog.entityId, String(entityId))));
  return Number(row?.n ?? 0);
}

async function paymentRow(id: number) {
  const [row] = await testDb().select().from(feePayments).where(eq(feePayments.id, id));
  return row!;
}

async function newCompany(): Promise<number> {
  const [row] = await testDb().insert(companies).values({ name: `Fee test company ${unique()}`, createdAt: new Date() }).$returningId();
  return row!.id;
}

describe("paying filing fees", () => {
  test("one checkout for two reports: the amount comes from the reports, the webhook (not the redirect) confirms, the receipt is e-mailed", async () => {
    const tester = await createTester();
    const first = await createOwedReport({ testerId: tester.id, feeCents: 1500 });
    const second = await createOwedReport({ testerId: tester.id, feeCents: 1250 });
    const before = await reportFeeState(first.id);
    const client = await as(tester.email);

    const opened = await client.post("/api/fees/checkout", { reportIds: [first.id, second.id] });
    expect(opened.status, opened.text).toBe(200);
    const { paymentId, url } = opened.body as { paymentId: number; url: string };
    const session = await getStandInSession(sessionIdFromUrl(url));
    expect(session.amount_total).toBe(2750);
    expect(session.currency).toBe("usd");
    expect(session.line_items.map((l) => l.unit_amount).sort()).toEqual([1250, 1500]);
    expect(session.customer_email).toBe(tester.email);
    expect(session.success_url).toContain(`/tester/fees/return?payment=${paymentId}`);

    // The payer is back on the return page, but the service has not confirmed yet.
    const paid = await payStandInSession(session.id, "none");
    expect(paid.redirect).toContain(`payment=${paymentId}`);
    const returned = await client.get(new URL(paid.redirect).pathname + new URL(paid.redirect).search);
    expect(returned.status).toBe(200);
    expect(returned.text).toContain("Payment being confirmed");
    expect((await client.get(`/api/fees/payments/${paymentId}`)).body).toMatchObject({ status: "pending" });
    expect(await reportFeeState(first.id)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed" });

    const delivered = await replayWebhook(paid.eventId);
    expect(delivered.results[0]!.status).toBe(200);
    expect(JSON.parse(delivered.results[0]!.body)).toMatchObject({ received: true, outcome: "paid", duplicate: false });

    const payment = await client.get(`/api/fees/payments/${paymentId}`);
    expect(payment.body).toMatchObject({ status: "paid", amountCents: 2750, currency: "USD" });
    for (const report of [first, second]) {
      const state = await reportFeeState(report.id);
      expect(state).toMatchObject({ status: "queued", feeStatus: "paid" });
      expect(await auditCount("report.fee_paid", report.id)).toBe(1);
    }
    // Paying moves the report to the queue; it keeps its place in line by its filing time.
    expect((await reportFeeState(first.id)).submittedAt.getTime()).toBe(before.submittedAt.getTime());
    expect(await auditCount("fee.payment_confirmed", paymentId)).toBe(1);
    expect((await paymentRow(paymentId)).paymentIntentId).toBe((await getStandInSession(session.id)).payment_intent);

    const receipt = await waitForMessage(tester.email, (m) => m.subject.startsWith("Receipt "));
    expect(receipt.subject).toContain("Quillmere Valley Water District");
    expect(receipt.text).toContain("$27.50");
    expect(receipt.text).toContain(first.reportNumber);
    expect(receipt.html).toContain(second.reportNumber);

    const page = await client.get(`/tester/fees/return?payment=${paymentId}&session_id=${session.id}`);
    expect(page.text).toContain("Payment confirmed");
    const receipts = await client.get("/tester/fees/receipts");
    expect(receipts.text).toContain(first.reportNumber);
  });

  test("the same event delivered again, or twice at the same moment, has one effect", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const client = await as(tester.email);
    const { url, paymentId } = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    const paid = await payStandInSession(sessionIdFromUrl(url), "none");

    const together = await replayWebhook(paid.eventId, 4);
    expect(together.results.map((r) => r.status)).toEqual([200, 200, 200, 200]);
    const outcomes = together.results.map((r) => (JSON.parse(r.body) as { outcome: string }).outcome).sort();
    expect(outcomes).toEqual(["duplicate", "duplicate", "duplicate", "paid"]);
    expect(await auditCount("report.fee_paid", report.id)).toBe(1);
    const [events] = await testDb().select({ n: sql<number>`COUNT(*)` }).from(paymentWebhookEvents).where(eq(paymentWebhookEvents.eventId, paid.eventId));
    expect(Number(events?.n)).toBe(1);

    await waitForStandInIdle();
    const counts = await countAllTables();
    const replayed = await replayWebhook(paid.eventId);
    expect(replayed.results[0]!.status).toBe(200);
    expect(JSON.parse(replayed.results[0]!.body)).toMatchObject({ duplicate: true });
    await waitForStandInIdle();
    expect(await countAllTables()).toEqual(counts);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });
    const items = await testDb().select().from(feePaymentItems).where(eq(feePaymentItems.paymentId, paymentId));
    expect(items.map((i) => i.status)).toEqual(["paid"]);
  });

  test.each([
    { mode: "wrong_secret" as const, label: "signed with another secret" },
    { mode: "tampered_payload" as const, label: "signed for another body (a raised amount)" },
    { mode: "missing" as const, label: "without a signature" },
    { mode: "stale" as const, label: "with an hour-old signature (a replay from outside)" },
  ])("a webhook $label is refused with 400 and changes nothing", async ({ mode }) => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const client = await as(tester.email);
    const { url, paymentId } = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    const paid = await payStandInSession(sessionIdFromUrl(url), "none");
    await waitForStandInIdle();
    const counts = await countAllTables();

    const forged = await sendBadlySignedWebhook(paid.eventId, mode);
    expect(forged.result.status).toBe(400);
    expect(forged.result.body).toContain("signature");

    expect(await countAllTables()).toEqual(counts);
    expect((await paymentRow(paymentId)).status).toBe("pending");
    expect(await reportFeeState(report.id)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed" });
    // The genuine delivery still works afterwards.
    expect((await replayWebhook(paid.eventId)).results[0]!.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });
  });

  test("a webhook posted straight to the app with a made-up signature is refused", async () => {
    const client = await as((await createTester()).email);
    await waitForStandInIdle();
    const counts = await countAllTables();
    const response = await client
      .post("/api/fees/webhook", { id: "evt_made_up", type: "checkout.session.completed", data: { object: { id: "cs_made_up", payment_status: "paid" } } })
      .set("stripe-signature", `t=${Math.floor(Date.now() / 1000)},v1=${"0".repeat(64)}`);
    expect(response.status).toBe(400);
    expect(await countAllTables()).toEqual(counts);
  });

  test("canceling on the checkout page charges nothing, closes the checkout and frees the reports", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const client = await as(tester.email);
    const { url, paymentId } = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    const sessionId = sessionIdFromUrl(url);
    const session = await getStandInSession(sessionId);
    expect(session.cancel_url).toContain(`payment=${paymentId}&canceled=1`);

    const canceled = await client.post(`/api/fees/payments/${paymentId}/cancel`);
    expect(canceled.status).toBe(200);
    expect(canceled.body).toMatchObject({ status: "canceled" });
    expect((await getStandInSession(sessionId)).status).toBe("expired");
    expect(await reportFeeState(report.id)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed" });
    // Repeating the cancel is harmless; the closed checkout cannot be paid any more.
    expect((await client.post(`/api/fees/payments/${paymentId}/cancel`)).body).toMatchObject({ status: "canceled" });
    await expect(payStandInSession(sessionId)).rejects.toThrow(/expired/);

    const again = await client.post("/api/fees/checkout", { reportIds: [report.id] });
    expect(again.status).toBe(200);
    const paid = await payStandInSession(sessionIdFromUrl((again.body as { url: string }).url));
    expect(paid.delivery?.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });
    expect((await paymentRow(paymentId)).status).toBe("canceled");
  });

  test("a new checkout for a report left in an abandoned one closes the old checkout first", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const client = await as(tester.email);
    const old = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    const fresh = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    expect(fresh.paymentId).not.toBe(old.paymentId);
    expect((await getStandInSession(sessionIdFromUrl(old.url))).status).toBe("expired");
    expect((await paymentRow(old.paymentId)).status).toBe("canceled");
    await expect(payStandInSession(sessionIdFromUrl(old.url))).rejects.toThrow();
    expect((await payStandInSession(sessionIdFromUrl(fresh.url))).delivery?.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ feeStatus: "paid" });
  });

  test("two checkouts for the same report opened at the same moment: one opens, the other is refused", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const client = await as(tester.email);
    const answers = await Promise.all([client.post("/api/fees/checkout", { reportIds: [report.id] }), client.post("/api/fees/checkout", { reportIds: [report.id] })]);
    const statuses = answers.map((a) => a.status).sort();
    // Either the second waited and was refused, or it closed the first and replaced it.
    const open = await testDb().select().from(feePaymentItems).where(eq(feePaymentItems.activeReportId, report.id));
    expect(open).toHaveLength(1);
    expect(statuses.filter((s) => s === 200).length).toBeGreaterThanOrEqual(1);
    for (const a of answers.filter((x) => x.status !== 200)) expect(a.status).toBe(409);
    const winner = answers.find((a) => a.status === 200 && (a.body as { paymentId: number }).paymentId === open[0]!.paymentId)!;
    expect((await payStandInSession(sessionIdFromUrl((winner.body as { url: string }).url))).delivery?.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ feeStatus: "paid" });
    expect(await auditCount("report.fee_paid", report.id)).toBe(1);
  });

  test("coming back through the cancel link after paying does not cancel: the webhook still settles the fee", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const client = await as(tester.email);
    const { url, paymentId } = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    const paid = await payStandInSession(sessionIdFromUrl(url), "none");
    const canceled = await client.post(`/api/fees/payments/${paymentId}/cancel`);
    expect(canceled.status).toBe(200);
    expect(canceled.body).toMatchObject({ isBeingConfirmed: true });
    expect((await replayWebhook(paid.eventId)).results[0]!.status).toBe(200);
    expect((await paymentRow(paymentId)).status).toBe("paid");
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });
  });

  test("money for a fee settled meanwhile by another payment is refunded automatically, never applied twice", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id, feeCents: 1700 });
    const client = await as(tester.email);
    const first = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    const latePayment = await payStandInSession(sessionIdFromUrl(first.url), "none");
    // The first checkout was paid but not yet confirmed: a new one is refused once, then opens.
    const refused = await client.post("/api/fees/checkout", { reportIds: [report.id] });
    expect(refused.status).toBe(409);
    expect(refused.body).toMatchObject({ code: "payment_completing" });
    const second = await client.post("/api/fees/checkout", { reportIds: [report.id] });
    expect(second.status, second.text).toBe(200);
    expect((await payStandInSession(sessionIdFromUrl((second.body as { url: string }).url))).delivery?.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ feeStatus: "paid" });

    // Now the first payment's webhook arrives: it cannot take the report, so it is refunded.
    const late = await replayWebhook(latePayment.eventId);
    expect(JSON.parse(late.results[0]!.body)).toMatchObject({ outcome: "paid_partly_unapplied" });
    await eventually(async () => {
      const [item] = await testDb().select().from(feePaymentItems).where(eq(feePaymentItems.paymentId, first.paymentId));
      return item?.status === "refunded";
    }, "the automatic refund");
    expect((await paymentRow(first.paymentId)).refundedCents).toBe(1700);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });
    expect(await auditCount("report.fee_paid", report.id)).toBe(1);
  });

  test("a company's billing manager pays a colleague's fee; a colleague without the role cannot", async () => {
    const companyId = await newCompany();
    const manager = await createTester({ companyId, isBillingManager: true });
    const colleague = await createTester({ companyId });
    const other = await createTester({ companyId });
    const report = await createOwedReport({ testerId: colleague.id, feeCents: 1800 });

    const managerClient = await as(manager.email);
    const listed = await managerClient.get("/tester/fees?scope=company");
    expect(listed.text).toContain(report.reportNumber);
    expect((await managerClient.get("/tester/fees?scope=mine")).text).not.toContain(report.reportNumber);
    expect((await (await as(other.email)).get("/tester/fees")).text).not.toContain(report.reportNumber);

    const refused = await (await as(other.email)).post("/api/fees/checkout", { reportIds: [report.id] });
    expect(refused.status).toBe(404);

    const opened = await managerClient.post("/api/fees/checkout", { reportIds: [report.id] });
    expect(opened.status, opened.text).toBe(200);
    const { paymentId, url } = opened.body as { paymentId: number; url: string };
    expect((await paymentRow(paymentId)).companyId).toBe(companyId);
    expect((await payStandInSession(sessionIdFromUrl(url))).delivery?.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });
    // The colleague does not see the manager's payment; the manager sees it among the receipts.
    expect((await (await as(colleague.email)).get(`/api/fees/payments/${paymentId}`)).status).toBe(404);
    expect((await managerClient.get("/tester/fees/receipts")).text).toContain(report.reportNumber);
    await waitForMessage(manager.email, (m) => m.subject.startsWith("Receipt "));
  });
});
