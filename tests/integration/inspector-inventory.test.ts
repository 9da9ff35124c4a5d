// The inventory over HTTP: search, site and assembly edits (facts recomputed), removal and
// replacement with the history kept, confirming and merging field registrations, owners and
// portal invitations, the kind-vs-hazard warnings, and bad input refused with nothing written.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { assemblies, auditLog, owners, siteOwners, sites, testReports, users } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { addDays, addMonths, dueDateAfterPass } from "@/lib/rules";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { as } from "../helpers/http";
import { waitForMessage } from "../helpers/mail";
import { createAssembly, createOwner, createReport, createScratchProgram, createSite, createTester, today, type ScratchProgram, type TesterFixture } from "./inspector-fixtures";

afterAll(closeTestDb);

let world: ScratchProgram;
let tester: TesterFixture;
beforeAll(async () => {
  world = await createScratchProgram();
  tester = await createTester({ programIds: [world.programId] });
});

const assemblyBody = (overrides: Record<string, unknown> = {}) => ({ kind: "RP", make: "Tallowmere", model: "TR-4", size: "1 in", serial: `SER${Date.now().toString(36)}${Math.floor(Math.random() * 1000)}`, location: "meter vault at the street", hazard: "high", backpressurePossible: false, installedOn: "2020-05-01", notes: "", ...overrides });

describe("sites", () => {
  test("a new site is added, found by search and edited; a new hazard passes to its assemblies", async () => {
    const inspector = await as(world.inspectorEmail);
    const account = `NS${Date.now().toString(36).toUpperCase()}`;
    const created = await inspector.post("/api/inspector/sites", { accountNumber: account, name: "Thistlecombe Dye Works", addressLine1: "88 Copperbeech Drive", city: "Quillmere", hazard: "low", facilityType: "Laundry" });
    expect(created.status).toBe(200);
    const siteId = created.body.id as number;
    const dc = await inspector.post(`/api/inspector/sites/${siteId}/assemblies`, assemblyBody({ kind: "DC", hazard: "low" }));
    expect(dc.status).toBe(200);

    const search = await inspector.get(`/inspector/inventory?q=${account}`);
    expect(search.status).toBe(200);
    expect(search.text).toContain("Thistlecombe Dye Works");
    const byStreet = await inspector.get("/inspector/inventory?q=Copperbeech");
    expect(byStreet.text).toContain("Thistlecombe Dye Works");

    const edited = await inspector.patch(`/api/inspector/sites/${siteId}`, { accountNumber: account, name: "Thistlecombe Dye Works", addressLine1: "88 Copperbeech Drive", city: "Quillmere", hazard: "high", facilityType: "Laundry", applyHazardToAssemblies: true });
    expect(edited.status).toBe(200);
    expect(edited.body.assembliesUpdated).toBe(1);
    const [assembly] = await testDb().select().from(assemblies).where(eq(assemblies.id, dc.body.id));
    expect(assembly!.hazard).toBe("high");
    // A DC does not protect a high health hazard: the inventory says so.
    const page = await inspector.get(`/inspector/assemblies/${dc.body.id}`);
    expect(page.text).toContain("does not protect a high health hazard");
    const mismatches = await inspector.get("/inspector/inventory?view=assemblies&show=mismatch");
    expect(mismatches.text).toContain(assembly!.serial);
    const audit = await testDb().select().from(auditLog).where(and(eq(auditLog.entityType, "site"), eq(auditLog.entityId, String(siteId))));
    expect(audit.map((a) => a.action)).toEqual(expect.arrayContaining(["site.created", "site.updated"]));
  });

  test("a duplicate account number and bad fields are refused, nothing written", async () => {
    const inspector = await as(world.inspectorEmail);
    const existing = await createSite(world.programId);
    const before = await countAllTables();
    const duplicate = await inspector.post("/api/inspector/sites", { accountNumber: existing.accountNumber, name: "Copy", addressLine1: "1 Row", city: "Quillmere", hazard: "low" });
    expect(duplicate.status).toBe(422);
    expect(duplicate.body.fieldErrors.accountNumber[0]).toMatch(/another site/);
    const bad = await inspector.post("/api/inspector/sites", { accountNumber: "", name: "", addressLine1: "", city: "", hazard: "extreme" });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.fieldErrors)).toEqual(expect.arrayContaining(["accountNumber", "name", "addressLine1", "city", "hazard"]));
    expect(await countAllTables()).toEqual(before);
  });

  test("contacts are added, notices switched off and portal invitations sent", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const email = `owner.${Date.now().toString(36)}@owners.example`;
    const added = await inspector.post(`/api/inspector/sites/${site.id}/owners`, { name: "Bronwen Ashby", email, phone: "(555) 044-1212", relation: "manager" });
    expect(added.status).toBe(200);
    const ownerId = added.body.ownerId as number;
    expect((await inspector.patch(`/api/inspector/sites/${site.id}/owners/${ownerId}`, { receivesNotices: false })).status).toBe(200);
    const [link] = await testDb().select().from(siteOwners).where(and(eq(siteOwners.siteId, site.id), eq(siteOwners.ownerId, ownerId)));
    expect(link).toMatchObject({ relation: "manager", receivesNotices: false });

    const invited = await inspector.post(`/api/inspector/owners/${ownerId}/invitation`);
    expect(invited.status).toBe(200);
    expect(invited.body.status).toBe("invited");
    const mail = await waitForMessage(email);
    expect(mail.subject).toMatch(/account is ready to set up/);
    const [owner] = await testDb().select().from(owners).where(eq(owners.id, ownerId));
    const [account] = await testDb().select().from(users).where(eq(users.id, owner!.userId!));
    expect(account).toMatchObject({ role: "owner", status: "invited", email });

    const noEmail = await createOwner(world.programId, site.id, { email: null });
    const refused = await inspector.post(`/api/inspector/owners/${noEmail}/invitation`);
    expect(refused.status).toBe(422);
    expect(refused.body.error).toMatch(/no e-mail address/);

    expect((await inspector.patch(`/api/inspector/sites/${site.id}/owners/${ownerId}`, { remove: true })).status).toBe(200);
    expect(await testDb().select().from(siteOwners).where(and(eq(siteOwners.siteId, site.id), eq(siteOwners.ownerId, ownerId)))).toHaveLength(0);
    expect(await testDb().select().from(owners).where(eq(owners.id, ownerId))).toHaveLength(1);
  });

  test("another program's site and owner are not found", async () => {
    const site = await createSite(world.programId);
    const ownerId = await createOwner(world.programId, site.id);
    const neighbour = await as(demoAccounts.inspector);
    expect((await neighbour.get(`/inspector/sites/${site.id}`)).status).toBe(404);
    expect((await neighbour.get(`/inspector/owners/${ownerId}`)).status).toBe(404);
    expect((await neighbour.patch(`/api/inspector/owners/${ownerId}`, { name: "Taken Over" })).status).toBe(404);
  });
});

