// The compliance picture and the yearly summary on small data sets made here and counted by
// hand: every state at and around its date boundary, filters, tests per month, the attention
// list, and the state summary's figures in the CSV and in the PDF's text.
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { addDays, type FieldTestInput } from "@/lib/rules";
import { closeTestDb } from "../helpers/db";
import { as } from "../helpers/http";
import { createAssembly, createReport, createScratchProgram, createSite, createTester, failingRp, passingRp, today, type ScratchProgram, type TesterFixture } from "./inspector-fixtures";

afterAll(closeTestDb);

const passingDc: FieldTestInput = { kind: "DC", unit: "psid", check1Differential: 2.1, check1ClosedTight: true, check2Differential: 1.8, check2ClosedTight: true, shutoff2Tight: true };
const passingPvb: FieldTestInput = { kind: "PVB", unit: "psid", airInletOpeningPoint: 1.5, airInletFullyOpen: true, checkDifferential: 1.6, checkClosedTight: true };

describe("the compliance picture", () => {
  let world: ScratchProgram;
  beforeAll(async () => {
    world = await createScratchProgram();
    const site = await createSite(world.programId, { facilityType: "Dairy" });
    const laundry = await createSite(world.programId, { facilityType: "Laundry", hazard: "low" });
    const t = today();
    const make = (overrides: Parameters<typeof createAssembly>[2]) => createAssembly(world.programId, site.id, overrides);
    // By hand (due soon = 30 days, the default): what each assembly is today.
    await make({ baseState: "active", nextDueOn: addDays(t, 31) }); // current (one day past the due-soon horizon)
    await make({ baseState: "active", nextDueOn: addDays(t, 30) }); // due soon (the horizon itself)
    await make({ baseState: "active", nextDueOn: addDays(t, 10) }); // due soon
    await make({ baseState: "active", nextDueOn: t }); // due soon: due today is still on time
    await make({ baseState: "active", nextDueOn: addDays(t, -1), noticeStage: "overdue", noticeCycle: addDays(t, -1) }); // overdue, overdue notice sent
    await make({ baseState: "active", nextDueOn: null, installedOn: null }); // never tested
    await make({ baseState: "failed", nextDueOn: addDays(t, 100), repairDueOn: addDays(t, 5) }); // failed, awaiting repair
    await make({ baseState: "failed", nextDueOn: addDays(t, 100), repairDueOn: t }); // failed, awaiting repair: the deadline is today
    await make({ baseState: "failed", nextDueOn: addDays(t, 100), repairDueOn: addDays(t, -1) }); // past the repair deadline
    await make({ baseState: "inactive", status: "removed", removedOn: addDays(t, -20), nextDueOn: null }); // out of service
    await createAssembly(world.programId, laundry.id, { kind: "DC", hazard: "low", baseState: "active", nextDueOn: addDays(t, -40) }); // overdue, no notice yet
    const tester = await createTester({ programIds: [world.programId] });
    const [assembly] = [await make({})];
    await createReport({ programId: world.programId, assemblyId: assembly.id, tester, testedOn: t, status: "accepted" });
    await createReport({ programId: world.programId, assemblyId: assembly.id, tester, testedOn: t, initial: failingRp, status: "queued" });
    await createReport({ programId: world.programId, assemblyId: assembly.id, tester, testedOn: t, status: "returned" });
    await createReport({ programId: world.programId, assemblyId: assembly.id, tester, testedOn: t, status: "superseded" });
  });

  test("counts every state at its boundaries, for the program and for a filter", async () => {
    const inspector = await as(world.inspectorEmail);
    const all = await inspector.get("/api/inspector/compliance");
    expect(all.status).toBe(200);
    // The extra assembly behind the reports is never tested and installed 36 months ago: overdue.
    expect(all.body.counts).toEqual({ current: 1, due_soon: 3, overdue: 3, failed_awaiting_repair: 2, repair_overdue: 1, never_tested: 1, inactive: 1 });
    expect(all.body.inService).toBe(11);
    expect(all.body.dueSoonUntil).toBe(addDays(today(), 30));
    expect(all.body.overdueByNoticeStage).toEqual({ none: 2, reminder: 0, overdue: 1, final: 0 });

    const dc = await inspector.get("/api/inspector/compliance?kind=DC");
    expect(dc.body.counts).toMatchObject({ overdue: 1, current: 0, due_soon: 0 });
    const laundry = await inspector.get("/api/inspector/compliance?facilityType=Laundry");
    expect(laundry.body.inService).toBe(1);
    const low = await inspector.get("/api/inspector/compliance?hazard=low");
    expect(low.body.counts.overdue).toBe(1);
  });

  test("tests per month: 24 months, this month's filed, passed and failed", async () => {
    const inspector = await as(world.inspectorEmail);
    const { body } = await inspector.get("/api/inspector/compliance");
    expect(body.months).toHaveLength(24);
    const thisMonth = body.months.at(-1);
    expect(thisMonth.month).toBe(today().slice(0, 7));
    // Filed: all but the superseded revision; passed: counted passes (not the returned one); failed: initial fails.
    expect(thisMonth).toEqual({ month: today().slice(0, 7), filed: 3, passed: 1, failed: 1 });
  });

  test("the attention lists, most overdue first, with notice stage and a CSV copy", async () => {
    const inspector = await as(world.inspectorEmail);
    const overdue = await inspector.get("/api/inspector/compliance/list?list=overdue");
    expect(overdue.status).toBe(200);
    expect(overdue.body.rows.map((r: { daysLate: number }) => r.daysLate)).toEqual([...overdue.body.rows.map((r: { daysLate: number }) => r.daysLate)].sort((a, b) => b - a));
    expect(overdue.body.rows.find((r: { kind: string }) => r.kind === "DC")).toMatchObject({ daysLate: 40, noticeStage: null });
    const notified = await inspector.get("/api/inspector/compliance/list?list=overdue&stage=overdue");
    expect(notified.body.rows).toHaveLength(1);
    const repair = await inspector.get("/api/inspector/compliance/list?list=repair_overdue");
    expect(repair.body.rows).toHaveLength(1);
    const csv = await inspector.get("/api/inspector/compliance/list?list=overdue&format=csv");
    expect(csv.headers["content-type"]).toMatch(/text\/csv/);
    expect(csv.text.split("\r\n").filter(Boolean)).toHaveLength(4);
    const page = await inspector.get("/inspector/compliance?list=repair_overdue");
    expect(page.status).toBe(200);
    expect(page.text).toContain("Past the repair deadline");
  });

  test("testers and owners do not see it", async () => {
    for (const email of [demoAccounts.tester, demoAccounts.owner]) {
      const other = await as(email);
      expect((await other.get("/api/inspector/compliance")).status).toBe(403);
      expect((await other.get("/inspector/compliance")).status).toBe(403);
    }
  });
});

