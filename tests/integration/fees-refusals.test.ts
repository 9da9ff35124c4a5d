// A checkout request names reports and nothing else: a sent amount, someone else's report, a
// report already paid or waived, or reports of two programs are refused with a clear 4xx,
// recorded in the audit log, and nothing else is written.
import { and, desc, eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { auditLog } from "@/db/schema";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { createOwedReport, createTester, reportFeeState } from "../helpers/fees-factory";
import { as } from "../helpers/http";
import { payStandInSession, sessionIdFromUrl, waitForStandInIdle } from "../helpers/payments";

afterAll(closeTestDb);

async function lastRefusal(actorId: number) {
  const [row] = await testDb()
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.action, "fee.checkout_refused"), eq(auditLog.actorId, actorId)))
    .orderBy(desc(auditLog.id))
    .limit(1);
  return row;
}

/** Runs a refused request and proves that only its audit entry was written. */
async function expectRefused(email: string, body: unknown, status: number, message: RegExp) {
  await waitForStandInIdle();
  const client = await as(email);
  const before = await countAllTables();
  const response = await client.post("/api/fees/checkout", body);
  expect(response.status, response.text).toBe(status);
  expect((response.body as { error: string }).error).toMatch(message);
  const after = await countAllTables();
  expect(after.audit_log).toBe((before.audit_log ?? 0) + 1);
  expect({ ...after, audit_log: 0 }).toEqual({ ...before, audit_log: 0 });
  return response;
}

describe("refused checkouts", () => {
  test("an amount sent with the request is refused (the server computes it)", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id, feeCents: 1500 });
    await expectRefused(tester.email, { reportIds: [report.id], amountCents: 1 }, 422, /amount is computed/);
    const audit = await lastRefusal(tester.id);
    expect(audit?.after).toMatchObject({ extraKeys: ["amountCents"] });
    await expectRefused(tester.email, { reportIds: [report.id], currency: "EUR", unit_amount: 100 }, 422, /Not accepted: currency, unit_amount/);
    expect(await reportFeeState(report.id)).toMatchObject({ feeStatus: "owed", feeCents: 1500 });
  });

  test("someone else's report, or one that does not exist, is refused as not found", async () => {
    const owner = await createTester();
    const intruder = await createTester();
    const report = await createOwedReport({ testerId: owner.id });
    const mine = await createOwedReport({ testerId: intruder.id });
    const response = await expectRefused(intruder.email, { reportIds: [mine.id, report.id] }, 404, new RegExp(`#${report.id} is not among the fees you can pay`));
    // The other tester's report number is not revealed.
    expect(response.text).not.toContain(report.reportNumber);
    expect((await lastRefusal(intruder.id))?.programId).toBe(1);
    await expectRefused(intruder.email, { reportIds: [999_999_999] }, 404, /not among the fees you can pay/);
    expect(await reportFeeState(report.id)).toMatchObject({ feeStatus: "owed" });
    expect(await reportFeeState(mine.id)).toMatchObject({ feeStatus: "owed" });
  });

  test("a report whose fee is already paid cannot be paid again", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const client = await as(tester.email);
    const { url } = (await client.post("/api/fees/checkout", { reportIds: [report.id] })).body as { url: string };
    expect((await payStandInSession(sessionIdFromUrl(url))).delivery?.status).toBe(200);
    expect(await reportFeeState(report.id)).toMatchObject({ feeStatus: "paid" });
    await expectRefused(tester.email, { reportIds: [report.id] }, 409, /is already paid.*Nothing was charged/);
  });

  test.each([
    { feeStatus: "waived" as const, message: /was waived/ },
    { feeStatus: "none" as const, message: /has no fee/ },
  ])("a report whose fee is $feeStatus is refused", async ({ feeStatus, message }) => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id, feeStatus, status: "queued" });
    await expectRefused(tester.email, { reportIds: [report.id] }, 409, message);
  });

  test("reports of two programs go in two checkouts", async () => {
    const tester = await createTester();
    const here = await createOwedReport({ testerId: tester.id, programId: 1 });
    const there = await createOwedReport({ testerId: tester.id, programId: 2, feeCents: 900 });
    await expectRefused(tester.email, { reportIds: [here.id, there.id] }, 422, /one program's fees/);
  });

  test.each([
    { label: "no reports", body: { reportIds: [] }, message: /at least one report/ },
    { label: "not a list", body: { reportIds: "12" }, message: /Choose the reports/ },
    { label: "a fractional id", body: { reportIds: [1.5] }, message: /reportIds/ },
    { label: "too many reports", body: { reportIds: Array.from({ length: 51 }, (_, i) => i + 1) }, message: /at most 50/ },
  ])("a malformed request ($label) is refused before anything is looked up", async ({ body, message }) => {
    const tester = await createTester();
    const client = await as(tester.email);
    const before = await countAllTables();
    const response = await client.post("/api/fees/checkout", body);
    expect(response.status).toBe(422);
    expect(response.text).toMatch(message);
    expect(await countAllTables()).toEqual(before);
  });

  test("only testers open checkouts", async () => {
    const tester = await createTester();
    const report = await createOwedReport({ testerId: tester.id });
    const response = await (await as("admin@quillmere-water.example")).post("/api/fees/checkout", { reportIds: [report.id] });
    expect(response.status).toBe(403);
  });
});