describe("assemblies", () => {
  test("editing the installation date of a never-tested assembly moves its due date", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const { id } = await createAssembly(world.programId, site.id, { installedOn: null });
    const [before] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(before!.nextDueOn).toBeNull();
    const installedOn = addDays(today(), -5);
    expect((await inspector.patch(`/api/inspector/assemblies/${id}`, assemblyBody({ serial: before!.serial, installedOn }))).status).toBe(200);
    const [after] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(after!.nextDueOn).toBe(installedOn);
  });

  test("removing keeps the history and stops the due date; putting back restores it", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const { id } = await createAssembly(world.programId, site.id);
    const passedOn = addMonths(today(), -3);
    await createReport({ programId: world.programId, assemblyId: id, tester, testedOn: passedOn, status: "accepted" });
    expect((await inspector.patch(`/api/inspector/assemblies/${id}`, assemblyBody({ serial: (await testDb().select().from(assemblies).where(eq(assemblies.id, id)))[0]!.serial, installedOn: "2019-01-01" }))).status).toBe(200);
    const removed = await inspector.post(`/api/inspector/assemblies/${id}/status`, { action: "remove", on: today(), note: "Service line abandoned." });
    expect(removed.status).toBe(200);
    const [row] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(row).toMatchObject({ status: "removed", removedOn: today(), baseState: "inactive", nextDueOn: null, lastPassedOn: passedOn });
    expect(await testDb().select().from(testReports).where(eq(testReports.assemblyId, id))).toHaveLength(1);
    const back = await inspector.post(`/api/inspector/assemblies/${id}/status`, { action: "reinstate", note: "Reconnected." });
    expect(back.status).toBe(200);
    const [restored] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(restored).toMatchObject({ status: "active", baseState: "active", nextDueOn: dueDateAfterPass(passedOn) });
  });

  test("replacing records the new assembly, due at its installation", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const { id } = await createAssembly(world.programId, site.id);
    const on = addDays(today(), -1);
    const replaced = await inspector.post(`/api/inspector/assemblies/${id}/status`, { action: "replace", on, note: "", replacement: assemblyBody({ installedOn: on }) });
    expect(replaced.status).toBe(200);
    const newId = replaced.body.replacementId as number;
    const [old] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(old).toMatchObject({ status: "replaced", replacedById: newId, removedOn: on });
    const [fresh] = await testDb().select().from(assemblies).where(eq(assemblies.id, newId));
    expect(fresh).toMatchObject({ siteId: site.id, status: "active", nextDueOn: on });
  });

  test("a future removal date, a second removal and a serial already on file are refused", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const { id } = await createAssembly(world.programId, site.id);
    const other = await createAssembly(world.programId, site.id);
    const before = await countAllTables();
    expect((await inspector.post(`/api/inspector/assemblies/${id}/status`, { action: "remove", on: addDays(today(), 3) })).status).toBe(422);
    const clash = await inspector.patch(`/api/inspector/assemblies/${id}`, assemblyBody({ make: "Tallowmere", serial: other.serial }));
    expect(clash.status).toBe(422);
    expect(clash.body.fieldErrors.serial[0]).toMatch(/already has this make and serial/);
    expect((await inspector.post(`/api/inspector/assemblies/${id}/status`, { action: "reinstate" })).status).toBe(409);
    expect(await countAllTables()).toEqual(before);
  });

  test("a field registration is confirmed with corrections, and then counts", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const installedOn = addDays(today(), -4);
    const { id } = await createAssembly(world.programId, site.id, { status: "awaiting_confirmation", installedOn, baseState: "inactive", nextDueOn: null });
    const confirmed = await inspector.post(`/api/inspector/assemblies/${id}/confirm`, assemblyBody({ model: "TR-4S", installedOn }));
    expect(confirmed.status).toBe(200);
    const [row] = await testDb().select().from(assemblies).where(eq(assemblies.id, id));
    expect(row).toMatchObject({ status: "active", model: "TR-4S", baseState: "active", nextDueOn: installedOn });
    expect((await inspector.post(`/api/inspector/assemblies/${id}/confirm`, assemblyBody())).status).toBe(409);
  });

  test("merging a field registration moves its reports to the assembly on file and recomputes both", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const existing = await createAssembly(world.programId, site.id);
    const registration = await createAssembly(world.programId, site.id, { status: "awaiting_confirmation", serial: `DUP${Date.now().toString(36)}`, baseState: "inactive", nextDueOn: null });
    const testedOn = addDays(today(), -2);
    const { id: reportId } = await createReport({ programId: world.programId, assemblyId: registration.id, tester, testedOn, status: "accepted" });
    const page = await inspector.get(`/inspector/assemblies/${registration.id}`);
    expect(page.text).toContain(`#${existing.id}`);
    const merged = await inspector.post(`/api/inspector/assemblies/${registration.id}/merge`, { targetId: existing.id });
    expect(merged.status).toBe(200);
    expect(merged.body.movedReports).toBe(1);
    const [report] = await testDb().select().from(testReports).where(eq(testReports.id, reportId));
    expect(report!.assemblyId).toBe(existing.id);
    const [target] = await testDb().select().from(assemblies).where(eq(assemblies.id, existing.id));
    expect(target).toMatchObject({ lastPassedOn: testedOn, nextDueOn: dueDateAfterPass(testedOn) });
    const [source] = await testDb().select().from(assemblies).where(eq(assemblies.id, registration.id));
    expect(source).toMatchObject({ status: "removed", mergedIntoId: existing.id, lastTestedOn: null });
    // It no longer shows in the site's assemblies.
    const sitePage = await inspector.get(`/inspector/sites/${site.id}`);
    expect(sitePage.text).not.toContain(registration.serial);
  });

  test("merging into itself, into another kind or out of the program is refused", async () => {
    const inspector = await as(world.inspectorEmail);
    const site = await createSite(world.programId);
    const registration = await createAssembly(world.programId, site.id, { status: "awaiting_confirmation" });
    const pvb = await createAssembly(world.programId, site.id, { kind: "PVB", hazard: "low" });
    const before = await countAllTables();
    expect((await inspector.post(`/api/inspector/assemblies/${registration.id}/merge`, { targetId: registration.id })).status).toBe(422);
    const wrongKind = await inspector.post(`/api/inspector/assemblies/${registration.id}/merge`, { targetId: pvb.id });
    expect(wrongKind.status).toBe(422);
    expect(wrongKind.body.error).toMatch(/cannot be merged into a PVB/);
    const [demoAssembly] = await testDb().select({ id: assemblies.id }).from(assemblies).where(eq(assemblies.programId, 1)).limit(1);
    expect((await inspector.post(`/api/inspector/assemblies/${registration.id}/merge`, { targetId: demoAssembly!.id })).status).toBe(422);
    expect(await countAllTables()).toEqual(before);
  });

  test("testers and owners cannot touch the inventory", async () => {
    const site = await createSite(world.programId);
    const { id } = await createAssembly(world.programId, site.id);
    for (const email of [demoAccounts.tester, demoAccounts.owner]) {
      const other = await as(email);
      expect((await other.patch(`/api/inspector/assemblies/${id}`, assemblyBody())).status).toBe(403);
      expect((await other.get(`/inspector/assemblies/${id}`)).status).toBe(403);
      expect((await other.patch(`/api/inspector/sites/${site.id}`, {})).status).toBe(403);
    }
    const [unchanged] = await testDb().select().from(sites).where(eq(sites.id, site.id));
    expect(unchanged!.name).toBe("Ottersedge Dairy");
  });
});