describe("the yearly summary for the state agency", () => {
  let world: ScratchProgram;
  let tester: TesterFixture;
  const year = Number(today().slice(0, 4)) - 1;
  const d = (yearOffset: number, monthDay: string) => `${year + yearOffset}-${monthDay}`;

  beforeAll(async () => {
    world = await createScratchProgram();
    tester = await createTester({ programIds: [world.programId] });
    const site = await createSite(world.programId);
    const p = world.programId;
    const report = (assemblyId: number, testedOn: string, initial: FieldTestInput = passingRp, extra: Partial<Parameters<typeof createReport>[0]> = {}) => createReport({ programId: p, assemblyId, tester, testedOn, status: "accepted", initial, ...extra });
    // A1 RP high: passed last year and this year → tested, passed on the first test.
    const a1 = await createAssembly(p, site.id, { kind: "RP", hazard: "high", installedOn: d(-3, "01-10") });
    await report(a1.id, d(-1, "03-01"));
    await report(a1.id, d(0, "03-05"));
    // A2 RP high: failed in April, passed on a later visit → failed and repaired.
    const a2 = await createAssembly(p, site.id, { kind: "RP", hazard: "high", installedOn: d(-5, "02-02") });
    await report(a2.id, d(-1, "02-01"));
    await report(a2.id, d(0, "04-10"), failingRp);
    await report(a2.id, d(0, "04-20"));
    // A3 DC low: last passed in June of the year before → not tested, overdue at year end.
    const a3 = await createAssembly(p, site.id, { kind: "DC", hazard: "low", installedOn: d(-6, "05-05") });
    await report(a3.id, d(-1, "06-01"), passingDc);
    // A4 DC low: installed and tested in July → new installation, tested, passed on the first test.
    const a4 = await createAssembly(p, site.id, { kind: "DC", hazard: "low", installedOn: d(0, "07-15") });
    await report(a4.id, d(0, "07-15"), passingDc);
    // A5 PVB low: removed in September → removed, not in service at year end.
    const a5 = await createAssembly(p, site.id, { kind: "PVB", hazard: "low", installedOn: d(-2, "04-01"), status: "removed", removedOn: d(0, "09-30") });
    await report(a5.id, d(-1, "05-01"), passingPvb);
    // A6 RP high: failed on 20 November, no retest: the 14-day repair deadline passed → failed, overdue.
    const a6 = await createAssembly(p, site.id, { kind: "RP", hazard: "high", installedOn: d(-4, "03-03") });
    await report(a6.id, d(-1, "11-01"));
    await report(a6.id, d(0, "11-20"), failingRp);
    // A7 RP high: failed, repaired and passed on the same report → failed and repaired.
    const a7 = await createAssembly(p, site.id, { kind: "RP", hazard: "high", installedOn: d(-3, "06-06") });
    await report(a7.id, d(0, "05-05"), failingRp, { retest: passingRp });
    // A8 DC low: this year's report was returned (does not count) → not tested, overdue.
    const a8 = await createAssembly(p, site.id, { kind: "DC", hazard: "low", installedOn: d(-2, "01-01") });
    await report(a8.id, d(-1, "08-01"), passingDc);
    await report(a8.id, d(0, "08-08"), passingDc, { status: "returned" });
    // A9: a field registration not yet confirmed → not counted at all.
    const a9 = await createAssembly(p, site.id, { kind: "RP", hazard: "high", status: "awaiting_confirmation", installedOn: d(0, "10-10") });
    await report(a9.id, d(0, "10-10"), passingRp, { status: "queued" });
    // A10 DC low, installation unknown, last pass four years back (before the read window) → overdue.
    const a10 = await createAssembly(p, site.id, { kind: "DC", hazard: "low", installedOn: null });
    await report(a10.id, d(-4, "03-03"), passingDc);
  });

  // Counted by hand from the comments above.
  const expected = {
    "RP|high": { inService: 4, tested: 4, passedOnFirstTest: 1, failed: 3, repaired: 2, overdue: 1, newInstallations: 0, removed: 0 },
    "DC|low": { inService: 4, tested: 1, passedOnFirstTest: 1, failed: 0, repaired: 0, overdue: 3, newInstallations: 1, removed: 0 },
    "PVB|low": { inService: 0, tested: 0, passedOnFirstTest: 0, failed: 0, repaired: 0, overdue: 0, newInstallations: 0, removed: 1 },
    total: { inService: 8, tested: 5, passedOnFirstTest: 2, failed: 3, repaired: 2, overdue: 4, newInstallations: 1, removed: 1 },
  };
  const order = ["inService", "tested", "passedOnFirstTest", "failed", "repaired", "overdue", "newInstallations", "removed"] as const;

  test("the CSV holds the hand-counted figures by kind and hazard, with subtotals and the total", async () => {
    const inspector = await as(world.inspectorEmail);
    const response = await inspector.get(`/api/inspector/summary/${year}/csv`);
    expect(response.status).toBe(200);
    expect(response.headers["content-type"]).toMatch(/text\/csv/);
    expect(response.headers["content-disposition"]).toContain(`program-summary-${year}.csv`);
    const lines = response.text.replace(/^\uFEFF/, "").split("\r\n").filter(Boolean);
    expect(lines[0]).toBe("Program,Year,Assembly kind,Kind code,Degree of hazard,In service at year end,Tested,Passed on first test,Failed,Repaired and passed,Overdue at year end,New installations,Removed or replaced");
    const figures = (line: string) => line.split(",").slice(-8).map(Number);
    const row = (code: string, hazard: string) => lines.find((l) => l.includes(`,${code},${hazard}`))!;
    expect(figures(row("RP", "High health hazard"))).toEqual(order.map((k) => expected["RP|high"][k]));
    expect(figures(row("DC", "Low hazard"))).toEqual(order.map((k) => expected["DC|low"][k]));
    expect(figures(row("PVB", "Low hazard"))).toEqual(order.map((k) => expected["PVB|low"][k]));
    expect(figures(lines.at(-1)!)).toEqual(order.map((k) => expected.total[k]));
    expect(lines.at(-1)).toContain("All kinds,,All hazards");
    expect(lines.every((l) => l.startsWith(world.name) || l.startsWith("Program"))).toBe(true);
  });

  test("the PDF is rendered on the server and reads the same figures", async () => {
    const inspector = await as(world.inspectorEmail);
    const response = await inspector
      .get(`/api/inspector/summary/${year}/pdf`)
      .buffer(true)
      .parse((res, callback) => {
        const chunks: Buffer[] = [];
        res.on("data", (chunk: Buffer) => chunks.push(chunk));
        res.on("end", () => callback(null, Buffer.concat(chunks)));
      });
    expect(response.status).toBe(200);
    expect(response.headers["content-type"]).toBe("application/pdf");
    const body = response.body as Buffer;
    expect(body.subarray(0, 5).toString()).toBe("%PDF-");
    const dir = mkdtempSync(path.join(tmpdir(), "zw-summary-"));
    const file = path.join(dir, "summary.pdf");
    writeFileSync(file, body);
    const text = execFileSync("pdftotext", ["-layout", file, "-"]).toString();
    expect(text).toContain(`Cross-connection control program summary, ${year}`);
    expect(text).toContain(world.name);
    expect(text).toMatch(/Reduced pressure principle assembly \(RP\)\s+High health hazard\s+4\s+4\s+1\s+3\s+2\s+1\s+0\s+0/);
    expect(text).toMatch(/All assemblies\s+All hazards\s+8\s+5\s+2\s+3\s+2\s+4\s+1\s+1/);
    expect(text).toContain("How the figures are counted");
    const screenshotDir = process.env.SCREENSHOT_DIR;
    if (screenshotDir) {
      execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", file, path.join(screenshotDir, "summary-pdf")]);
    }
  });

  test("the summary page shows the year; a year not begun and other roles are refused", async () => {
    const inspector = await as(world.inspectorEmail);
    const page = await inspector.get(`/inspector/summary?year=${year}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain(`Program summary ${year}`);
    const future = await inspector.get(`/api/inspector/summary/${year + 5}/csv`);
    expect(future.status).toBe(422);
    const words = await inspector.get("/api/inspector/summary/last-year/csv");
    expect(words.status).toBe(422);
    const owner = await as(demoAccounts.owner);
    expect((await owner.get(`/api/inspector/summary/${year}/pdf`)).status).toBe(403);
  });
});
