// The program admin's side of filing fees: waiving with a reason (audit log), refunding through
// the payments SDK (recorded when the refund's webhook arrives), and the company statement PDF.
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, desc, eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { auditLog, companies, feePayments, feeRefunds, feeWaivers, programs } from "@/db/schema";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { createOwedReport, createTester, reportFeeState } from "../helpers/fees-factory";
import { as, unique } from "../helpers/http";
import { controlStandIn, eventually, getStandInSession, payStandInSession, replayWebhook, sessionIdFromUrl, waitForStandInIdle } from "../helpers/payments";

afterAll(closeTestDb);

const admin = () => as(demoAccounts.admin);

async function paidReport(feeCents = 1500) {
  const tester = await createTester();
  const report = await createOwedReport({ testerId: tester.id, feeCents });
  const { url, paymentId } = (await (await as(tester.email)).post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
  expect((await payStandInSession(sessionIdFromUrl(url))).delivery?.status).toBe(200);
  return { tester, report, paymentId, sessionId: sessionIdFromUrl(url) };
}

async function latestAudit(action: string, entityId: number) {
  const [row] = await testDb()
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.action, action), eq(auditLog.entityId, String(entityId))))
    .orderBy(desc(auditLog.id))
    .limit(1);
  return row;
}

describe("waiving a fee", () => {
  test("with a reason: the report goes to the queue, the waiver and the reason are recorded", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const response = await (await admin()).post(`/api/fees/reports/${report.id}/waive`, { reason: "Hardship waiver approved by the program manager." });
    expect(response.status, response.text).toBe(200);
    expect(response.body).toMatchObject({ feeStatus: "waived", status: "queued" });
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "waived" });
    const [waiver] = await testDb().select().from(feeWaivers).where(eq(feeWaivers.reportId, report.id));
    expect(waiver).toMatchObject({ amountCents: 1500, currency: "USD", reason: "Hardship waiver approved by the program manager." });
    const audit = await latestAudit("report.fee_waived", report.id);
    expect(audit?.after).toMatchObject({ feeStatus: "waived", reason: "Hardship waiver approved by the program manager." });
    expect((await (await admin()).get("/admin/fees?view=waived")).text).toContain(report.reportNumber);

    // A second waiver, or a payment of the waived fee, is refused.
    expect((await (await admin()).post(`/api/fees/reports/${report.id}/waive`, { reason: "Once more, by mistake." })).status).toBe(409);
    expect((await (await as(tester.email)).post("/api/fees/checkout", { reportIds: [report.id] })).status).toBe(409);
  });

  test("without a real reason, by another program's admin, or by an inspector: refused, nothing changes", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const adminClient = await admin();
    const neighbour = await as(demoAccounts.neighbourAdmin);
    const inspector = await as(demoAccounts.inspector);
    const before = await countAllTables();
    expect((await adminClient.post(`/api/fees/reports/${report.id}/waive`, { reason: "ok" })).status).toBe(422);
    expect((await adminClient.post(`/api/fees/reports/${report.id}/waive`, {})).status).toBe(422);
    expect((await neighbour.post(`/api/fees/reports/${report.id}/waive`, { reason: "Not my program at all." })).status).toBe(404);
    expect((await inspector.post(`/api/fees/reports/${report.id}/waive`, { reason: "Inspectors cannot waive." })).status).toBe(403);
    expect(await countAllTables()).toEqual(before);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed" });
  });

  test("waiving a fee that sits in an open checkout closes that checkout first", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const { url, paymentId } = (await (await as(tester.email)).post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string; paymentId: number };
    expect((await (await admin()).post(`/api/fees/reports/${report.id}/waive`, { reason: "Program error: fee charged twice." })).status).toBe(200);
    expect((await getStandInSession(sessionIdFromUrl(url))).status).toBe("expired");
    const [payment] = await testDb().select().from(feePayments).where(eq(feePayments.id, paymentId));
    expect(payment?.status).toBe("canceled");
  });

  test("a fee paid but not yet confirmed cannot be waived; the payment then settles it", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const { url } = (await (await as(tester.email)).post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string };
    const paid = await payStandInSession(sessionIdFromUrl(url), "none");
    const refused = await (await admin()).post(`/api/fees/reports/${report.id}/waive`, { reason: "Trying to waive a fee just paid." });
    expect(refused.status).toBe(409);
    expect(refused.body).toMatchObject({ code: "payment_completing" });
    expect((await replayWebhook(paid.eventId)).results[0]!.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });
  });
});

