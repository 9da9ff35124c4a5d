// Program settings over HTTP (in a program of the test's own): saving recomputes the stored due
// dates, lib/rules refuses an overlapping or negative notice schedule and a bad window, local
// rule-set editions need a variance reason to be less strict, return reasons are kept forever.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { assemblies, auditLog, localRuleSets, programSettings, returnReasons } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { addMonths, dueDateAfterPass, defaultProgramRules } from "@/lib/rules";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { as } from "../helpers/http";
import { createAssembly, createReport, createScratchProgram, createSite, createTester, today, type ScratchProgram } from "./inspector-fixtures";

afterAll(closeTestDb);

let world: ScratchProgram;
beforeAll(async () => {
  world = await createScratchProgram();
});

async function currentSettings() {
  const [row] = await testDb().select().from(programSettings).where(eq(programSettings.programId, world.programId));
  const { programId: _p, updatedAt: _u, updatedBy: _b, factsPendingSince: _f, factsRecomputeDone: _d, factsRecomputeTotal: _t, factsRecomputeAt: _a, ...rest } = row!;
  return rest;
}

/** Follows the recompute the save started after its answer, as the settings page does, to the end. */
async function waitForRecompute(admin: Awaited<ReturnType<typeof as>>) {
  const seen: { done: number; total: number }[] = [];
  await expect
    .poll(
      async () => {
        const status = await admin.get("/api/admin/settings/recompute");
        expect(status.status).toBe(200);
        if (status.body.pendingSince) seen.push({ done: status.body.done, total: status.body.total });
        return status.body.pendingSince;
      },
      { timeout: 30_000, interval: 100 },
    )
    .toBeNull();
  return seen;
}

