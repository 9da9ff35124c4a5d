// A report filed through the submission API while the program charges a fee waits for it, keeps
// the fee in force at filing whatever the program changes later, and reaches the review queue
// once paid. (Uses the tester area's fixtures to file the report the way a tester does.)
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { programSettings } from "@/db/schema";
import { closeTestDb, testDb } from "../helpers/db";
import { reportFeeState } from "../helpers/fees-factory";
import { as } from "../helpers/http";
import { getStandInSession, payStandInSession, sessionIdFromUrl } from "../helpers/payments";
import { createAssembly, createProgram, createTester, rpSubmission } from "./tester-fixtures";

afterAll(closeTestDb);

describe("a filed report and its fee", () => {
  test("filed with a $25.00 fee, charged $25.00 after the fee changes, queued once paid", async () => {
    const { programId, siteId } = await createProgram({ feeCents: 2500 });
    const tester = await createTester({ programIds: [programId] });
    const assembly = await createAssembly({ programId, siteId, kind: "RP" });
    const client = await as(tester.email);
    const filed = await client.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }));
    expect(filed.status, JSON.stringify(filed.body)).toBe(201);
    const reportId = (filed.body as { id: number }).id;
    expect(await reportFeeState(reportId)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed", feeCents: 2500 });

    // The program raises its fee: what this report owes does not change.
    await testDb().update(programSettings).set({ filingFeeCents: 4000 }).where(eq(programSettings.programId, programId));
    const fees = await client.get("/tester/fees");
    expect(fees.text).toContain("$25.00");

    const opened = await client.post("/api/fees/checkout", { reportIds: [reportId] });
    expect(opened.status, opened.text).toBe(200);
    const sessionId = sessionIdFromUrl((opened.body as { url: string }).url);
    expect((await getStandInSession(sessionId)).amount_total).toBe(2500);
    expect((await payStandInSession(sessionId)).delivery?.status).toBe(200);
    expect(await reportFeeState(reportId)).toMatchObject({ status: "queued", feeStatus: "paid", feeCents: 2500 });
  });
});