describe("refunding a fee", () => {
  test("through the payments service; the fee shows as refunded once the webhook arrives, the report stays queued", async () => {
    const { report, paymentId, sessionId } = await paidReport(2200);
    const response = await (await admin()).post(`/api/fees/reports/${report.id}/refund`, { reason: "Report filed twice; duplicate withdrawn." });
    expect(response.status, response.text).toBe(200);
    const { refundId } = response.body as { refundId: number };
    const refunded = await eventually(async () => {
      const [row] = await testDb().select().from(feeRefunds).where(eq(feeRefunds.id, refundId));
      return row?.status === "succeeded" ? row : null;
    }, "the refund webhook");
    expect(refunded).toMatchObject({ amountCents: 2200, reason: "Report filed twice; duplicate withdrawn." });
    expect(refunded.providerRefundId).toMatch(/^re_/);
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "refunded" });
    const [payment] = await testDb().select().from(feePayments).where(eq(feePayments.id, paymentId));
    expect(payment?.refundedCents).toBe(2200);
    expect((await getStandInSession(sessionId)).payment_intent).toBe(payment?.paymentIntentId);
    expect((await latestAudit("report.fee_refunded", report.id))?.after).toMatchObject({ feeStatus: "refunded", amountCents: 2200 });

    // Refunded once only.
    await waitForStandInIdle();
    const before = await countAllTables();
    const again = await (await admin()).post(`/api/fees/reports/${report.id}/refund`, { reason: "Second refund attempt." });
    expect(again.status).toBe(409);
    expect(await countAllTables()).toEqual(before);
  });

  test("a refund the service declines leaves the fee paid and can be asked for again", async () => {
    const { report } = await paidReport();
    await controlStandIn({ failRefunds: 1 });
    const first = await (await admin()).post(`/api/fees/reports/${report.id}/refund`, { reason: "Customer asked for a refund." });
    expect(first.status).toBe(200);
    const failedId = (first.body as { refundId: number }).refundId;
    await eventually(async () => {
      const [row] = await testDb().select().from(feeRefunds).where(eq(feeRefunds.id, failedId));
      return row?.status === "failed";
    }, "the failed refund webhook");
    expect(await reportFeeState(report.id)).toMatchObject({ feeStatus: "paid" });

    const second = await (await admin()).post(`/api/fees/reports/${report.id}/refund`, { reason: "Customer asked for a refund." });
    expect(second.status).toBe(200);
    await eventually(async () => (await reportFeeState(report.id)).feeStatus === "refunded", "the second refund");
  });

  test("an owed fee, someone else's program, or a tester cannot refund", async () => {
    const tester = await createTester();
    const owed = await createOwedReport({ testerId: tester.id });
    const { report } = await paidReport();
    await waitForStandInIdle();
    const before = await countAllTables();
    expect((await (await admin()).post(`/api/fees/reports/${owed.id}/refund`, { reason: "Nothing was paid yet." })).status).toBe(409);
    expect((await (await as(demoAccounts.neighbourAdmin)).post(`/api/fees/reports/${report.id}/refund`, { reason: "Not my program." })).status).toBe(404);
    expect((await (await as(tester.email)).post(`/api/fees/reports/${report.id}/refund`, { reason: "Testers cannot." })).status).toBe(403);
    expect(await countAllTables()).toEqual(before);
  });
});

