// The tester roster: registrations with their certificate, approve / reject (a reason needed) /
// suspend / reinstate — each e-mailed and audited — and the public roster owners use, which
// shows only approved testers with a valid certification and never an e-mail address.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { auditLog, testerApprovals } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { addDays } from "@/lib/rules";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { api, as } from "../helpers/http";
import { waitForMessage } from "../helpers/mail";
import { createScratchProgram, createTester, today, type ScratchProgram } from "./inspector-fixtures";

afterAll(closeTestDb);

let world: ScratchProgram;
beforeAll(async () => {
  world = await createScratchProgram();
});

async function approvalOf(testerId: number) {
  const [row] = await testDb().select().from(testerApprovals).where(and(eq(testerApprovals.programId, world.programId), eq(testerApprovals.testerId, testerId)));
  return row!;
}

describe("deciding registrations", () => {
  test("approve, suspend with a reason and reinstate: each e-mailed with the program's reply-to and audited", async () => {
    const tester = await createTester({ programIds: [world.programId], approval: "pending" });
    const approval = await approvalOf(tester.id);
    const inspector = await as(world.inspectorEmail);
    const roster = await inspector.get("/inspector/testers?status=pending");
    expect(roster.status).toBe(200);
    expect(roster.text).toContain(tester.name);
    const detail = await inspector.get(`/inspector/testers/${approval.id}`);
    expect(detail.status).toBe(200);
    expect(detail.text).toContain("Certifications");

    expect((await inspector.post(`/api/testers/${approval.id}/decision`, { decision: "approve" })).status).toBe(200);
    const approved = await waitForMessage(tester.email, (m) => /approved to file/.test(m.subject));
    expect(approved.reply_to?.[0]).toMatch(/^backflow@/);
    expect((await approvalOf(tester.id)).status).toBe("approved");

    const noReason = await inspector.post(`/api/testers/${approval.id}/decision`, { decision: "suspend" });
    expect(noReason.status).toBe(409);
    expect(noReason.body.error).toMatch(/Give a reason/);
    expect((await inspector.post(`/api/testers/${approval.id}/decision`, { decision: "suspend", reason: "Certificate under review by the board." })).status).toBe(200);
    const suspended = await waitForMessage(tester.email, (m) => /suspended/.test(m.subject));
    expect(suspended.text).toContain("Certificate under review by the board.");
    expect((await inspector.post(`/api/testers/${approval.id}/decision`, { decision: "reinstate" })).status).toBe(200);
    await waitForMessage(tester.email, (m) => /restored/.test(m.subject));

    const entries = await testDb().select().from(auditLog).where(and(eq(auditLog.entityType, "tester_approval"), eq(auditLog.entityId, String(approval.id))));
    expect(entries.map((e) => e.action).sort()).toEqual(["tester.approved", "tester.reinstated", "tester.suspended"]);
    const history = await inspector.get(`/inspector/testers/${approval.id}`);
    expect(history.text).toContain("Suspended");
  });

  test("rejecting needs a reason; deciding twice is refused; another program's registration is not found", async () => {
    const tester = await createTester({ programIds: [world.programId], approval: "pending" });
    const approval = await approvalOf(tester.id);
    const inspector = await as(world.inspectorEmail);
    const before = await countAllTables();
    expect((await inspector.post(`/api/testers/${approval.id}/decision`, { decision: "reject", reason: "" })).status).toBe(409);
    expect((await inspector.post(`/api/testers/${approval.id}/decision`, { decision: "reinstate" })).status).toBe(409);
    const neighbour = await as(demoAccounts.inspector);
    expect((await neighbour.post(`/api/testers/${approval.id}/decision`, { decision: "approve" })).status).toBe(404);
    expect((await neighbour.get(`/inspector/testers/${approval.id}`)).status).toBe(404);
    expect(await countAllTables()).toEqual(before);
    expect((await inspector.post(`/api/testers/${approval.id}/decision`, { decision: "reject", reason: "The certificate number is not on the board's list." })).status).toBe(200);
    const mail = await waitForMessage(tester.email, (m) => /could not approve/.test(m.subject));
    expect(mail.text).toContain("The certificate number is not on the board's list.");
  });
});

describe("the public roster", () => {
  test("lists approved testers with a valid certification: name, company, phone and programs — never e-mail", async () => {
    const listed = await createTester({ programIds: [world.programId], phone: "(555) 031-7788" });
    const expired = await createTester({ programIds: [world.programId], certExpiresOn: addDays(today(), -1) });
    const suspended = await createTester({ programIds: [world.programId], approval: "suspended" });
    const pending = await createTester({ programIds: [world.programId], approval: "pending" });
    const disabled = await createTester({ programIds: [world.programId], status: "disabled" });
    const page = await api().get(`/testers?program=${world.programId}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain(listed.name);
    expect(page.text).toContain("(555) 031-7788");
    expect(page.text).toContain(world.name);
    for (const hidden of [expired, suspended, pending, disabled]) expect(page.text).not.toContain(hidden.name);
    expect(page.text).not.toContain(listed.email);
    expect(page.text).not.toMatch(/@testers\.example/);
    const search = await api().get(`/testers?q=${encodeURIComponent(listed.name)}`);
    expect(search.text).toContain(listed.name);
    expect(search.text).not.toContain(expired.name);
  });
});
