// The tester's pages and lists: my reports (server-side paging, sorting, filtering), coming
// due, the tag sheet with its QR links, and the QR target that opens a new test.
import { execFileSync } from "node:child_process";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { assemblies, testReports } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { addDays, addMonths } from "@/lib/rules";
import { closeTestDb, testDb } from "../helpers/db";
import { api, APP_URL, as } from "../helpers/http";
import { createAssembly, createTester, rpSubmission, today } from "./tester-fixtures";

afterAll(closeTestDb);

async function fileSome(count: number) {
  const tester = await createTester();
  const session = await as(tester.email);
  const ids: number[] = [];
  for (let i = 0; i < count; i++) {
    const assembly = await createAssembly({ kind: "RP" });
    const failing = i % 3 === 0;
    const response = await session.post(
      "/api/reports",
      rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn: addDays(today(), -i), testedTime: "09:00", initial: failing ? { reliefValveOpeningPoint: 1.5, check1Differential: 6.0 + i / 10, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true } : { reliefValveOpeningPoint: 2.5, check1Differential: 6.0 + i / 10, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true } }),
    );
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    ids.push(response.body.id);
  }
  return { tester, session, ids };
}

describe("my reports", () => {
  test("pages, sorts and filters on the server, and shows only the tester's own", async () => {
    const { session, ids } = await fileSome(7);
    const first = await session.get("/api/reports/mine?pageSize=5&page=1");
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ total: 7, page: 1, pageSize: 5, pageCount: 2 });
    expect(first.body.rows).toHaveLength(5);
    expect(first.body.rows[0].id).toBe(ids[0]);
    const second = await session.get("/api/reports/mine?pageSize=5&page=2");
    expect(second.body.rows.map((r: { id: number }) => r.id)).toEqual([ids[5], ids[6]]);

    const oldestFirst = await session.get("/api/reports/mine?sort=testedOn&dir=asc&pageSize=10");
    expect(oldestFirst.body.rows[0].id).toBe(ids[6]);
    // The outcome column lists "pass" before "fail", so descending puts the failures first.
    const failedFirst = await session.get("/api/reports/mine?sort=outcome&dir=desc&pageSize=10");
    expect(failedFirst.body.rows[0].finalOutcome).toBe("fail");

    const window = await session.get(`/api/reports/mine?from=${addDays(today(), -2)}&to=${today()}`);
    expect(window.body.total).toBe(3);
    const [one] = await testDb().select({ reportNumber: testReports.reportNumber }).from(testReports).where(eq(testReports.id, ids[2]!));
    const byNumber = await session.get(`/api/reports/mine?q=${one!.reportNumber}`);
    expect(byNumber.body.rows.map((r: { id: number }) => r.id)).toEqual([ids[2]]);

    await testDb().update(testReports).set({ status: "returned" }).where(eq(testReports.id, ids[1]!));
    const returned = await session.get("/api/reports/mine?status=returned");
    expect(returned.body.rows.map((r: { id: number }) => r.id)).toEqual([ids[1]]);
    expect((await session.get("/tester")).text).toContain("Returned reports to correct");

    const stranger = await createTester();
    expect((await (await as(stranger.email)).get("/api/reports/mine")).body.total).toBe(0);
    expect((await session.get("/tester/reports?status=returned")).status).toBe(200);
  });

  test.each([
    { label: "an unknown sort", query: "sort=colour", field: "sort" },
    { label: "an unknown status", query: "status=lost", field: "status" },
    { label: "a date that is not one", query: "from=yesterday", field: "from" },
    { label: "an end before the start", query: "from=2026-05-01&to=2026-04-01", field: "to" },
    { label: "a page size over 100", query: "pageSize=500", field: "pageSize" },
  ])("refused: $label", async ({ query, field }) => {
    const tester = await createTester();
    const response = await (await as(tester.email)).get(`/api/reports/mine?${query}`);
    expect(response.status).toBe(422);
    expect(Object.keys(response.body.fieldErrors)).toContain(field);
  });
});