describe("program settings", () => {
  test("a longer test interval recomputes every assembly's due date and is audited", async () => {
    const admin = await as(world.adminEmail);
    const site = await createSite(world.programId);
    const tester = await createTester({ programIds: [world.programId] });
    const passedOn = addMonths(today(), -6);
    const { id } = await createAssembly(world.programId, site.id, { lastPassedOn: passedOn, lastTestedOn: passedOn, lastOutcome: "pass", nextDueOn: dueDateAfterPass(passedOn) });
    await createReport({ programId: world.programId, assemblyId: id, tester, testedOn: passedOn, status: "accepted" });
    const settings = await currentSettings();
    const response = await admin.put("/api/admin/settings", { ...settings, testIntervalMonths: 24 });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    expect(response.body).toEqual({ changed: ["testIntervalMonths"], isRecomputeOwed: true });
    // The answer comes before the recompute, which runs on and reports its progress.
    const seen = await waitForRecompute(admin);
    for (const step of seen) expect(step.done).toBeLessThanOrEqual(step.total);
    const [row] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(row!.nextDueOn).toBe(dueDateAfterPass(passedOn, { ...defaultProgramRules, testIntervalMonths: 24 }));
    const entries = await testDb().select().from(auditLog).where(and(eq(auditLog.programId, world.programId), eq(auditLog.entityType, "program_settings")));
    expect(entries.sort((a, b) => a.id - b.id).at(-1)).toMatchObject({ action: "settings.updated", before: { testIntervalMonths: 12 }, after: { testIntervalMonths: 24 } });
    const recomputes = await testDb().select().from(auditLog).where(and(eq(auditLog.programId, world.programId), eq(auditLog.action, "assemblies.facts_recomputed")));
    expect(recomputes.at(-1)!.after).toMatchObject({ assemblies: expect.any(Number), changed: expect.any(Number) });
    expect((recomputes.at(-1)!.after as { changed: number }).changed).toBeGreaterThanOrEqual(1);

    // Saving the same values again changes nothing and recomputes nothing.
    const same = await admin.put("/api/admin/settings", { ...settings, testIntervalMonths: 24 });
    expect(same.body).toEqual({ changed: [], isRecomputeOwed: false });
    // A fee, kPa and the window model with valid dates.
    const window = await admin.put("/api/admin/settings", { ...settings, testIntervalMonths: 12, dueModel: "window", windowStart: "01-01", windowEnd: "05-31", filingFeeCents: 1250, units: "kPa", kitPolicy: "flag" });
    expect(window.status).toBe(200);
    expect(await currentSettings()).toMatchObject({ dueModel: "window", filingFeeCents: 1250, units: "kPa", kitPolicy: "flag" });
    await admin.put("/api/admin/settings", { ...settings });
    await waitForRecompute(admin);
  });

  test("a recompute cut short is owed until done: the settings page says so, and the next save finishes it", async () => {
    const admin = await as(world.adminEmail);
    const site = await createSite(world.programId);
    const tester = await createTester({ programIds: [world.programId] });
    const passedOn = addMonths(today(), -5);
    // Stored facts that disagree with the history, as if the recompute stopped before this assembly.
    const { id } = await createAssembly(world.programId, site.id, { lastPassedOn: passedOn, lastTestedOn: passedOn, lastOutcome: "pass", nextDueOn: addMonths(today(), 40) });
    await createReport({ programId: world.programId, assemblyId: id, tester, testedOn: passedOn, status: "accepted" });
    // Marked five minutes ago and never moved on since: cut short.
    const pendingSince = new Date(Date.now() - 5 * 60_000);
    await testDb().update(programSettings).set({ factsPendingSince: pendingSince }).where(eq(programSettings.programId, world.programId));

    const page = await admin.get("/admin/settings");
    expect(page.status).toBe(200);
    expect(page.text).toContain("Due dates are still being recomputed");

    const settings = await currentSettings();
    const saved = await admin.put("/api/admin/settings", settings);
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    expect(saved.body).toEqual({ changed: [], isRecomputeOwed: true });
    await waitForRecompute(admin);
    const [row] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(row!.nextDueOn).toBe(dueDateAfterPass(passedOn, { ...defaultProgramRules, testIntervalMonths: settings.testIntervalMonths }));
    const [after] = await testDb().select({ since: programSettings.factsPendingSince }).from(programSettings).where(eq(programSettings.programId, world.programId));
    expect(after!.since).toBeNull();
    expect((await admin.get("/admin/settings")).text).not.toContain("Due dates are still being recomputed");
  });

  test("an overlapping or negative notice schedule is refused with lib/rules' message, nothing saved", async () => {
    const admin = await as(world.adminEmail);
    const settings = await currentSettings();
    const before = await countAllTables();
    const overlapping = await admin.put("/api/admin/settings", { ...settings, overdueDaysAfter: 30, finalDaysAfter: 30 });
    expect(overlapping.status).toBe(422);
    expect(overlapping.body.fieldErrors.finalDaysAfter[0]).toMatch(/must come after the overdue notice/);
    const negative = await admin.put("/api/admin/settings", { ...settings, reminderDaysBefore: -5 });
    expect(negative.status).toBe(422);
    expect(negative.body.fieldErrors.reminderDaysBefore[0]).toMatch(/cannot be a negative number of days/);
    const onDueDate = await admin.put("/api/admin/settings", { ...settings, overdueDaysAfter: 0 });
    expect(onDueDate.body.fieldErrors.overdueDaysAfter[0]).toMatch(/at least 1 day after/);
    const badWindow = await admin.put("/api/admin/settings", { ...settings, dueModel: "window", windowStart: "13-40", windowEnd: "05-31" });
    expect(badWindow.status).toBe(422);
    expect(badWindow.body.fieldErrors.windowStart[0]).toMatch(/MM-DD/);
    const oddInterval = await admin.put("/api/admin/settings", { ...settings, dueModel: "window", testIntervalMonths: 18 });
    expect(oddInterval.body.fieldErrors.testIntervalMonths[0]).toMatch(/whole years/);
    const fee = await admin.put("/api/admin/settings", { ...settings, filingFeeCents: 12.5 });
    expect(fee.body.fieldErrors.filingFeeCents[0]).toMatch(/whole number of cents/);
    const edition = await admin.put("/api/admin/settings", { ...settings, ruleSetEdition: "no-such-edition" });
    expect(edition.body.fieldErrors.ruleSetEdition[0]).toMatch(/published edition/);
    expect(await countAllTables()).toEqual(before);
    expect(await currentSettings()).toEqual(settings);
  });

  test("only the program's admin may change settings", async () => {
    const settings = await currentSettings();
    for (const email of [world.inspectorEmail, demoAccounts.tester, demoAccounts.owner]) {
      const other = await as(email);
      expect((await other.put("/api/admin/settings", settings)).status).toBe(403);
      expect((await other.get("/admin/settings")).status).toBe(403);
    }
    const page = await (await as(world.adminEmail)).get("/admin/settings");
    expect(page.status).toBe(200);
    expect(page.text).toContain("When tests are due");
  });
});

