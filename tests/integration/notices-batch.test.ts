// The notice batch against the mail stand-in: the right people get the right notice, a second
// run sends nothing, a run cut off half way (the service failing after N messages, or the
// process killed mid-batch) and run again sends each notice exactly once in total, two runs at
// once never both send, and bad settings are refused with nothing recorded or sent.
import { spawn } from "node:child_process";
import { and, eq, isNotNull } from "drizzle-orm";
import { afterAll, afterEach, describe, expect, test } from "vitest";
import { closeDb } from "@/db/client";
import { assemblies, noticeRuns, notices, programSettings } from "@/db/schema";
import { acquireLease, NOTICE_LEASE_SECONDS, releaseLease, runNoticesForProgram } from "@/lib/data/notices-run";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { as, unique } from "../helpers/http";
import { controlMailStandIn, messagesTo, type CapturedMessage } from "../helpers/mail";
import { assemblyStages, createNoticeWorld, noticeRowsOf, setProgramSettings, type NoticeWorld } from "./notices-world";

afterEach(async () => {
  // The stand-in is shared by every test of the run: never leave it failing or slow.
  await controlMailStandIn({ failAfter: null, delayMs: 0 });
});
afterAll(async () => {
  await closeDb();
  await closeTestDb();
});

const later = (minutes: number) => () => new Date(Date.now() + minutes * 60_000);

async function countsByRecipient(emails: string[]): Promise<Map<string, CapturedMessage[]>> {
  const out = new Map<string, CapturedMessage[]>();
  for (const email of emails) out.set(email, await messagesTo(email));
  return out;
}

/** A world of n owners, one overdue assembly each (all e-mail). */
async function crowd(n: number): Promise<NoticeWorld> {
  const world = await createNoticeWorld();
  for (let i = 0; i < n; i++) {
    const { siteId } = await world.addSite({ contacts: [{ name: `Owner ${i}`, email: world.email(`o${i}`) }] });
    await world.addAssembly(siteId, { label: `service line ${i}`, nextDueInDays: -10 });
  }
  return world;
}

async function waitFor<T>(probe: () => Promise<T | null | undefined | false>, what: string, tries = 600): Promise<T> {
  for (let i = 0; i < tries; i++) {
    const value = await probe();
    if (value) return value;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`Gave up waiting for ${what}`);
}

function spawnCliRun(programId: number) {
  return spawn(process.execPath, ["--conditions=import", "--require", "./scripts/server-only-require.cjs", "--import", "tsx", "--import", "./scripts/server-env.mjs", "scripts/run-notices.ts", "--program", String(programId), "--quiet"], { cwd: process.cwd(), env: process.env, stdio: ["ignore", "pipe", "pipe"] });
}