describe("the company statement", () => {
  test("lists the month's fees, payments, refunds and what is outstanding (PDF, checked with pdftotext)", async () => {
    const [company] = await testDb().insert(companies).values({ name: `Ledgerwick Test & Repair ${unique()}`, address: "14 Sluice Gate Row, Quillmere", createdAt: new Date() }).$returningId();
    const companyId = company!.id;
    const manager = await createTester({ companyId, isBillingManager: true, name: "Orla Fenwright" });
    const colleague = await createTester({ companyId, name: "Bram Tillory" });
    const paid = await createOwedReport({ testerId: colleague.id, feeCents: 1500 });
    const owed = await createOwedReport({ testerId: manager.id, feeCents: 1500 });
    const managerClient = await as(manager.email);
    const { url } = (await managerClient.post("/api/fees/checkout", { reportIds: [paid.id] })).body as { url: string };
    expect((await payStandInSession(sessionIdFromUrl(url))).delivery?.status).toBe(200);

    const [program] = await testDb().select({ timezone: programs.timezone }).from(programs).where(eq(programs.id, 1));
    const month = new Intl.DateTimeFormat("en-CA", { timeZone: program!.timezone, year: "numeric", month: "2-digit" }).format(new Date()).slice(0, 7);
    const response = await managerClient.get(`/api/fees/statements/${companyId}?month=${month}`).buffer(true).parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => done(null, Buffer.concat(chunks)));
    });
    expect(response.status).toBe(200);
    expect(response.headers["content-type"]).toBe("application/pdf");
    const dir = mkdtempSync(path.join(tmpdir(), "statement-"));
    const file = path.join(dir, "statement.pdf");
    writeFileSync(file, response.body as Buffer);
    if (process.env.SCREENSHOT_DIR) writeFileSync(path.join(process.env.SCREENSHOT_DIR, "fees-statement.pdf"), response.body as Buffer);
    // -raw keeps each text run whole (layout mode's spacing guesses can split "$15.00").
    const text = execFileSync("pdftotext", ["-raw", file, "-"], { encoding: "utf8" });
    expect(text).toContain("Filing fee statement");
    expect(text).toContain("Ledgerwick Test & Repair");
    expect(text).toContain("Quillmere Valley Water District");
    expect(text).toContain(paid.reportNumber);
    expect(text).toContain(owed.reportNumber);
    expect(text).toContain("Bram Tillory");
    expect(text).toMatch(/Filing fees charged in \w+ \d{4} \$30\.00/);
    expect(text).toMatch(/Payments received in \w+ \d{4} \$15\.00/);
    // Bold text: after other PDFs were rendered in the same server process, react-pdf's bold subset
    // sometimes maps "." to nothing in the text layer (the page itself shows "$15.00").
    expect(text).toMatch(/Outstanding now \(all months\) \$15[.\s]00/);
    expect(text).toMatch(new RegExp(`${paid.reportNumber}[\\s\\S]{0,200}?Bram Tillory paid \\$15\\.00`));
    if (process.env.SCREENSHOT_DIR) execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", file, path.join(process.env.SCREENSHOT_DIR, "fees-statement")]);

    // The program admin sees it too; a colleague without the role and another company do not.
    expect((await (await admin()).get(`/api/fees/statements/${companyId}?month=${month}`)).status).toBe(200);
    expect((await (await as(colleague.email)).get(`/api/fees/statements/${companyId}?month=${month}`)).status).toBe(404);
    expect((await (await as(demoAccounts.tester)).get(`/api/fees/statements/${companyId}?month=${month}`)).status).toBe(404);
    expect((await managerClient.get(`/api/fees/statements/${companyId}?month=2026-13`)).status).toBe(422);
    expect((await (await as(colleague.email)).get("/tester/fees/statement")).status).toBe(403);
    expect((await managerClient.get(`/tester/fees/statement?month=${month}`)).text).toContain("Outstanding now");
  });
});
