// Users and the audit log over HTTP: inviting inspectors and admins (and re-sending), disabling
// (signed out at once), never losing the last admin; the audit log filtered, paged and exported
// as formula-safe CSV; another program's entries never shown.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { users } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { as, unique } from "../helpers/http";
import { waitForMessage } from "../helpers/mail";
import { createScratchProgram, userIdOf, type ScratchProgram } from "./inspector-fixtures";

afterAll(closeTestDb);

let world: ScratchProgram;
beforeAll(async () => {
  world = await createScratchProgram();
});

describe("users", () => {
  test("an invited inspector gets the set-up link; inviting again re-sends it", async () => {
    const admin = await as(world.adminEmail);
    const email = `${unique("insp")}@wrenfield.example`;
    const invited = await admin.post("/api/admin/users", { name: "Briony Calloway", email, role: "inspector" });
    expect(invited.status).toBe(200);
    expect(invited.body.isResent).toBe(false);
    const mail = await waitForMessage(email);
    expect(mail.subject).toMatch(/account is ready to set up/);
    expect(mail.text).toMatch(/\/invite\//);
    const [user] = await testDb().select().from(users).where(eq(users.email, email));
    expect(user).toMatchObject({ role: "inspector", status: "invited", programId: world.programId });
    const again = await admin.post("/api/admin/users", { name: "Briony Calloway", email: email.toUpperCase(), role: "inspector" });
    expect(again.body.isResent).toBe(true);
    const page = await admin.get("/admin/users");
    expect(page.status).toBe(200);
    expect(page.text).toContain("Briony Calloway");
  });

  test("an address with an account elsewhere is refused, and bad input writes nothing", async () => {
    const admin = await as(world.adminEmail);
    const before = await countAllTables();
    const taken = await admin.post("/api/admin/users", { name: "Someone", email: demoAccounts.tester, role: "inspector" });
    expect(taken.status).toBe(422);
    expect(taken.body.fieldErrors.email[0]).toMatch(/already has an account/);
    const bad = await admin.post("/api/admin/users", { name: "X", email: "not-an-address", role: "owner" });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.fieldErrors)).toEqual(expect.arrayContaining(["name", "email", "role"]));
    expect(await countAllTables()).toEqual(before);
  });

  test("disabling signs the person out; the last admin cannot go; nobody disables themselves", async () => {
    const admin = await as(world.adminEmail);
    const inspector = await as(world.inspector2Email);
    expect((await inspector.get("/inspector")).status).toBe(200);
    const inspectorId = await userIdOf(world.inspector2Email);
    expect((await admin.patch(`/api/admin/users/${inspectorId}`, { status: "disabled" })).status).toBe(200);
    expect((await inspector.get("/inspector")).status).toBe(307);
    expect((await admin.patch(`/api/admin/users/${inspectorId}`, { status: "active" })).status).toBe(200);

    const adminId = await userIdOf(world.adminEmail);
    const self = await admin.patch(`/api/admin/users/${adminId}`, { status: "disabled" });
    expect(self.status).toBe(409);
    // A second admin may not demote the only other one either once it is the last.
    const promoted = await admin.patch(`/api/admin/users/${inspectorId}`, { role: "admin" });
    expect(promoted.status).toBe(200);
    const second = await as(world.inspector2Email);
    expect((await second.patch(`/api/admin/users/${adminId}`, { role: "inspector" })).status).toBe(200);
    const last = await admin.patch(`/api/admin/users/${inspectorId}`, { status: "disabled" });
    expect(last.status).toBe(403);
    const lastByThemself = await second.patch(`/api/admin/users/${inspectorId}`, { role: "inspector" });
    expect(lastByThemself.status).toBe(409);
    // Put things back.
    expect((await second.patch(`/api/admin/users/${adminId}`, { role: "admin" })).status).toBe(200);
  });

  test("another program's staff cannot be changed, and inspectors cannot manage users", async () => {
    const admin = await as(world.adminEmail);
    const demoInspectorId = await userIdOf(demoAccounts.inspector);
    expect((await admin.patch(`/api/admin/users/${demoInspectorId}`, { status: "disabled" })).status).toBe(404);
    const inspector = await as(world.inspectorEmail);
    expect((await inspector.post("/api/admin/users", { name: "Sneaky", email: "sneaky@wrenfield.example", role: "admin" })).status).toBe(403);
    expect((await inspector.get("/admin/users")).status).toBe(403);
  });
});

describe("the audit log", () => {
  test("filters by actor, action and record, pages, and exports formula-safe CSV", async () => {
    const admin = await as(world.adminEmail);
    // A return reason whose words start like a formula: it lands in the log's "after".
    const created = await admin.post("/api/admin/return-reasons", { label: "=1+2 readings do not add up", guidance: "@check" });
    expect(created.status).toBe(200);
    const adminId = await userIdOf(world.adminEmail);
    const page = await admin.get(`/admin/audit?actorId=${adminId}&action=return_reason.`);
    expect(page.status).toBe(200);
    expect(page.text).toContain("return_reason.created");
    const record = await admin.get(`/admin/audit?entityType=return_reason&entityId=${created.body.id}`);
    expect(record.text).toContain("return_reason.created");
    const csv = await admin.get(`/api/admin/audit/csv?entityType=return_reason&entityId=${created.body.id}`);
    expect(csv.status).toBe(200);
    expect(csv.headers["content-type"]).toMatch(/text\/csv/);
    const lines = csv.text.replace(/^\uFEFF/, "").split("\r\n").filter(Boolean);
    expect(lines[0]).toMatch(/^When \(UTC\),When \(Etc\/GMT\+6\),Who,Action,Record,Record id,Before,After$/);
    expect(lines).toHaveLength(2);
    expect(lines[1]).toContain("return_reason.created");
    // The JSON cell starts with "{", so it is safe as it is; a cell starting with = would be prefixed.
    expect(lines[1]).not.toMatch(/,=/);
    const dates = await admin.get("/admin/audit?from=2020-01-02&to=2020-01-01");
    expect(dates.status).toBe(200);
    expect((await admin.get("/api/admin/audit/csv?from=2020-01-02&to=2020-01-01")).status).toBe(422);
  });

  test("shows only the program's own entries", async () => {
    const admin = await as(world.adminEmail);
    const csv = await admin.get("/api/admin/audit/csv");
    expect(csv.text).not.toContain(demoAccounts.inspector);
    const neighbour = await as(demoAccounts.admin);
    const theirs = await neighbour.get(`/api/admin/audit/csv?actorId=${await userIdOf(world.adminEmail)}`);
    expect(theirs.text.replace(/^\uFEFF/, "").split("\r\n").filter(Boolean)).toHaveLength(1);
  });
});