describe("coming due", () => {
  test("the assemblies the tester last tested that fall due within 60 days, with the site contact", async () => {
    const elevenMonthsAgo = addMonths(addDays(today(), 20), -12);
    // The kit was checked shortly before the oldest test, so every test here had a valid kit.
    const tester = await createTester({ kitVerifiedOn: addDays(elevenMonthsAgo, -10) });
    const session = await as(tester.email);
    const soon = await createAssembly({ kind: "RP", installedOn: addMonths(today(), -30) });
    const later = await createAssembly({ kind: "RP", installedOn: addMonths(today(), -30) });
    const takenOver = await createAssembly({ kind: "RP", installedOn: addMonths(today(), -30) });
    // Tested 11 months ago: due in about a month. Tested 6 months ago: not within 60 days.
    for (const [assembly, testedOn] of [[soon, elevenMonthsAgo], [later, addMonths(today(), -6)], [takenOver, elevenMonthsAgo]] as const) {
      const filed = await session.post("/api/reports", rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name, testedOn }));
      expect(filed.status, JSON.stringify(filed.body)).toBe(201);
    }
    // Someone else tested this one since: it is no longer this tester's customer.
    const other = await createTester();
    expect((await (await as(other.email)).post("/api/reports", rpSubmission({ assemblyId: takenOver.id, kitId: other.kitId, testerName: other.name, testedOn: addDays(today(), -1) }))).status).toBe(201);
    const page = await session.get("/tester/coming-due");
    expect(page.status).toBe(200);
    expect(page.text).toContain(`data-assembly="${soon.id}"`);
    expect(page.text).not.toContain(`data-assembly="${later.id}"`);
    expect(page.text).not.toContain(`data-assembly="${takenOver.id}"`);
    expect(page.text).toContain("Tobiah Marlowe");
    const [facts] = await testDb().select({ nextDueOn: assemblies.nextDueOn }).from(assemblies).where(eq(assemblies.id, soon.id));
    expect(page.text).toContain(facts!.nextDueOn!);
  });
});

describe("tags and the QR target", () => {
  test("a tag sheet for assemblies in the tester's programs, each QR link opening a new test", async () => {
    const tester = await createTester();
    const a = await createAssembly({ kind: "RP" });
    const b = await createAssembly({ kind: "PVB" });
    const session = await as(tester.email);
    const response = await fetch(new URL(`/api/assemblies/tags?ids=${a.id},${b.id}`, APP_URL), { headers: { cookie: session.cookie } });
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/pdf");
    const text = execFileSync("pdftotext", ["-", "-"], { input: Buffer.from(await response.arrayBuffer()) }).toString("utf8");
    expect(text).toContain(`QV-A${String(a.id).padStart(6, "0")}`);
    expect(text).toContain(a.serial);
    expect(text).toContain(`/a/${b.id}`);
    expect(text).toContain("Scan to start a test");
  });

  test("refused: another program's assembly, no ids, too many ids", async () => {
    const tester = await createTester({ programIds: [1] });
    const elsewhere = await createAssembly({ programId: 2, kind: "DC" });
    const session = await as(tester.email);
    expect((await session.get(`/api/assemblies/tags?ids=${elsewhere.id}`)).status).toBe(404);
    expect((await session.get("/api/assemblies/tags")).status).toBe(422);
    expect((await session.get("/api/assemblies/tags?ids=1,,2")).status).toBe(422);
    expect((await session.get(`/api/assemblies/tags?ids=${Array.from({ length: 61 }, (_, i) => i + 1).join(",")}`)).status).toBe(422);
    expect((await (await as(demoAccounts.owner)).get("/api/assemblies/tags?ids=1")).status).toBe(403);
  });

  test("scanning a tag: signed out → sign-in and back; a tester → a new test for that assembly", async () => {
    const assembly = await createAssembly({ kind: "RP" });
    const anon = await api().get(`/a/${assembly.id}`).redirects(0);
    expect(anon.status).toBe(307);
    expect(anon.headers.location).toBe(`/login?next=${encodeURIComponent(`/a/${assembly.id}`)}`);
    const tester = await createTester();
    const scanned = await (await as(tester.email)).get(`/a/${assembly.id}`);
    expect(scanned.status).toBe(307);
    expect(scanned.headers.location).toBe(`/tester/reports/new?assembly=${assembly.id}`);
    expect((await (await as(demoAccounts.inspector)).get(`/a/${assembly.id}`)).headers.location).toBe(`/inspector/assemblies/${assembly.id}`);
    expect((await api().get("/a/not-a-number").redirects(0)).status).toBe(404);
  });

  test("the new-test page opens for an approved tester, says why for others", async () => {
    const assembly = await createAssembly({ kind: "RP" });
    const tester = await createTester();
    const page = await (await as(tester.email)).get(`/tester/reports/new?assembly=${assembly.id}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain(assembly.serial);
    const elsewhere = await createTester({ programIds: [2] });
    expect((await (await as(elsewhere.email)).get(`/tester/reports/new?assembly=${assembly.id}`)).status).toBe(404);
    const suspended = await createTester({ approval: "suspended" });
    const refused = await (await as(suspended.email)).get(`/tester/reports/new?assembly=${assembly.id}`);
    expect(refused.status).toBe(200);
    expect(refused.text).toContain("has suspended your approval");
  });
});