describe("a run on a seeded program", () => {
  test("the right people get the right notice, once; a second run sends nothing", async () => {
    const w = await createNoticeWorld();
    const site = async (name: string, contacts: { name: string; email: string | null; receivesNotices?: boolean; ownerId?: number }[]) => (await w.addSite({ name, contacts })).siteId;
    const a = await w.addAssembly(await site("Ava's bakery", [{ name: "Ava Quillon", email: w.email("ava") }]), { label: "kitchen branch line", nextDueInDays: 10 });
    const b = await w.addAssembly(await site("Ben's garage", [{ name: "Ben Harrowgate", email: w.email("ben") }]), { label: "meter vault", nextDueInDays: -10 });
    const c = await w.addAssembly(await site("Cai's clinic", [{ name: "Cai Wendlebury", email: w.email("cai") }]), { label: "lab sink supply", nextDueInDays: -45 });
    const d = await w.addAssembly(await site("Dot's diner", [{ name: "Dot Ferncastle", email: w.email("dot") }]), { label: "ice machine supply", baseState: "failed", nextDueInDays: 100, repairDueInDays: 3, lastTestedDaysAgo: 11 });
    const eliSite = await site("Eli's office", [{ name: "Eli Marchbank", email: w.email("eli") }]);
    await w.addAssembly(eliSite, { label: "boiler room", nextDueInDays: 200 });
    await w.addAssembly(eliSite, { label: "old service line", status: "removed", baseState: "inactive", nextDueInDays: null });
    const g = await w.addAssembly(await site("Fay's cottage", [{ name: "Fay Underhill", email: null }]), { label: "garden bed by the fence", kind: "PVB", nextDueInDays: -10 });
    const h = await w.addAssembly(await site("Gus and Hal's flats", [{ name: "Gus Orchard", email: w.email("gus") }, { name: "Hal Orchard", email: w.email("hal") }]), { label: "basement riser", nextDueInDays: -10 });
    const i = await w.addAssembly(await site("Vacant shop", []), { label: "rear service", nextDueInDays: -10 });
    const ivySite = await w.addSite({ name: "Ivy Court North", contacts: [{ name: "Ivy Properties (Ivy Tamsin)", email: w.email("ivy") }] });
    const j = await w.addAssembly(ivySite.siteId, { label: "north riser", nextDueInDays: -10 });
    const k = await w.addAssembly(await site("Ivy Court South", [{ name: "Ivy Properties", email: w.email("ivy"), ownerId: ivySite.ownerIds[0] }]), { label: "south riser", nextDueInDays: -12 });
    const l = await w.addAssembly(await site("Jon and Kim's house", [{ name: "Jon Sallow", email: w.email("jon"), receivesNotices: false }, { name: "Kim Sallow", email: w.email("kim") }]), { label: "irrigation supply", kind: "PVB", nextDueInDays: -10 });

    const first = await runNoticesForProgram(w.programId, { trigger: "schedule" });
    expect(first.status, first.log.join("\n")).toBe("finished");
    expect(first.planned).toBe(10);
    expect(first.recorded).toBe(11);
    expect(first.sent).toBe(8);
    expect(first.letters).toBe(2);
    expect(first.failed).toBe(0);

    const mail = await countsByRecipient(w.emails);
    const only = (name: string) => {
      const list = mail.get(w.email(name)) ?? [];
      expect(list, `messages to ${name}`).toHaveLength(1);
      return list[0]!;
    };
    expect(only("ava").subject).toMatch(/^Backflow test due by .*Ava's bakery/);
    expect(only("ben").subject).toMatch(/^Overdue: backflow test was due on/);
    expect(only("cai").subject).toMatch(/^Final notice: .*service may be discontinued after/);
    expect(only("dot").subject).toMatch(/^Repair reminder: failed backflow assembly at Dot's diner/);
    expect(only("gus").subject).toMatch(/^Overdue/);
    expect(only("hal").subject).toMatch(/^Overdue/);
    expect(only("kim").subject).toMatch(/^Overdue/);
    // A property manager gets one message listing both sites' assemblies, not two.
    const ivy = only("ivy");
    expect(ivy.subject).toBe("Overdue: 2 backflow assemblies need their yearly test");
    expect(ivy.text).toContain("north riser");
    expect(ivy.text).toContain("south riser");
    // Not a notice contact, nothing due, out of service: nothing.
    expect(mail.get(w.email("jon"))).toHaveLength(0);
    expect(mail.get(w.email("eli"))).toHaveLength(0);

    // What every notice carries: program name and reply-to, plain text, a signed absolute link.
    for (const message of [only("ava"), only("ben"), only("cai"), only("dot")]) {
      expect(message.from).toContain(w.programName);
      expect(message.reply_to).toEqual([w.replyTo]);
      expect(message.text).toMatch(/^Quillmere Water Board/);
      expect(message.text).toContain("not marketing");
      expect(message.html).toMatch(/href="http:\/\/127\.0\.0\.1:\d+\/o\/[A-Za-z0-9_-]{20,}"/);
      expect(message.html).not.toMatch(/<img/i);
    }
    expect(only("cai").text).toMatch(/If no passing test report is on file by \d+ \w+ \d{4}, Quillmere Water Board \S+ may discontinue water service/);
    expect(only("dot").text).toMatch(/Failed its test on .*; repair and retest due by/);

    // The ledger: every e-mail sent with its message id, letters ready to print, stages moved.
    const rows = await noticeRowsOf(w.programId);
    expect(rows).toHaveLength(11);
    for (const row of rows.filter((r) => r.channel === "email")) {
      expect(row.status).toBe("sent");
      expect(row.messageId).toBeTruthy();
      expect(row.attempts).toBe(1);
    }
    const letters = rows.filter((r) => r.channel === "letter");
    expect(letters.map((r) => r.assemblyId).sort()).toEqual([g.id, i.id].sort());
    expect(letters.every((r) => r.status === "letter_ready")).toBe(true);
    expect(rows.find((r) => r.assemblyId === d.id)?.kind).toBe("repair_reminder");
    const stages = new Map((await assemblyStages([a.id, b.id, c.id, h.id, j.id, k.id, l.id])).map((s) => [s.id, s.noticeStage]));
    expect([stages.get(a.id), stages.get(b.id), stages.get(c.id)]).toEqual(["reminder", "overdue", "final"]);

    const second = await runNoticesForProgram(w.programId, { trigger: "schedule" });
    expect(second).toMatchObject({ status: "finished", planned: 0, recorded: 0, sent: 0, letters: 0 });
    const again = await countsByRecipient(w.emails);
    for (const email of w.emails) expect(again.get(email)?.length, email).toBe(mail.get(email)?.length);
    expect(await noticeRowsOf(w.programId)).toHaveLength(11);
  });
});

describe("a run cut off half way, then run again", () => {
  test("the service failing after 100 messages: the rest go out on a later run, each exactly once", async () => {
    const w = await crowd(250);
    await controlMailStandIn({ failAfter: 100 });
    const first = await runNoticesForProgram(w.programId, { trigger: "schedule" });
    await controlMailStandIn({ failAfter: null });
    expect(first.planned).toBe(250);
    expect(first.sent).toBe(100);
    expect(first.failed).toBe(150);
    expect(first.status).toBe("failed");
    expect(first.log.join("\n")).toMatch(/FAILED batch of 100 messages \(500/);

    const failed = (await noticeRowsOf(w.programId)).filter((r) => r.status === "failed");
    expect(failed).toHaveLength(150);
    // Back-off, and the batch keeps its key: the service might have delivered it.
    for (const row of failed) {
      expect(row.nextAttemptAt!.getTime()).toBeGreaterThan(Date.now());
      expect(row.batchKey).toBeTruthy();
      expect(row.lastError).toMatch(/500/);
    }

    // Again at once: nothing is due yet (back-off), nothing planned twice.
    const soon = await runNoticesForProgram(w.programId, { trigger: "schedule" });
    expect(soon).toMatchObject({ planned: 0, sent: 0, failed: 0 });

    // After the back-off: the 150 go out, under their batches' keys.
    const retry = await runNoticesForProgram(w.programId, { trigger: "schedule", now: later(16) });
    expect(retry).toMatchObject({ status: "finished", planned: 0, sent: 150, failed: 0 });
    const mail = await countsByRecipient(w.emails);
    for (const email of w.emails) expect(mail.get(email)?.length, email).toBe(1);
    const rows = await noticeRowsOf(w.programId);
    expect(rows.every((r) => r.status === "sent" && r.messageId)).toBe(true);
    expect(rows.filter((r) => r.attempts === 2)).toHaveLength(150);
  });

  test("the process killed while a batch is at the service: the next run finishes it under the same key, nothing twice", async () => {
    const w = await crowd(160);
    // Slow answers keep a batch in flight long enough to kill the run in the middle of it.
    await controlMailStandIn({ delayMs: 1500 });
    const child = spawnCliRun(w.programId);
    let output = "";
    child.stdout.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.stderr.on("data", (chunk: Buffer) => (output += chunk.toString()));
    const exited = new Promise<void>((resolve) => child.on("exit", () => resolve()));
    try {
      // The first batch delivered and recorded, the second claimed and at the service.
      await waitFor(async () => (await noticeRowsOf(w.programId)).filter((r) => r.status === "sent").length === 100, `the first batch to be recorded (${output})`);
      const inFlight = await waitFor(async () => {
        const rows = await noticeRowsOf(w.programId);
        const claimed = rows.filter((r) => r.status === "pending" && r.batchKey);
        return claimed.length === 60 ? claimed : null;
      }, "the second batch to be claimed");
      await new Promise((r) => setTimeout(r, 300));
      child.kill("SIGKILL");
      await exited;
      // The service still delivers what it was handed; the answer is lost with the process.
      const someRecipient = inFlight[0]!.recipientEmail!;
      await waitFor(async () => (await messagesTo(someRecipient)).length > 0 || (await noticeRowsOf(w.programId)).some((r) => r.id === inFlight[0]!.id && r.status === "sent"), "the service to finish the in-flight batch", 200).catch(() => null);
    } finally {
      if (child.exitCode === null) child.kill("SIGKILL");
      await controlMailStandIn({ delayMs: 0 });
    }
    const beforeRecovery = await noticeRowsOf(w.programId);
    expect(beforeRecovery.filter((r) => r.status === "pending" && r.batchKey)).toHaveLength(60);

    // The dead run's lease runs out; the next run resumes the batch with its own key.
    const recovery = await runNoticesForProgram(w.programId, { trigger: "schedule", now: later(NOTICE_LEASE_SECONDS / 60 + 1) });
    expect(recovery.status, recovery.log.join("\n")).toBe("finished");
    expect(recovery.planned).toBe(0);
    expect(recovery.log.join("\n")).toMatch(/Resuming 1 batches/);
    const mail = await countsByRecipient(w.emails);
    for (const email of w.emails) expect(mail.get(email)?.length, email).toBe(1);
    const rows = await noticeRowsOf(w.programId);
    expect(rows.every((r) => r.status === "sent")).toBe(true);
    const [dead] = await testDb().select().from(noticeRuns).where(and(eq(noticeRuns.programId, w.programId), eq(noticeRuns.status, "failed")));
    expect(dead?.log).toMatch(/Interrupted before it finished/);
  });
});

describe("a settings change whose recompute was cut short", () => {
  test("the next run finishes the recompute before it plans, and says so in its log", async () => {
    const world = await createNoticeWorld();
    const { siteId } = await world.addSite({ contacts: [{ name: "Owner", email: world.email("owner") }] });
    // Stored as long overdue, but with no test on record: recomputed, it is simply never tested.
    const assembly = await world.addAssembly(siteId, { label: "service line", nextDueInDays: -40, lastTestedDaysAgo: 400 });
    await testDb().update(programSettings).set({ factsPendingSince: new Date(Date.now() - 60_000) }).where(eq(programSettings.programId, world.programId));

    const run = await runNoticesForProgram(world.programId, { trigger: "button" });
    expect(run.status, run.log.join("\n")).toBe("finished");
    expect(run.log.join("\n")).toMatch(/First finished recomputing due dates after a settings change: 1 assemblies, 1 changed/);
    const [settings] = await testDb().select({ since: programSettings.factsPendingSince }).from(programSettings).where(eq(programSettings.programId, world.programId));
    expect(settings!.since).toBeNull();
    const [row] = await testDb().select({ lastTestedOn: assemblies.lastTestedOn }).from(assemblies).where(eq(assemblies.id, assembly.id));
    expect(row!.lastTestedOn).toBeNull();

    const again = await runNoticesForProgram(world.programId, { trigger: "button" });
    expect(again.log.join("\n")).not.toMatch(/recomputing/);
  });
});

describe("two runs at once", () => {
  test("the lease: of eight takers at the same moment, exactly one gets it", async () => {
    const name = `test:${unique("lease")}`;
    const now = new Date();
    const results = await Promise.all(Array.from({ length: 8 }, (_, i) => acquireLease(name, `holder-${i}`, now, 60)));
    expect(results.filter(Boolean)).toHaveLength(1);
    // Held: nobody else gets it until it runs out or is released.
    expect(await acquireLease(name, "late", now, 60)).toBe(false);
    expect(await acquireLease(name, "after-expiry", new Date(now.getTime() + 61_000), 60)).toBe(true);
    await releaseLease(name, "after-expiry");
    expect(await acquireLease(name, "after-release", now, 60)).toBe(true);
    await releaseLease(name, "after-release");
  });

  test("two runs started together in one process: one sends, the other skips", async () => {
    const w = await crowd(120);
    const summaries = await Promise.all([runNoticesForProgram(w.programId, { trigger: "schedule" }), runNoticesForProgram(w.programId, { trigger: "button" })]);
    const statuses = summaries.map((s) => s.status).sort();
    expect(statuses).toEqual(["finished", "skipped"]);
    expect(summaries.reduce((n, s) => n + s.sent, 0)).toBe(120);
    const mail = await countsByRecipient(w.emails);
    for (const email of w.emails) expect(mail.get(email)?.length, email).toBe(1);
  });

  test("a scheduled run in another process holds the lease: a run here meanwhile skips, and each notice goes once", async () => {
    const w = await crowd(150);
    // Slow answers keep the other process's run going while this one starts.
    await controlMailStandIn({ delayMs: 400 });
    const child = spawnCliRun(w.programId);
    const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
    try {
      await waitFor(async () => (await testDb().select().from(noticeRuns).where(and(eq(noticeRuns.programId, w.programId), eq(noticeRuns.status, "running")))).length > 0, "the other process's run to start");
      const here = await runNoticesForProgram(w.programId, { trigger: "button" });
      expect(here.status).toBe("skipped");
      expect(here.sent).toBe(0);
      expect(await exited).toBe(0);
    } finally {
      if (child.exitCode === null) child.kill("SIGKILL");
      await controlMailStandIn({ delayMs: 0 });
    }
    const mail = await countsByRecipient(w.emails);
    for (const email of w.emails) expect(mail.get(email)?.length, email).toBe(1);
    expect((await noticeRowsOf(w.programId)).every((r) => r.status === "sent")).toBe(true);
    const runs = await testDb().select().from(noticeRuns).where(eq(noticeRuns.programId, w.programId));
    expect(runs.map((r) => r.status).sort()).toEqual(["finished", "skipped"]);
  });

  test("the admin's button while a run is going: 409, and nothing sent twice", async () => {
    const w = await crowd(3);
    const admin = await as(w.adminEmail);
    const name = `notices:program:${w.programId}`;
    expect(await acquireLease(name, "someone-else", new Date(), 60)).toBe(true);
    try {
      const busy = await admin.post("/api/notices/runs", { confirm: true });
      expect(busy.status).toBe(409);
      expect(busy.body.error).toMatch(/already in progress/);
    } finally {
      await releaseLease(name, "someone-else");
    }
    const started = await admin.post("/api/notices/runs", { confirm: true });
    expect(started.status).toBe(202);
    const runId = started.body.runId as number;
    const run = await waitFor(async () => {
      const progress = await admin.get(`/api/notices/runs/${runId}`);
      return progress.body.run?.status !== "running" ? progress.body.run : null;
    }, "the button's run to finish");
    expect(run).toMatchObject({ status: "finished", sent: 3, percent: 100 });
    const mail = await countsByRecipient(w.emails);
    for (const email of w.emails) expect(mail.get(email)?.length, email).toBe(1);
  });
});

describe("settings a notice cannot be written from are refused: nothing recorded, nothing sent", () => {
  test.each([
    { label: "overlapping stages (final before overdue)", change: { overdueDaysAfter: 10, finalDaysAfter: 5 }, message: /final notice \(5 days after due\) must come after the overdue notice/ },
    { label: "a negative number of days", change: { reminderDaysBefore: -3 }, message: /cannot be a negative number of days/ },
    { label: "an overdue notice on the due date itself", change: { overdueDaysAfter: 0 }, message: /at least 1 day after the due date/ },
  ])("$label", async ({ change, message }) => {
    const w = await crowd(2);
    await setProgramSettings(w.programId, change);
    const summary = await runNoticesForProgram(w.programId, { trigger: "schedule" });
    expect(summary.status).toBe("failed");
    expect(summary.message).toMatch(message);
    expect(await noticeRowsOf(w.programId)).toHaveLength(0);
    for (const email of w.emails) expect(await messagesTo(email)).toHaveLength(0);

    // The admin's button says the same and writes nothing at all.
    const admin = await as(w.adminEmail);
    const before = await countAllTables();
    const refused = await admin.post("/api/notices/runs", { confirm: true });
    expect(refused.status).toBe(422);
    expect(refused.body.error).toMatch(message);
    expect(await countAllTables()).toEqual(before);
  });

  test("a program without a phone number: every notice would miss it, so none is written", async () => {
    const w = await createNoticeWorld({ phone: "" });
    const { siteId } = await w.addSite({ contacts: [{ name: "Lior Pennant", email: w.email("lior") }] });
    await w.addAssembly(siteId, { label: "meter vault", nextDueInDays: -10 });
    const summary = await runNoticesForProgram(w.programId, { trigger: "schedule" });
    expect(summary.status).toBe("failed");
    expect(summary.message).toMatch(/phone number is missing/);
    expect(await noticeRowsOf(w.programId)).toHaveLength(0);
    expect(await messagesTo(w.email("lior"))).toHaveLength(0);
  });

  test("a notice missing a variable fails loudly and is not sent; the others go out", async () => {
    const w = await createNoticeWorld();
    const good = await w.addSite({ contacts: [{ name: "Mara Thistlewood", email: w.email("mara") }] });
    await w.addAssembly(good.siteId, { label: "meter vault", nextDueInDays: -10 });
    const blank = await w.addSite({ name: " ", address: " ", city: " ", contacts: [{ name: "Nils Oakhurst", email: w.email("nils") }] });
    await w.addAssembly(blank.siteId, { label: "riser", nextDueInDays: -10 });
    const summary = await runNoticesForProgram(w.programId, { trigger: "schedule" });
    expect(summary).toMatchObject({ status: "failed", sent: 1, failed: 1 });
    expect(summary.log.join("\n")).toMatch(/NOT SENT \(notice \d+\): The overdue notice cannot be written: items\.0\.site: The site's address is missing\./);
    expect(await messagesTo(w.email("mara"))).toHaveLength(1);
    expect(await messagesTo(w.email("nils"))).toHaveLength(0);
    const [row] = await testDb().select().from(notices).where(and(eq(notices.programId, w.programId), eq(notices.recipientEmail, w.email("nils")), isNotNull(notices.lastError)));
    expect(row?.status).toBe("failed");
    expect(row?.lastError).toMatch(/site's address is missing/);
  });
});
