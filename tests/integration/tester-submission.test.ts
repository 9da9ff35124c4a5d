// Filing a field-test report: the server grades it again with lib/rules, numbers it, keeps
// snapshots and recomputes the assembly's facts in one transaction; a retry files nothing
// new; every bad input is refused with a field message and writes nothing.
import { execFileSync } from "node:child_process";
import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { assemblies, auditLog, programSettings, reportDrafts, reportNumberSequences, reportReadings, reportRepairs, reviews, testKits, testReports } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { addDays, addMonths } from "@/lib/rules";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { api, APP_URL, as } from "../helpers/http";
import { createAssembly, createProgram, createTester, rpSubmission, today } from "./tester-fixtures";

afterAll(closeTestDb);

const failingRelief = { reliefValveOpeningPoint: 1.6, check1Differential: 6.1, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };
const passingRetest = { reliefValveOpeningPoint: 2.6, check1Differential: 6.0, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };
const diaphragm = [{ component: "relief_valve", part: "diaphragm", action: "replaced", note: "" }];

/** A PDF with its text (pdftotext), fetched with the session's cookie. */
async function downloadPdf(cookie: string, path: string): Promise<{ status: number; contentType: string | null; text: string }> {
  const response = await fetch(new URL(path, APP_URL), { headers: { cookie } });
  const bytes = Buffer.from(await response.arrayBuffer());
  const text = response.ok ? execFileSync("pdftotext", ["-layout", "-", "-"], { input: bytes }).toString("utf8") : "";
  return { status: response.status, contentType: response.headers.get("content-type"), text };
}

async function expectRefusedWithNothingWritten(email: string, body: unknown, status: number, field?: string) {
  const session = await as(email);
  const before = await countAllTables();
  const response = await session.post("/api/reports", body);
  expect(response.status, JSON.stringify(response.body)).toBe(status);
  if (field) expect(Object.keys(response.body.fieldErrors ?? {})).toContain(field);
  expect(typeof response.body.error).toBe("string");
  expect(await countAllTables()).toEqual(before);
  return response;
}

