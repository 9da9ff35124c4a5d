// Drafts saved as the tester types: a newer revision always wins, an older one that arrives
// late changes nothing, another tester's draft does not exist, bad drafts are refused.
import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { reportDrafts } from "@/db/schema";
import { newDraft } from "@/lib/forms/field-test-draft";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { as } from "../helpers/http";
import { createAssembly, createTester, today } from "./tester-fixtures";

afterAll(closeTestDb);

const key = () => `k${Math.random().toString(36).slice(2)}${Date.now().toString(36)}`.padEnd(20, "x");

function draftFor(assemblyId: number, relief: string) {
  const draft = newDraft({ assemblyId, kind: "RP", unit: "psid", testedOn: today(), testedTime: "10:15" });
  draft.initial.text.reliefValveOpeningPoint = relief;
  return draft;
}

describe("drafts", () => {
  test("saved, read back, listed, overwritten by a newer revision only, and discarded", async () => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const clientKey = key();
    const first = await session.put(`/api/reports/drafts/${clientKey}`, { clientRevision: 5, data: draftFor(assembly.id, "2.") });
    expect(first.status, JSON.stringify(first.body)).toBe(200);
    expect(first.body).toMatchObject({ clientRevision: 5, isStored: true });

    // An older save that arrives late (a slow request) keeps the newer draft.
    const late = await session.put(`/api/reports/drafts/${clientKey}`, { clientRevision: 4, data: draftFor(assembly.id, "9.9") });
    expect(late.status).toBe(200);
    expect(late.body).toMatchObject({ clientRevision: 5, isStored: false });
    expect((await session.get(`/api/reports/drafts/${clientKey}`)).body.data.initial.text.reliefValveOpeningPoint).toBe("2.");

    const newer = await session.put(`/api/reports/drafts/${clientKey}`, { clientRevision: 6, data: draftFor(assembly.id, "2.4") });
    expect(newer.body).toMatchObject({ clientRevision: 6, isStored: true });
    const read = await session.get(`/api/reports/drafts/${clientKey}`);
    expect(read.body).toMatchObject({ clientKey, clientRevision: 6 });
    expect(read.body.data.initial.text.reliefValveOpeningPoint).toBe("2.4");

    const list = await session.get(`/api/reports/drafts?assembly=${assembly.id}`);
    expect(list.body.drafts).toEqual([expect.objectContaining({ clientKey, assemblyId: assembly.id, kind: "RP", serial: assembly.serial })]);
    const form = await session.get(`/tester/reports/new?assembly=${assembly.id}`);
    expect(form.status).toBe(200);
    expect(form.text).toContain(clientKey);

    expect((await session.delete(`/api/reports/drafts/${clientKey}`)).body).toEqual({ isDeleted: true });
    expect((await session.delete(`/api/reports/drafts/${clientKey}`)).body).toEqual({ isDeleted: false });
    expect((await session.get(`/api/reports/drafts/${clientKey}`)).status).toBe(404);
  });

  test("another tester's draft does not exist for them, and their save under the same key is their own", async () => {
    const tester = await createTester();
    const stranger = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const clientKey = key();
    await (await as(tester.email)).put(`/api/reports/drafts/${clientKey}`, { clientRevision: 1, data: draftFor(assembly.id, "2.2") });
    const strangerSession = await as(stranger.email);
    expect((await strangerSession.get(`/api/reports/drafts/${clientKey}`)).status).toBe(404);
    expect((await strangerSession.delete(`/api/reports/drafts/${clientKey}`)).body).toEqual({ isDeleted: false });
    const rows = await testDb().select().from(reportDrafts).where(and(eq(reportDrafts.testerId, tester.id), eq(reportDrafts.clientKey, clientKey)));
    expect(rows).toHaveLength(1);
  });

  test.each([
    { label: "a malformed key", path: "/api/reports/drafts/bad key!", body: (id: number) => ({ clientRevision: 1, data: draftFor(id, "1") }), status: 422 },
    { label: "no revision", path: `/api/reports/drafts/${"a".repeat(20)}`, body: (id: number) => ({ data: draftFor(id, "1") }), status: 422 },
    { label: "data that is not a draft", path: `/api/reports/drafts/${"b".repeat(20)}`, body: () => ({ clientRevision: 1, data: { hello: "world" } }), status: 422 },
    { label: "an assembly id that cannot exist", path: `/api/reports/drafts/${"c".repeat(20)}`, body: () => ({ clientRevision: 1, data: { ...draftFor(1, "1"), assemblyId: 0 } }), status: 422 },
  ])("refused: $label", async ({ path, body, status }) => {
    const tester = await createTester();
    const assembly = await createAssembly({ kind: "RP" });
    const session = await as(tester.email);
    const before = await countAllTables();
    const response = await session.put(path, body(assembly.id));
    expect(response.status).toBe(status);
    expect(typeof response.body.error).toBe("string");
    expect(await countAllTables()).toEqual(before);
  });

  test("refused: a draft for an assembly in a program that did not approve the tester", async () => {
    const tester = await createTester({ programIds: [2] });
    const assembly = await createAssembly({ programId: 1, kind: "RP" });
    const before = await countAllTables();
    const response = await (await as(tester.email)).put(`/api/reports/drafts/${key()}`, { clientRevision: 1, data: draftFor(assembly.id, "2.0") });
    expect(response.status).toBe(404);
    expect(await countAllTables()).toEqual(before);
  });
});
