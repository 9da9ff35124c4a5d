// The review queue and decisions over HTTP: filters and keyset pages, accept (certificate,
// review, audit, facts, e-mail) and return (reasons; the report stops counting), the second
// inspector told who decided first, two decisions at once, "accept all clean passes" taking
// exactly the confirmed list, and refused input that writes nothing.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { assemblies, auditLog, certificates, returnReasons, reviews, testReports } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { addDays } from "@/lib/rules";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { as } from "../helpers/http";
import { waitForMessage } from "../helpers/mail";
import { createAssembly, createReport, createScratchProgram, createSite, createTester, failingRp, passingRp, today, type ScratchProgram, type TesterFixture } from "./inspector-fixtures";

afterAll(closeTestDb);

let world: ScratchProgram;
let tester: TesterFixture;
let siteId: number;

beforeAll(async () => {
  world = await createScratchProgram();
  tester = await createTester({ programIds: [world.programId] });
  siteId = (await createSite(world.programId)).id;
});

async function newAssembly() {
  return (await createAssembly(world.programId, siteId)).id;
}

describe("the review queue", () => {
  test("lists waiting reports oldest first with their findings, filters them, and pages by cursor", async () => {
    const inspector = await as(world.inspectorEmail);
    const base = Date.now() - 10 * 86_400_000;
    const ids: number[] = [];
    for (let i = 0; i < 7; i++) {
      const { id } = await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester, submittedAt: new Date(base + i * 60_000), initial: i === 3 ? failingRp : passingRp, validity: i === 5 ? [{ code: "kit_verification_expired", severity: "warning", message: "The kit had last been verified more than 12 months before the test." }] : [], signals: i === 6 ? [{ code: "same_as_previous_test", message: "The readings are identical to the previous test." }] : [] });
      ids.push(id);
    }
    const first = await inspector.get("/api/inspector/queue?limit=5");
    expect(first.status).toBe(200);
    expect(first.body.total).toBeGreaterThanOrEqual(7);
    const mine = first.body.rows.filter((r: { id: number }) => ids.includes(r.id)).map((r: { id: number }) => r.id);
    expect(mine).toEqual(ids.slice(0, 5));
    expect(first.body.nextCursor).toBeTruthy();
    const second = await inspector.get(`/api/inspector/queue?limit=5&cursor=${first.body.nextCursor}`);
    expect(second.body.rows.map((r: { id: number }) => r.id)).toEqual(expect.arrayContaining(ids.slice(5)));

    const failing = await inspector.get("/api/inspector/queue?grade=fail");
    expect(failing.body.rows.map((r: { id: number }) => r.id)).toContain(ids[3]);
    expect(failing.body.rows.every((r: { finalOutcome: string }) => r.finalOutcome === "fail")).toBe(true);

    const credentials = await inspector.get("/api/inspector/queue?flags=credentials");
    const kitRow = credentials.body.rows.find((r: { id: number }) => r.id === ids[5]);
    expect(kitRow.kit.isValid).toBe(false);
    expect(kitRow.certification.isValid).toBe(true);

    const signals = await inspector.get(`/api/inspector/queue?flags=signals&testerId=${tester.id}`);
    expect(signals.body.rows.map((r: { id: number }) => r.id)).toEqual([ids[6]]);
    expect(signals.body.rows[0].signals[0].code).toBe("same_as_previous_test");
    expect(signals.body.matching).toBe(1);

    const newest = await inspector.get(`/api/inspector/queue?sort=newest&testerId=${tester.id}&limit=5`);
    expect(newest.body.rows[0].id).toBe(Math.max(...newest.body.rows.map((r: { id: number }) => r.id)));
  });

  test("the same filter with other values answers with those values: by tester, by age, and by test date page after page", async () => {
    const inspector = await as(world.inspectorEmail);
    const [first, second] = [await createTester({ programIds: [world.programId] }), await createTester({ programIds: [world.programId] })];
    const now = Date.now();
    const old = (await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester: first, submittedAt: new Date(now - 30 * 86_400_000), testedOn: addDays(today(), -31) })).id;
    const recent = (await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester: first, submittedAt: new Date(now - 2 * 86_400_000), testedOn: addDays(today(), -3) })).id;
    const other = (await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester: second, testedOn: addDays(today(), -1) })).id;

    const ids = async (path: string) => ((await inspector.get(path)).body.rows as { id: number }[]).map((r) => r.id);
    expect(await ids(`/api/inspector/queue?testerId=${first.id}`)).toEqual([old, recent]);
    expect(await ids(`/api/inspector/queue?testerId=${second.id}`)).toEqual([other]);
    expect(await ids(`/api/inspector/queue?testerId=${first.id}&age=20`)).toEqual([old]);
    expect(await ids(`/api/inspector/queue?testerId=${first.id}&age=1`)).toEqual([old, recent]);
    const counted = await inspector.get(`/api/inspector/queue?testerId=${second.id}&age=20`);
    expect(counted.body.rows).toEqual([]);
    expect(counted.body.matching).toBe(0);

    // Paging by test date, newest first, five rows a page: the cursor carries a date.
    const pages: number[] = [];
    let cursor = "";
    for (let i = 0; i < 50; i++) {
      const page = await inspector.get(`/api/inspector/queue?sort=tested_newest&limit=5${cursor}`);
      pages.push(...page.body.rows.map((r: { id: number }) => r.id));
      if (!page.body.nextCursor) break;
      cursor = `&cursor=${page.body.nextCursor}`;
    }
    const mine = pages.filter((id) => [old, recent, other].includes(id));
    expect(mine).toEqual([other, recent, old]);
    expect(new Set(pages).size).toBe(pages.length);
  });

  test("an unreadable cursor and an unknown filter value are answered clearly", async () => {
    const inspector = await as(world.inspectorEmail);
    const bad = await inspector.get("/api/inspector/queue?cursor=not-a-cursor");
    expect(bad.status).toBe(422);
    expect(bad.body.error).toMatch(/out of date/);
    const ignored = await inspector.get("/api/inspector/queue?kind=XX&grade=maybe");
    expect(ignored.status).toBe(200);
  });

  test("the queue page renders for the inspector", async () => {
    const inspector = await as(world.inspectorEmail);
    const page = await inspector.get("/inspector/reports?flags=clean");
    expect(page.status).toBe(200);
    expect(page.text).toContain("Review queue");
  });
});