describe("filing an RP that fails, is repaired and passes the retest", () => {
  test("the report is graded, numbered, stored with its readings, repairs and snapshots, and the assembly's facts follow", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const draftKey = "d".repeat(8) + Math.random().toString(16).slice(2, 14).padEnd(12, "0");
    // A draft saved while typing is removed by the submission, in the same transaction.
    const saved = await session.put(`/api/reports/drafts/${draftKey}`, { clientRevision: 3, data: draftData(assembly.id) });
    expect(saved.status).toBe(200);
    const body = rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, initial: failingRelief, retest: passingRetest, repairs: diaphragm, draftKey });
    const response = await session.post("/api/reports", body);
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const fee = await programFeeCents(1);
    expect(response.body).toMatchObject({ revision: 1, status: fee > 0 ? "awaiting_fee" : "queued", finalOutcome: "pass", isReplay: false });
    expect(response.body.reportNumber).toMatch(new RegExp(`^QV-${today().slice(0, 4)}-\\d{6}$`));

    const db = testDb();
    const [report] = await db.select().from(testReports).where(eq(testReports.id, response.body.id));
    expect(report).toMatchObject({ testerId: tester.id, assemblyId: assembly.id, kitId: tester.kitId, initialOutcome: "fail", finalOutcome: "pass", wasRepaired: true, feeStatus: fee > 0 ? "owed" : "none", feeCents: fee, unit: "psid", ruleSetEdition: "published-current", attestedName: tester.name });
    expect(report!.verificationCode).toMatch(/^[A-Z2-9]{16}$/);
    expect(report!.fingerprint).toBe("v1|rp|2.6|6.0|T|T|-|T");
    // The server's own grade: the relief valve below 2.0 psid failed (EPA 816-R-03-002, 2003, Fig. 39).
    const grade = report!.grade as { outcome: string; passedAfterRepair: boolean; initial: { o: string; f: unknown[][] } };
    expect(grade.outcome).toBe("pass");
    expect(grade.passedAfterRepair).toBe(true);
    expect(grade.initial.o).toBe("fail");
    expect(grade.initial.f.find((f) => f[0] === "rp.relief.min")?.[1]).toBe(0);
    expect(report!.assemblySnapshot).toMatchObject({ kind: "RP", serial: assembly.serial, make: "Tallowmere" });
    expect(report!.testerSnapshot).toMatchObject({ name: tester.name, certificationNumber: expect.stringMatching(/^BT-/) });
    expect(report!.kitSnapshot).toMatchObject({ make: "Gaugewright", model: "DG-5" });

    const readings = await db.select().from(reportReadings).where(eq(reportReadings.reportId, report!.id));
    expect(readings.map((r) => [r.phase, r.outcome, r.reliefOpening]).sort()).toEqual([
      ["initial", "fail", 1.6],
      ["retest", "pass", 2.6],
    ]);
    const repairs = await db.select().from(reportRepairs).where(eq(reportRepairs.reportId, report!.id));
    expect(repairs).toEqual([expect.objectContaining({ component: "relief_valve", part: "diaphragm", action: "replaced" })]);
    const [facts] = await db.select().from(assemblies).where(eq(assemblies.id, assembly.id));
    expect(facts).toMatchObject({ lastTestedOn: today(), lastOutcome: "pass", lastPassedOn: today(), baseState: "active", nextDueOn: addMonths(today(), 12) });
    const audit = await db.select().from(auditLog).where(and(eq(auditLog.entityType, "test_report"), eq(auditLog.entityId, String(report!.id))));
    expect(audit.map((a) => a.action)).toContain("report.submitted");
    expect(await db.select().from(reportDrafts).where(and(eq(reportDrafts.testerId, tester.id), eq(reportDrafts.clientKey, draftKey)))).toEqual([]);

    // The PDF holds every reading with its minimum, the repair, the retest and the grade.
    const pdf = await downloadPdf(session.cookie, `/api/reports/${report!.id}/pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.contentType).toBe("application/pdf");
    const text = pdf.text;
    expect(text).toContain(report!.reportNumber);
    expect(text).toContain("Result: Passed after repair");
    expect(text).toMatch(/Relief valve opening point\s+1\.6 psid\s+at least 2\.0 psid/);
    expect(text).toMatch(/Relief valve opening point\s+2\.6 psid/);
    expect(text).toContain("Diaphragm");
    expect(text).toContain(report!.verificationCode);
    expect(text).toContain(tester.name);
  });

  test("a retried submission (same key) answers with the same report and writes nothing new", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const body = rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name });
    const first = await session.post("/api/reports", body);
    expect(first.status).toBe(201);
    const before = await countAllTables();
    const again = await session.post("/api/reports", body);
    expect(again.status).toBe(200);
    expect(again.body).toMatchObject({ id: first.body.id, reportNumber: first.body.reportNumber, isReplay: true });
    expect(await countAllTables()).toEqual(before);
  });

  test("a double tap (two requests at once with one key) files one report", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const body = rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name });
    const [a, b] = await Promise.all([session.post("/api/reports", body), session.post("/api/reports", body)]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    expect(a.body.id).toBe(b.body.id);
    const rows = await testDb().select({ id: testReports.id }).from(testReports).where(eq(testReports.testerId, tester.id));
    expect(rows).toHaveLength(1);
  });

  test("reports filed at the same moment get different, consecutive numbers", async () => {
    const tester = await createTester();
    const session = await as(tester.email);
    const items = await Promise.all([1, 2, 3, 4].map(() => createAssembly({ kind: "RP" })));
    const responses = await Promise.all(items.map((assembly, i) => session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedTime: `0${i + 6}:15` }))));
    expect(responses.map((r) => r.status)).toEqual([201, 201, 201, 201]);
    const numbers = responses.map((r) => Number(String(r.body.reportNumber).slice(-6))).sort((x, y) => x - y);
    expect(numbers).toEqual([0, 1, 2, 3].map((i) => numbers[0]! + i));
  });

  test("a year with no number row yet starts above the numbers already used in it", async () => {
    const tester = await createTester();
    const session = await as(tester.email);
    const [one, two] = [await createAssembly({ kind: "RP" }), await createAssembly({ kind: "RP" })];
    const first = await session.post("/api/reports", rpSubmission({ assemblyId: one.id, kitId: tester.kitId, testerName: tester.name, testedTime: "08:05" }));
    expect(first.status).toBe(201);
    const year = Number(today().slice(0, 4));
    const db = testDb();
    // As after loading history from before numbering rows existed: the numbers are in use, the row is not there.
    await db.delete(reportNumberSequences).where(and(eq(reportNumberSequences.programId, 1), eq(reportNumberSequences.year, year)));
    const second = await session.post("/api/reports", rpSubmission({ assemblyId: two.id, kitId: tester.kitId, testerName: tester.name, testedTime: "09:05" }));
    expect(second.status).toBe(201);
    const numberOf = (reportNumber: string) => Number(reportNumber.slice(-6));
    expect(numberOf(second.body.reportNumber)).toBeGreaterThan(numberOf(first.body.reportNumber));
    const [row] = await db.select().from(reportNumberSequences).where(and(eq(reportNumberSequences.programId, 1), eq(reportNumberSequences.year, year)));
    expect(row!.lastNumber).toBeGreaterThanOrEqual(numberOf(second.body.reportNumber));
  });

  test("a failed assembly not repaired on the spot is filed as failed and its repair deadline starts", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const response = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, initial: failingRelief }));
    expect(response.status).toBe(201);
    expect(response.body.finalOutcome).toBe("fail");
    const [facts] = await testDb().select().from(assemblies).where(eq(assemblies.id, assembly.id));
    // High hazard: 14 days (the program's default repair deadline).
    expect(facts).toMatchObject({ baseState: "failed", lastOutcome: "fail", repairDueOn: addDays(today(), 14) });
  });
});

/** The program's filing fee: a fee makes a new report "awaiting_fee" instead of "queued". */
async function programFeeCents(programId: number): Promise<number> {
  const [row] = await testDb().select({ fee: programSettings.filingFeeCents }).from(programSettings).where(eq(programSettings.programId, programId));
  return row?.fee ?? 0;
}

function draftData(assemblyId: number) {
  return {
    v: 1,
    assemblyId,
    kind: "RP",
    unit: "psid",
    correctsReportId: null,
    amendsReportId: null,
    kitId: null,
    testedOn: today(),
    testedTime: "09:30",
    reason: "annual",
    reasonNote: "",
    installation: "existing",
    previousSerial: "",
    orientationApproved: null,
    reliefPortAirGapOk: null,
    linePressure: "",
    initial: { text: { reliefValveOpeningPoint: "1.6" }, flags: {}, didNotOpen: {} },
    repairChoice: null,
    repairs: [],
    retest: { text: {}, flags: {}, didNotOpen: {} },
    remarks: "",
    attestationName: "",
    attestationConfirmed: false,
  };
}

describe("the other kinds and units", () => {
  test("a kPa program grades kPa readings after an exact conversion", async () => {
    const tester = await createTester({ programIds: [2] });
    const assembly = await createAssembly({ programId: 2, kind: "DC" });
    const session = await as(tester.email);
    // 6.9 kPa ≥ 1.0 psid (6.894757 kPa; NIST SP 811, App. B.8); 6.8 kPa < 1.0 psid.
    const body = rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, unit: "kPa", linePressure: 410, reliefPortAirGapOk: null, initial: { check1Differential: 6.9, check1ClosedTight: true, check2Differential: 6.8, shutoff2Tight: true } });
    const response = await session.post("/api/reports", body);
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body.finalOutcome).toBe("fail");
    expect(response.body.reportNumber).toMatch(/^TR-/);
    const [report] = await testDb().select().from(testReports).where(eq(testReports.id, response.body.id));
    expect(report!.unit).toBe("kPa");
    expect(report!.linePressurePsi).toBeCloseTo(59.5, 1);
    const findings = (report!.grade as { initial: { f: [string, number][] } }).initial.f;
    expect(findings.find((f) => f[0] === "dc.check1.min")?.[1]).toBe(1);
    expect(findings.find((f) => f[0] === "dc.check2.min")?.[1]).toBe(0);
  });

  test("readings sent in psid to a kPa program are refused", async () => {
    const tester = await createTester({ programIds: [2] });
    const assembly = await createAssembly({ programId: 2, kind: "DC" });
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, unit: "psid", initial: { check1Differential: 1.2, check1ClosedTight: true, check2Differential: 1.4, shutoff2Tight: true } }), 422, "unit");
  });

  test("a program with a filing fee files the report as owing it", async () => {
    const program = await createProgram({ feeCents: 1500 });
    const tester = await createTester({ programIds: [program.programId] });
    const assembly = await createAssembly({ programId: program.programId, siteId: program.siteId, kind: "PVB" });
    const session = await as(tester.email);
    const response = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, reliefPortAirGapOk: null, initial: { airInletOpeningPoint: 1.2, airInletFullyOpen: true, checkDifferential: 1.5, checkClosedTight: true } }));
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body.status).toBe("awaiting_fee");
    expect(response.body.reportNumber).toMatch(new RegExp(`^${program.prefix}-\\d{4}-000001$`));
    const [report] = await testDb().select().from(testReports).where(eq(testReports.id, response.body.id));
    expect(report).toMatchObject({ feeCents: 1500, feeStatus: "owed", status: "awaiting_fee", isClean: true });
  });

  test("an air gap is measured in inches and needs no line pressure", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "AG" });
    const session = await as(tester.email);
    const response = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, linePressure: null, reliefPortAirGapOk: null, initial: { supplyPipeDiameterInches: 0.75, airGapInches: 1.5, nearSideWall: false } }));
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body.finalOutcome).toBe("pass");
  });

  test("a test matching the assembly's previous readings to the tenth carries the signal for the inspector", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP", installedOn: addMonths(today(), -40) });
    const session = await as(tester.email);
    const lastYear = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn: addDays(today(), -3) }));
    expect(lastYear.status).toBe(201);
    const copy = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }));
    expect(copy.status).toBe(201);
    const [report] = await testDb().select().from(testReports).where(eq(testReports.id, copy.body.id));
    expect((report!.signals as { code: string }[]).map((s) => s.code)).toContain("same_as_previous_test");
    expect(report!.isClean).toBe(false);
    expect(report!.warningCount).toBeGreaterThan(0);
  });
});

describe("bad input is refused with a message next to the field, and nothing is written", () => {
  test.each([
    { label: "a missing reading", initial: { reliefValveOpeningPoint: 2.5, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true }, field: "initial.check1Differential" },
    { label: "letters in a numeric field", initial: { ...passingRetest, check1Differential: "6.1a" }, field: "initial.check1Differential" },
    { label: "a reading above the gauge's 15 psid range", initial: { ...passingRetest, check1Differential: 16 }, field: "initial.check1Differential" },
    { label: "a negative reading", initial: { ...passingRetest, reliefValveOpeningPoint: -0.5 }, field: "initial.reliefValveOpeningPoint" },
    { label: "two decimal places", initial: { ...passingRetest, check1Differential: 6.15 }, field: "initial.check1Differential" },
    { label: "a field another kind records", initial: { ...passingRetest, airGapInches: 2 }, field: "initial.airGapInches" },
  ])("$label", async ({ initial, field }) => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, initial }), 422, field);
  });

  test("a test date in the future", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const response = await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn: addDays(today(), 2) }), 422, "testedOn");
    expect(response.body.error).toMatch(/after today/);
  });

  test("a test date before the installation", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP", installedOn: addDays(today(), -5) });
    const response = await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn: addDays(today(), -9) }), 422, "testedOn");
    expect(response.body.error).toMatch(/before the assembly was installed/);
  });

  test("an expired certification is refused (an expired certificate may not test: Utah R309-305-8)", async () => {
    const tester = await createTester({ certExpiresOn: addDays(today(), -1) });
    const assembly = await createAssembly({ kind: "RP" });
    const response = await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }), 422, "certification");
    expect(response.body.error).toMatch(/expired/);
  });

  test("a kit verified more than 12 months before the test is refused under the program's 'refuse' policy", async () => {
    // Verified within 12 months: Texas city policy citing state practice [S]; Oregon OAR 333-061-0070(6) [P].
    const tester = await createTester({ kitVerifiedOn: addDays(addMonths(today(), -12), -1) });
    const assembly = await createAssembly({ kind: "RP" });
    const response = await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }), 422, "kitId");
    expect(response.body.error).toMatch(/more than 12 months/);
  });

  test("a kit verified exactly 12 months before the test is still good", async () => {
    const tester = await createTester({ kitVerifiedOn: addMonths(today(), -12) });
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    expect((await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }))).status).toBe(201);
  });

  test("under a 'flag' policy the stale kit is filed with a warning for the inspector", async () => {
    const program = await createProgram({ kitPolicy: "flag" });
    const tester = await createTester({ programIds: [program.programId], kitVerifiedOn: addMonths(today(), -14) });
    const assembly = await createAssembly({ programId: program.programId, siteId: program.siteId, kind: "RP" });
    const session = await as(tester.email);
    const response = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }));
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const [report] = await testDb().select().from(testReports).where(eq(testReports.id, response.body.id));
    expect((report!.validity as { code: string }[]).map((v) => v.code)).toContain("kit_verification_expired");
    expect(report!.isClean).toBe(false);
  });

  test("a kit that failed its accuracy check, a retired kit, and another tester's kit", async () => {
    const tester = await createTester({ kitResult: "failed" });
    const other = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }), 422, "kitId");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: other.kitId, testerName: tester.name }), 422, "kitId");
    await testDb().update(testKits).set({ retiredAt: new Date() }).where(eq(testKits.id, other.kitId));
    await expectRefusedWithNothingWritten(other.email, rpSubmission({ assemblyId: assembly.id, kitId: other.kitId, testerName: other.name }), 422, "kitId");
  });

  test("the attestation must carry the tester's own name and be confirmed", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: "Somebody Else" }), 422, "attestation.name");
    await expectRefusedWithNothingWritten(tester.email, { ...rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }), attestation: { name: tester.name, confirmed: false } }, 422, "attestation.confirmed");
  });

  test("repairs and a retest only after a failed test, and they come together", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, retest: passingRetest, repairs: diaphragm }), 422, "repairs");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, initial: failingRelief, repairs: diaphragm }), 422, "retest");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, initial: failingRelief, retest: passingRetest }), 422, "repairs");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, initial: failingRelief, retest: passingRetest, repairs: [{ component: "air_inlet", part: "spring", action: "replaced" }] }), 422, "repairs.0");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, initial: failingRelief, retest: { ...passingRetest, check1Differential: undefined }, repairs: diaphragm }), 422, "retest.check1Differential");
  });

  test("missing line pressure, a malformed key, an unknown reason", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, linePressure: null }), 422, "linePressure");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, idempotencyKey: "short" }), 422, "idempotencyKey");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, reason: "because" }), 422, "reason");
  });

  test("an assembly in a program that has not approved the tester, and one that does not exist", async () => {
    const pending = await createTester({ approval: "pending" });
    const onlyHere = await createTester({ programIds: [2] });
    const assembly = await createAssembly({ kind: "RP" });
    const refused = await expectRefusedWithNothingWritten(pending.email, rpSubmission({ assemblyId: assembly.id, kitId: pending.kitId, testerName: pending.name }), 403);
    expect(refused.body.error).toMatch(/not approved you yet/);
    await expectRefusedWithNothingWritten(onlyHere.email, rpSubmission({ assemblyId: assembly.id, kitId: onlyHere.kitId, testerName: onlyHere.name }), 404);
    await expectRefusedWithNothingWritten(onlyHere.email, rpSubmission({ assemblyId: 999_999_999, kitId: onlyHere.kitId, testerName: onlyHere.name }), 404);
  });

  test("staff and owners cannot file reports", async () => {
    const before = await countAllTables();
    for (const email of [demoAccounts.inspector, demoAccounts.owner]) {
      const response = await (await as(email)).post("/api/reports", rpSubmission({ assemblyId: 1, kitId: 1, testerName: "x" }));
      expect(response.status).toBe(403);
    }
    expect(await countAllTables()).toEqual(before);
  });
});

describe("correcting a returned report and amending an accepted one", () => {
  async function fileAndDecide(decision: "returned" | "accepted") {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const filed = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn: addDays(today(), -2) }));
    expect(filed.status).toBe(201);
    const db = testDb();
    await db.update(testReports).set({ status: decision, decidedAt: new Date(), decidedBy: 2 }).where(eq(testReports.id, filed.body.id));
    await db.insert(reviews).values({ reportId: filed.body.id, inspectorId: 2, decision, reasons: decision === "returned" ? ["Readings are missing or incomplete"] : [], note: decision === "returned" ? "Line pressure looks wrong." : null, decidedAt: new Date() });
    return { tester, assembly, session, filed: filed.body as { id: number; reportNumber: string } };
  }

  test("a correction keeps the report number as the next revision and supersedes the returned one", async () => {
    const { tester, assembly, session, filed } = await fileAndDecide("returned");
    const page = await session.get(`/tester/reports/${filed.id}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Line pressure looks wrong.");
    const form = await session.get(`/tester/reports/new?corrects=${filed.id}`);
    expect(form.status).toBe(200);
    expect(form.text).toContain("Correct a returned report");
    const body = rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn: addDays(today(), -2), linePressure: 58, correctsReportId: filed.id });
    const response = await session.post("/api/reports", body);
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body).toMatchObject({ reportNumber: filed.reportNumber, revision: 2 });
    const db = testDb();
    const [old] = await db.select().from(testReports).where(eq(testReports.id, filed.id));
    const [fresh] = await db.select().from(testReports).where(eq(testReports.id, response.body.id));
    expect(old!.status).toBe("superseded");
    expect(fresh).toMatchObject({ supersedesId: filed.id, status: (await programFeeCents(1)) > 0 ? "awaiting_fee" : "queued" });
    // The correction repeats the same test: that is not a copied report.
    expect((fresh!.signals as unknown[]).length).toBe(0);
    // A second correction of the same revision is refused.
    const twice = await session.post("/api/reports", { ...body, idempotencyKey: "f".repeat(32) });
    expect(twice.status).toBe(409);
  });

  test("another tester cannot correct the report, nor see it", async () => {
    const { assembly, filed } = await fileAndDecide("returned");
    const stranger = await createTester();
    const session = await as(stranger.email);
    expect((await session.get(`/tester/reports/${filed.id}`)).status).toBe(404);
    expect((await session.get(`/api/reports/${filed.id}/pdf`)).status).toBe(404);
    expect((await session.get(`/tester/reports/new?corrects=${filed.id}`)).status).toBe(404);
    await expectRefusedWithNothingWritten(stranger.email, rpSubmission({ assemblyId: assembly.id, kitId: stranger.kitId, testerName: stranger.name, correctsReportId: filed.id }), 404);
  });

  test("an accepted report is amended by a new report linked to it; a queued one can be neither", async () => {
    const { tester, assembly, session, filed } = await fileAndDecide("accepted");
    const amendment = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn: addDays(today(), -2), amendsReportId: filed.id, remarks: "Serial corrected." }));
    expect(amendment.status, JSON.stringify(amendment.body)).toBe(201);
    expect(amendment.body.reportNumber).not.toBe(filed.reportNumber);
    const [row] = await testDb().select().from(testReports).where(eq(testReports.id, amendment.body.id));
    expect(row).toMatchObject({ amendsId: filed.id, revision: 1 });
    const [original] = await testDb().select().from(testReports).where(eq(testReports.id, filed.id));
    expect(original!.status).toBe("accepted");
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, correctsReportId: filed.id }), 409);
    await expectRefusedWithNothingWritten(tester.email, rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, amendsReportId: amendment.body.id }), 409);
  });
});

describe("who may download a report", () => {
  test("the filing tester and the program's inspector; not another program's staff, nor someone signed out", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const filed = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }));
    expect((await (await as(demoAccounts.inspector)).get(`/api/reports/${filed.body.id}/pdf`)).status).toBe(200);
    expect((await (await as(demoAccounts.neighbourInspector)).get(`/api/reports/${filed.body.id}/pdf`)).status).toBe(404);
    expect((await (await as(demoAccounts.owner)).get(`/api/reports/${filed.body.id}/pdf`)).status).toBe(404);
    expect((await api().get(`/api/reports/${filed.body.id}/pdf`)).status).toBe(401);
    expect((await session.get("/api/reports/not-a-number/pdf")).status).toBe(422);
  });
});
