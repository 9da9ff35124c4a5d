// Inventory CSV import over HTTP: good, bad and duplicate rows; re-importing the same file adds
// nothing; the per-row error report (formula cells neutralised); and the files refused whole —
// wrong columns, a bad encoding, a 50 MB file, a second import at once — with nothing written.
import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { assemblies, importJobs, owners, siteOwners, sites } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { api, as, ORIGIN } from "../helpers/http";
import { createScratchProgram, userIdOf, type ScratchProgram } from "./inspector-fixtures";

afterAll(closeTestDb);

let world: ScratchProgram;
beforeAll(async () => {
  world = await createScratchProgram();
});

const mapping = {
  accountNumber: "Account",
  siteName: "Site name",
  addressLine1: "Service address",
  city: "City",
  siteHazard: "Hazard",
  ownerName: "Owner",
  ownerEmail: "Owner email",
  kind: "Type",
  make: "Manufacturer",
  model: "Model",
  serial: "Serial number",
  location: "Location",
  installedOn: "Installed",
};

async function upload(email: string, content: string | Buffer, name = "inventory.csv") {
  const session = await as(email);
  const response = await api().post("/api/files?purpose=inventory_import").set("Cookie", session.cookie).set("Origin", ORIGIN).attach("file", Buffer.isBuffer(content) ? content : Buffer.from(content, "utf8"), name);
  return { session, response };
}

async function runImport(email: string, content: string | Buffer, map: Record<string, string> = mapping) {
  const { session, response } = await upload(email, content);
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  const started = await session.post("/api/inspector/imports", { fileId: response.body.id, mapping: map });
  return { session, started, fileId: response.body.id as number };
}