describe("deciding a report", () => {
  test("accepting a pass issues the certificate, records the review and the audit entry, moves the due date and e-mails the tester", async () => {
    const assemblyId = await newAssembly();
    const testedOn = addDays(today(), -3);
    const { id, reportNumber } = await createReport({ programId: world.programId, assemblyId, tester, testedOn });
    const inspector = await as(world.inspectorEmail);
    const response = await inspector.post(`/api/inspector/reports/${id}/decision`, { decision: "accept", note: "Thank you." });
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ status: "accepted", reportNumber });
    expect(response.body.certificateCode).toMatch(/^[A-Z0-9]{12}$/);

    const db = testDb();
    const [report] = await db.select().from(testReports).where(eq(testReports.id, id));
    expect(report!.status).toBe("accepted");
    expect(report!.decidedAt).toBeTruthy();
    expect(await db.select().from(reviews).where(eq(reviews.reportId, id))).toHaveLength(1);
    expect(await db.select().from(certificates).where(eq(certificates.reportId, id))).toHaveLength(1);
    const [entry] = await db.select().from(auditLog).where(and(eq(auditLog.entityType, "test_report"), eq(auditLog.entityId, String(id))));
    expect(entry!.action).toBe("report.accepted");
    const [assembly] = await db.select().from(assemblies).where(eq(assemblies.id, assemblyId));
    expect(assembly!.lastPassedOn).toBe(testedOn);
    expect(assembly!.nextDueOn! > today()).toBe(true);

    const mail = await waitForMessage(tester.email, (m) => m.subject.includes(reportNumber));
    expect(mail.subject).toMatch(/accepted report/);
    expect(mail.text).toContain(reportNumber);
    expect(mail.text).toContain("Thank you.");
    expect(mail.reply_to![0]).toMatch(/^backflow@wren/);
    expect(mail.from).toContain(world.name);
  });

  test("accepting a failed test records it without a certificate", async () => {
    const { id } = await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester, initial: failingRp });
    const inspector = await as(world.inspectorEmail);
    const response = await inspector.post(`/api/inspector/reports/${id}/decision`, { decision: "accept" });
    expect(response.status).toBe(200);
    expect(response.body.certificateCode).toBeNull();
    expect(await testDb().select().from(certificates).where(eq(certificates.reportId, id))).toHaveLength(0);
  });

  test("returning with reasons sends them to the tester, and the returned test stops counting", async () => {
    const assemblyId = await newAssembly();
    const { id, reportNumber } = await createReport({ programId: world.programId, assemblyId, tester });
    const db = testDb();
    const [reason] = await db.select().from(returnReasons).where(eq(returnReasons.programId, world.programId)).limit(1);
    const inspector = await as(world.inspectorEmail);
    const response = await inspector.post(`/api/inspector/reports/${id}/decision`, { decision: "return", reasonIds: [reason!.id], customReason: "The serial does not match the data plate." });
    expect(response.status).toBe(200);
    expect(response.body.status).toBe("returned");
    const [review] = await db.select().from(reviews).where(eq(reviews.reportId, id));
    expect(review!.reasons).toEqual([reason!.label, "The serial does not match the data plate."]);
    const [assembly] = await db.select().from(assemblies).where(eq(assemblies.id, assemblyId));
    expect(assembly!.lastTestedOn).toBeNull();
    const mail = await waitForMessage(tester.email, (m) => m.subject.includes(reportNumber));
    expect(mail.subject).toMatch(/returned report/);
    expect(mail.text).toContain(reason!.label);
    expect(mail.text).toContain("The serial does not match the data plate.");
  });

  test("returning without a reason is refused and writes nothing", async () => {
    const { id } = await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester });
    const inspector = await as(world.inspectorEmail);
    const before = await countAllTables();
    const response = await inspector.post(`/api/inspector/reports/${id}/decision`, { decision: "return", reasonIds: [], customReason: "  " });
    expect(response.status).toBe(422);
    expect(response.body.fieldErrors.reasonIds[0]).toMatch(/at least one reason/);
    const unknownReason = await inspector.post(`/api/inspector/reports/${id}/decision`, { decision: "return", reasonIds: [99999999] });
    expect(unknownReason.status).toBe(422);
    expect(await countAllTables()).toEqual(before);
  });

  test("the second inspector is told who decided first, and nothing changes", async () => {
    const { id, reportNumber } = await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester });
    const first = await as(world.inspectorEmail);
    const second = await as(world.inspector2Email);
    expect((await first.post(`/api/inspector/reports/${id}/decision`, { decision: "accept" })).status).toBe(200);
    const before = await countAllTables();
    const late = await second.post(`/api/inspector/reports/${id}/decision`, { decision: "return", customReason: "Too late" });
    expect(late.status).toBe(409);
    expect(late.body.code).toBe("already_decided");
    expect(late.body.error).toContain(`Report ${reportNumber} was already accepted by Odile Brackwater`);
    expect(late.body.error).toMatch(/on \d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2}/);
    expect(await countAllTables()).toEqual(before);
  });

  test("two decisions at the same moment: one wins, the other is told", async () => {
    for (let round = 0; round < 3; round++) {
      const { id } = await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester });
      const [a, b] = await Promise.all([as(world.inspectorEmail), as(world.inspector2Email)]);
      const answers = await Promise.all([a.post(`/api/inspector/reports/${id}/decision`, { decision: "accept" }), b.post(`/api/inspector/reports/${id}/decision`, { decision: "return", customReason: "Readings look copied" })]);
      expect(answers.map((r) => r.status).sort()).toEqual([200, 409]);
      expect(answers.find((r) => r.status === 409)!.body.error).toMatch(/already (accepted|returned) by/);
      const db = testDb();
      expect(await db.select().from(reviews).where(eq(reviews.reportId, id))).toHaveLength(1);
      const entries = await db.select().from(auditLog).where(and(eq(auditLog.entityType, "test_report"), eq(auditLog.entityId, String(id))));
      expect(entries).toHaveLength(1);
      const winner = answers.find((r) => r.status === 200)!.body.status as string;
      expect(await db.select().from(certificates).where(eq(certificates.reportId, id))).toHaveLength(winner === "accepted" ? 1 : 0);
    }
  });

  test("a report of another program is not found, and testers and owners may not decide", async () => {
    const { id } = await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester });
    const before = await countAllTables();
    const neighbour = await as(demoAccounts.inspector);
    const notFound = await neighbour.post(`/api/inspector/reports/${id}/decision`, { decision: "accept" });
    expect(notFound.status).toBe(404);
    const page = await neighbour.get(`/inspector/reports/${id}`);
    expect(page.status).toBe(404);
    for (const email of [demoAccounts.tester, demoAccounts.owner]) {
      const other = await as(email);
      expect((await other.post(`/api/inspector/reports/${id}/decision`, { decision: "accept" })).status).toBe(403);
      expect((await other.get("/api/inspector/queue")).status).toBe(403);
    }
    expect(await countAllTables()).toEqual(before);
  });

  test("the review page shows the whole report beside the assembly's history", async () => {
    const assemblyId = await newAssembly();
    await createReport({ programId: world.programId, assemblyId, tester, testedOn: addDays(today(), -400), status: "accepted" });
    const { id, reportNumber } = await createReport({ programId: world.programId, assemblyId, tester });
    const inspector = await as(world.inspectorEmail);
    const page = await inspector.get(`/inspector/reports/${id}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain(reportNumber);
    expect(page.text).toContain("Relief valve opening point");
    expect(page.text).toContain("History of this assembly");
    expect(page.text).toContain("Return for correction");
  });
});

describe("accept all clean passes", () => {
  test("counts the clean passes of a filter and accepts exactly those, each with its own review and certificate", async () => {
    const batchTester = await createTester({ programIds: [world.programId] });
    const clean: number[] = [];
    for (let i = 0; i < 4; i++) clean.push((await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester: batchTester })).id);
    const flagged = (await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester: batchTester, signals: [{ code: "many_tests_in_short_time", message: "Six tests in an hour." }] })).id;
    const failed = (await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester: batchTester, initial: failingRp })).id;

    const inspector = await as(world.inspectorEmail);
    const counted = await inspector.get(`/api/inspector/queue/clean-passes?testerId=${batchTester.id}`);
    expect(counted.status).toBe(200);
    expect(counted.body.count).toBe(4);
    expect(counted.body.ids).toEqual(clean);

    // Filed after the count: not in the confirmed list, so not accepted.
    const late = (await createReport({ programId: world.programId, assemblyId: await newAssembly(), tester: batchTester })).id;
    // Decided by someone else meanwhile: skipped and said so.
    const other = await as(world.inspector2Email);
    expect((await other.post(`/api/inspector/reports/${clean[0]}/decision`, { decision: "accept" })).status).toBe(200);

    const result = await inspector.post("/api/inspector/reports/accept-clean", { ids: [...counted.body.ids, flagged, failed] });
    expect(result.status).toBe(200);
    expect(result.body.accepted.map((r: { id: number }) => r.id)).toEqual(clean.slice(1));
    const skipped = new Map(result.body.skipped.map((s: { id: number; reason: string }) => [s.id, s.reason]));
    expect(skipped.get(clean[0])).toMatch(/already accepted by Lucan Hebbleworth/);
    expect(skipped.get(flagged)).toMatch(/not a clean pass/);
    expect(skipped.get(failed)).toMatch(/not a clean pass/);

    const db = testDb();
    for (const id of clean) {
      expect(await db.select().from(reviews).where(eq(reviews.reportId, id))).toHaveLength(1);
      expect(await db.select().from(certificates).where(eq(certificates.reportId, id))).toHaveLength(1);
    }
    const [stillWaiting] = await db.select({ status: testReports.status }).from(testReports).where(eq(testReports.id, late));
    expect(stillWaiting!.status).toBe("queued");
    for (const id of [flagged, failed]) expect((await db.select({ s: testReports.status }).from(testReports).where(eq(testReports.id, id)))[0]!.s).toBe("queued");
    const batchEntries = await db.select().from(auditLog).where(and(eq(auditLog.programId, world.programId), eq(auditLog.action, "report.accepted")));
    expect(batchEntries.filter((e) => clean.slice(1).map(String).includes(e.entityId))).toHaveLength(3);
    // One message to the tester for the batch, listing every report it accepted.
    const mail = await waitForMessage(batchTester.email, (m) => m.subject.includes("accepted 3 of your reports"));
    expect(mail.text).toBeTruthy();
  });

  test("a batch larger than 200 or empty is refused before anything is done", async () => {
    const inspector = await as(world.inspectorEmail);
    const before = await countAllTables();
    expect((await inspector.post("/api/inspector/reports/accept-clean", { ids: Array.from({ length: 201 }, (_, i) => i + 1) })).status).toBe(422);
    expect((await inspector.post("/api/inspector/reports/accept-clean", { ids: [] })).status).toBe(422);
    expect(await countAllTables()).toEqual(before);
  });
});
