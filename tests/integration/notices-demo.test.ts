// A batch run on the seeded demo program sends exactly what lib/rules plans for today, once:
// every planned notice recorded and sent (or lettered), the demo owner's overdue and failed
// assemblies noticed, and a second run sending nothing.
import { eq, inArray } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { closeDb } from "@/db/client";
import { notices, programSettings, programs } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { planTodaysNotices, runNoticesForProgram } from "@/lib/data/notices-run";
import { noticeScheduleFromSettings } from "@/lib/programs/settings";
import { closeTestDb, testDb } from "../helpers/db";
import { messagesTo } from "../helpers/mail";

afterAll(async () => {
  await closeDb();
  await closeTestDb();
});

describe("the notices of the demo program", () => {
  test("today's plan is sent once, to the right people", async () => {
    const db = testDb();
    const [row] = await db.select({ program: programs, settings: programSettings }).from(programs).innerJoin(programSettings, eq(programSettings.programId, programs.id)).where(eq(programs.id, 1));
    const plan = await planTodaysNotices({ id: 1, timezone: row!.program.timezone, schedule: noticeScheduleFromSettings(row!.settings) }, new Date());
    const ownerBefore = (await messagesTo(demoAccounts.owner)).length;

    const summary = await runNoticesForProgram(1, { trigger: "schedule" });
    expect(summary.status).toBe("finished");
    expect(summary.planned).toBe(plan.planned.length);
    expect(summary.recorded).toBe(plan.rows.length);
    expect(plan.rows.length).toBeGreaterThan(50);

    const recorded = await db.select().from(notices).where(inArray(notices.noticeKey, plan.rows.map((r) => r.noticeKey)));
    expect(recorded).toHaveLength(plan.rows.length);
    for (const n of recorded) expect(n.status, n.noticeKey).toBe(n.channel === "email" ? "sent" : "letter_ready");
    const emailed = [...new Set(plan.rows.filter((r) => r.channel === "email").map((r) => r.recipientEmail!))];
    expect(summary.sent).toBeGreaterThan(0);
    expect(summary.sent).toBeLessThanOrEqual(plan.rows.filter((r) => r.channel === "email").length);
    for (const email of emailed.slice(0, 25)) expect((await messagesTo(email)).length, email).toBeGreaterThan(0);

    // The demo owner: the curb RP long overdue (final), the ice machine DC overdue, the kitchen RP failed with its repair due soon.
    const ownerMessages = (await messagesTo(demoAccounts.owner)).slice(0, (await messagesTo(demoAccounts.owner)).length - ownerBefore);
    const subjects = ownerMessages.map((m) => m.subject).join("\n");
    expect(subjects).toMatch(/^Final notice: backflow test overdue at Hearthside Restaurant/m);
    expect(subjects).toMatch(/^Overdue: backflow test was due on .*Hearthside Restaurant/m);
    expect(subjects).toMatch(/^Repair reminder: failed backflow assembly at Hearthside Restaurant/m);
    expect(ownerMessages.find((m) => m.subject.startsWith("Repair reminder"))?.text).toContain("kitchen branch line");

    const second = await runNoticesForProgram(1, { trigger: "schedule" });
    expect(second).toMatchObject({ status: "finished", planned: 0, recorded: 0, sent: 0, letters: 0 });
    expect((await messagesTo(demoAccounts.owner)).length).toBe(ownerBefore + ownerMessages.length);
  });
});