describe("local rule-set editions", () => {
  const body = (overrides: Record<string, unknown> = {}) => ({ edition: `wren-${Date.now().toString(36)}`, label: "District minimums", basedOn: "published-current", adoptedOn: today(), localSource: "District ordinance 14-2, §3", values: {}, variances: [], ...overrides });

  test("a stricter minimum is accepted and can be put in force", async () => {
    const admin = await as(world.adminEmail);
    const response = await admin.post("/api/admin/rule-sets", body({ values: { "rp.check1Min": 5.5 }, adopt: true }));
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    const [row] = await testDb().select().from(localRuleSets).where(and(eq(localRuleSets.programId, world.programId), eq(localRuleSets.edition, response.body.edition)));
    expect((row!.data as { rp: { check1Min: number }; sources: Record<string, string> }).rp.check1Min).toBe(5.5);
    expect((row!.data as { sources: Record<string, string> }).sources["rp.check1.min"]).toContain("District ordinance 14-2");
    expect((await currentSettings()).ruleSetEdition).toBe(response.body.edition);
    await admin.put("/api/admin/settings", { ...(await currentSettings()), ruleSetEdition: "published-current" });
  });

  test("a minimum below the published one needs the program's reason (a variance)", async () => {
    const admin = await as(world.adminEmail);
    const before = await countAllTables();
    const lower = await admin.post("/api/admin/rule-sets", body({ values: { "rp.reliefMin": 1.5 } }));
    expect(lower.status).toBe(422);
    expect(lower.body.fieldErrors["rp.reliefMin"][0]).toMatch(/less strict than the published-current value 2: record it as a local variance/);
    const noSource = await admin.post("/api/admin/rule-sets", body({ values: { "rp.reliefMin": 2.5 }, localSource: "" }));
    expect(noSource.status).toBe(422);
    const taken = await admin.post("/api/admin/rule-sets", body({ edition: "Bad Id!" }));
    expect(taken.status).toBe(422);
    expect(await countAllTables()).toEqual(before);
    const withReason = await admin.post("/api/admin/rule-sets", body({ values: { "rp.reliefMin": 1.5 }, variances: [{ path: "rp.reliefMin", reason: "State variance granted for a pilot of low-lift assemblies." }] }));
    expect(withReason.status).toBe(200);
  });
});

describe("return reasons", () => {
  test("added, reworded, moved and retired — never deleted — and audited", async () => {
    const admin = await as(world.adminEmail);
    const created = await admin.post("/api/admin/return-reasons", { label: "Line pressure not recorded", guidance: "Record the static line pressure." });
    expect(created.status).toBe(200);
    const id = created.body.id as number;
    expect((await admin.post("/api/admin/return-reasons", { label: "Line pressure not recorded" })).status).toBe(422);
    expect((await admin.patch(`/api/admin/return-reasons/${id}`, { label: "Static line pressure not recorded", guidance: "", isActive: true, move: "up" })).status).toBe(200);
    expect((await admin.patch(`/api/admin/return-reasons/${id}`, { label: "Static line pressure not recorded", isActive: false })).status).toBe(200);
    const reasons = await testDb().select().from(returnReasons).where(eq(returnReasons.programId, world.programId));
    const reason = reasons.find((r) => r.id === id)!;
    expect(reason).toMatchObject({ label: "Static line pressure not recorded", isActive: false });
    const byOrder = [...reasons].sort((a, b) => a.sortOrder - b.sortOrder).map((r) => r.id);
    expect(byOrder.indexOf(id)).toBe(reasons.length - 2);
    // A retired reason is not offered when returning a report.
    const inspector = await as(world.inspectorEmail);
    const list = await inspector.get("/admin/return-reasons");
    expect(list.status).toBe(403);
    const page = await admin.get("/admin/return-reasons");
    expect(page.text).toContain("Static line pressure not recorded");
    const entries = await testDb().select().from(auditLog).where(and(eq(auditLog.entityType, "return_reason"), eq(auditLog.entityId, String(id))));
    expect(entries.sort((a, b) => a.id - b.id).map((e) => e.action)).toEqual(["return_reason.created", "return_reason.updated", "return_reason.updated"]);
  });
});