async function waitForJob(session: Awaited<ReturnType<typeof as>>, jobId: number) {
  for (let i = 0; i < 300; i++) {
    const job = await session.get(`/api/inspector/imports/${jobId}`);
    expect(job.status).toBe(200);
    if (job.body.status !== "running") return job.body;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error("the import did not finish");
}

const header = "Account,Site name,Service address,City,Hazard,Owner,Owner email,Type,Manufacturer,Model,Serial number,Location,Installed";

function inventoryCsv(prefix: string): string {
  return [
    header,
    `${prefix}01,Fernhollow Bakery,12 Tansy Court,Quillmere,high,Orla Bramblecote,orla.${prefix}@owners.example,RP,Tallowmere,TR-4,${prefix}-S1,meter vault at the street,2019-04-12`,
    // Same account, second assembly, US date format.
    `${prefix}01,Fernhollow Bakery,12 Tansy Court,Quillmere,high,Orla Bramblecote,orla.${prefix}@owners.example,DC,Tallowmere,TD-2,${prefix}-S2,kitchen branch line,04/15/2020`,
    "",
    // No serial: matched on site + location.
    `${prefix}02,Marigold Laundry,40 Heronsgate Way,Quillmere,low,,,PVB,,,,irrigation box by the drive,2021-06-01`,
    // Bad: e-mail, kind, future date, missing site fields for a new account.
    `${prefix}03,Brackwater Dental,7 Saltmarsh Row,Quillmere,high,Ida Brack,not-an-email,RP,Corvane,CV-24,${prefix}-S4,mechanical room,2018-01-01`,
    `${prefix}04,Copperbeech Garage,9 Mallowbank Street,Quillmere,low,,,ZZ,Corvane,CV-12,${prefix}-S5,service line,2018-01-01`,
    `${prefix}05,"=HYPERLINK(""http://evil.example"")",5 Saltmarsh Row,Quillmere,low,,,DC,Brindlewick,BW-500,${prefix}-S6,service line,2099-01-01`,
    `${prefix}06,,,,,,,RP,Corvane,CV-24,${prefix}-S7,service line,2018-01-01`,
    // Duplicate of the first assembly inside the file.
    `${prefix}01,Fernhollow Bakery,12 Tansy Court,Quillmere,high,,,RP,Tallowmere,TR-4,${prefix}-S1,meter vault at the street,2019-04-12`,
    // A row that does not fit the header.
    `${prefix}07,Short Row`,
  ].join("\r\n") + "\r\n";
}

describe("importing an inventory CSV", () => {
  test("valid rows go in, bad rows are reported and change nothing, re-importing adds nothing", async () => {
    const prefix = `IM${Date.now().toString(36).toUpperCase()}`;
    const csv = inventoryCsv(prefix);
    const { session, started } = await runImport(world.inspectorEmail, csv);
    expect(started.status, JSON.stringify(started.body)).toBe(202);
    expect(started.body.totalRows).toBe(9);
    expect(started.body.emptyLines).toBe(1);
    const job = await waitForJob(session, started.body.jobId);
    expect(job.status).toBe("finished");
    expect(job).toMatchObject({ insertedRows: 3, failedRows: 6, totalRows: 9 });
    expect(job.message).toMatch(/1 empty line skipped/);

    const db = testDb();
    const imported = await db.select().from(sites).where(and(eq(sites.programId, world.programId), inArray(sites.accountNumber, [`${prefix}01`, `${prefix}02`, `${prefix}03`, `${prefix}04`, `${prefix}05`, `${prefix}06`, `${prefix}07`])));
    expect(imported.map((s) => s.accountNumber).sort()).toEqual([`${prefix}01`, `${prefix}02`]);
    const bakery = imported.find((s) => s.accountNumber === `${prefix}01`)!;
    expect(bakery).toMatchObject({ name: "Fernhollow Bakery", hazard: "high", city: "Quillmere" });
    const bakeryAssemblies = await db.select().from(assemblies).where(eq(assemblies.siteId, bakery.id));
    expect(bakeryAssemblies.map((a) => a.serial).sort()).toEqual([`${prefix}-S1`, `${prefix}-S2`]);
    const dc = bakeryAssemblies.find((a) => a.kind === "DC")!;
    expect(dc.installedOn).toBe("2020-04-15");
    // Never tested: due at installation, so an old installation is overdue at once.
    expect(dc).toMatchObject({ baseState: "active", nextDueOn: "2020-04-15", lastTestedOn: null });
    const links = await db.select().from(siteOwners).innerJoin(owners, eq(owners.id, siteOwners.ownerId)).where(eq(siteOwners.siteId, bakery.id));
    expect(links.map((l) => l.owners.email)).toEqual([`orla.${prefix.toLowerCase()}@owners.example`]);

    // The error report: every bad row, why, and its cells — a formula cell made harmless.
    expect(job.errorFileId).toBeTruthy();
    const report = await session.get(`/api/files/${job.errorFileId}`);
    expect(report.status).toBe(200);
    expect(report.headers["content-type"]).toMatch(/text\/csv/);
    const text = report.text;
    expect(text).toContain("Row,Why it was not imported,Account");
    expect(text).toMatch(/6,the owner e-mail is not an e-mail address/);
    expect(text).toMatch(/7,"the assembly kind “ZZ” is not one of/);
    expect(text).toMatch(/8,the installation date 2099-01-01 is in the future/);
    expect(text).toContain(`"'=HYPERLINK(""http://evil.example"")"`);
    expect(text).not.toMatch(/,=HYPERLINK/);
    expect(text).toMatch(/9,"the new account .*06 needs a site name, an address and a town"/);
    expect(text).toMatch(/10,the same assembly as row 2/);
    expect(text).toMatch(/11,the row has 2 values but the header has 13 columns/);

    // The same file again: nothing new, nothing changed, no duplicates.
    const before = await db.select({ id: assemblies.id }).from(assemblies).where(eq(assemblies.programId, world.programId));
    const again = await runImport(world.inspectorEmail, csv);
    expect(again.started.status).toBe(202);
    const second = await waitForJob(again.session, again.started.body.jobId);
    expect(second).toMatchObject({ status: "finished", insertedRows: 0, updatedRows: 0, unchangedRows: 3, failedRows: 6 });
    const after = await db.select({ id: assemblies.id }).from(assemblies).where(eq(assemblies.programId, world.programId));
    expect(after.length).toBe(before.length);

    // A corrected row updates what is on file; blank cells leave values alone.
    const corrected = [header, `${prefix}01,,,,,,,RP,Tallowmere,TR-4X,${prefix}-S1,,`].join("\n");
    const third = await runImport(world.inspectorEmail, corrected);
    const done = await waitForJob(third.session, third.started.body.jobId);
    expect(done).toMatchObject({ insertedRows: 0, updatedRows: 1, failedRows: 0 });
    const [rp] = await db.select().from(assemblies).where(and(eq(assemblies.programId, world.programId), eq(assemblies.serial, `${prefix}-S1`)));
    expect(rp).toMatchObject({ model: "TR-4X", location: "meter vault at the street", installedOn: "2019-04-12" });
    const [site] = await db.select().from(sites).where(eq(sites.id, bakery.id));
    expect(site!.name).toBe("Fernhollow Bakery");
  });

  test("a serial already on file at another site is reported, not moved", async () => {
    const prefix = `MV${Date.now().toString(36).toUpperCase()}`;
    const first = await runImport(world.inspectorEmail, [header, `${prefix}01,Kestrel Hall,1 Kestrel Rise,Quillmere,high,,,RP,Corvane,CV-24,${prefix}-X,boiler room,2018-05-05`].join("\n"));
    await waitForJob(first.session, first.started.body.jobId);
    const second = await runImport(world.inspectorEmail, [header, `${prefix}02,Otter Hall,2 Kestrel Rise,Quillmere,high,,,RP,Corvane,CV-24,${prefix}-X,boiler room,2018-05-05`].join("\n"));
    const job = await waitForJob(second.session, second.started.body.jobId);
    expect(job).toMatchObject({ insertedRows: 0, failedRows: 1 });
    const report = await second.session.get(`/api/files/${job.errorFileId}`);
    expect(report.text).toMatch(/already on file at another site/);
    // The failed row's new site did not go in either.
    expect(await testDb().select().from(sites).where(and(eq(sites.programId, world.programId), eq(sites.accountNumber, `${prefix}02`)))).toHaveLength(0);
  });

  test("progress and recent imports are visible to the program's staff only", async () => {
    const prefix = `PV${Date.now().toString(36).toUpperCase()}`;
    const { session, started } = await runImport(world.inspectorEmail, [header, `${prefix}01,Heron Mill,3 Heronsgate Way,Quillmere,low,,,DC,Corvane,CV-12,${prefix}-1,service line,2020-01-01`].join("\n"));
    await waitForJob(session, started.body.jobId);
    const list = await session.get("/api/inspector/imports");
    expect(list.body.jobs.map((j: { id: number }) => j.id)).toContain(started.body.jobId);
    const neighbour = await as(demoAccounts.inspector);
    expect((await neighbour.get(`/api/inspector/imports/${started.body.jobId}`)).status).toBe(404);
    const tester = await as(demoAccounts.tester);
    expect((await tester.get(`/api/inspector/imports/${started.body.jobId}`)).status).toBe(403);
    const page = await session.get(`/inspector/inventory/import?job=${started.body.jobId}`);
    expect(page.status).toBe(200);
  });
});

describe("files refused whole, with nothing written", () => {
  test("wrong columns: the mapping names a column the file does not have", async () => {
    const { session, response } = await upload(world.inspectorEmail, "Acct,Name\nA1,Somewhere\n");
    const before = await countAllTables();
    const started = await session.post("/api/inspector/imports", { fileId: response.body.id, mapping });
    expect(started.status).toBe(422);
    expect(started.body.error).toMatch(/The file has no column “Account”/);
    expect(await countAllTables()).toEqual(before);
  });

  test("the account number must be mapped", async () => {
    const { session, response } = await upload(world.inspectorEmail, `${header}\nA1,B,C,D,low,,,RP,M,N,S,L,2020-01-01\n`);
    const before = await countAllTables();
    const started = await session.post("/api/inspector/imports", { fileId: response.body.id, mapping: { siteName: "Site name" } });
    expect(started.status).toBe(422);
    expect(started.body.error).toMatch(/Account number/);
    expect(await countAllTables()).toEqual(before);
  });

  test("a bad encoding deep in the file is found, with its line", async () => {
    // 70 KB of good lines (past what the upload sniffs), then a Windows-1252 "é".
    const lines = [header];
    for (let i = 0; i < 900; i++) lines.push(`ENC${i},Site ${i},${i} Tansy Court,Quillmere,low,,,DC,Corvane,CV-12,ENC-${i}-${Date.now()},service line,2020-01-01`);
    const good = Buffer.from(`${lines.join("\n")}\n`, "utf8");
    const bad = Buffer.concat([good, Buffer.from("ENC999,Caf"), Buffer.from([0xe9]), Buffer.from(" Quillmere,1 Row,Quillmere,low,,,DC,Corvane,CV-12,ENC-X,service line,2020-01-01\n")]);
    expect(good.length).toBeGreaterThan(65536);
    const { session, response } = await upload(world.inspectorEmail, bad);
    expect(response.status).toBe(201);
    const before = await countAllTables();
    const started = await session.post("/api/inspector/imports", { fileId: response.body.id, mapping });
    expect(started.status).toBe(422);
    expect(started.body.error).toMatch(/not UTF-8 text: line 902/);
    expect(started.body.error).toMatch(/Nothing was imported/);
    expect(await countAllTables()).toEqual(before);
  });

  test("a bad encoding at the start is refused by the upload itself", async () => {
    const latin1 = Buffer.concat([Buffer.from(`${header}\nA1,Caf`), Buffer.from([0xe9]), Buffer.from(",1 Row,Quillmere,low,,,DC,M,N,S,L,2020-01-01\n")]);
    const { response } = await upload(world.inspectorEmail, latin1);
    expect(response.status).toBe(422);
    expect(response.body.error).toMatch(/not a CSV file/);
  });

  test("an empty file and a header without rows are refused clearly", async () => {
    const empty = await upload(world.inspectorEmail, Buffer.alloc(0));
    expect(empty.response.status).toBe(422);
    const { session, response } = await upload(world.inspectorEmail, `${header}\n\n\n`);
    const started = await session.post("/api/inspector/imports", { fileId: response.body.id, mapping });
    expect(started.status).toBe(422);
    expect(started.body.error).toMatch(/no rows to import/);
  });

  test("a 50 MB file is refused with the limit and what to do", async () => {
    const row = `BIG,Big Site,1 Long Road,Quillmere,low,,,DC,Corvane,CV-12,BIG,service line,2020-01-01\n`;
    const big = Buffer.from(header + "\n" + row.repeat(Math.ceil((50 * 1024 * 1024) / row.length) + 10));
    expect(big.length).toBeGreaterThanOrEqual(50 * 1024 * 1024);
    const { session, response } = await upload(world.inspectorEmail, big, "big.csv");
    expect(response.status).toBe(201);
    const before = await countAllTables();
    const started = await session.post("/api/inspector/imports", { fileId: response.body.id, mapping });
    expect(started.status).toBe(413);
    expect(started.body.error).toMatch(/an import takes files under 50 MB\. Split it into parts/);
    expect(await countAllTables()).toEqual(before);
  });

  test("someone else's upload cannot be imported, and a tester may not import", async () => {
    const { response } = await upload(world.inspectorEmail, `${header}\nA1,B,C,D,low,,,RP,M,N,S,L,2020-01-01\n`);
    const colleague = await as(world.inspector2Email);
    expect((await colleague.post("/api/inspector/imports", { fileId: response.body.id, mapping })).status).toBe(404);
    const tester = await as(demoAccounts.tester);
    expect((await tester.post("/api/inspector/imports", { fileId: response.body.id, mapping })).status).toBe(403);
  });

  test("a second import while one runs is refused", async () => {
    const db = testDb();
    const { session, response } = await upload(world.adminEmail, `${header}\nR1,B,C,D,low,,,RP,M,N,S,L,2020-01-01\n`);
    const userId = await userIdOf(world.adminEmail);
    const [job] = await db.insert(importJobs).values({ programId: world.programId, createdBy: userId, fileId: response.body.id, mapping: {}, status: "running", startedAt: new Date() }).$returningId();
    try {
      const started = await session.post("/api/inspector/imports", { fileId: response.body.id, mapping });
      expect(started.status).toBe(409);
      expect(started.body.error).toMatch(/Another import is running/);
    } finally {
      await db.update(importJobs).set({ status: "failed" }).where(eq(importJobs.id, job!.id));
    }
  });
});
