// The compliance certificate and its public check: the PDF's text, who may download it, the
// verify page for a genuine, a lapsed, a re-issued and a made-up code (nothing private shown),
// and re-issuing by the program's staff only.
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, gt, isNull, lt, ne, or, sql } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { closeDb } from "@/db/client";
import { assemblies, certificates, owners, siteOwners, sites, testReports, users } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { verifyCertificate } from "@/lib/data/certificate-verification";
import { formatCertificateCode } from "@/lib/data/notices-format";
import { todayInZone } from "@/lib/programs/settings";
import { TooManyRequestsError } from "@/lib/errors";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { api, as, unique } from "../helpers/http";

afterAll(async () => {
  await closeDb();
  await closeTestDb();
});

const today = todayInZone("Etc/GMT+6");

/** A certificate of the demo data: its code, the report, the site and the owner's name. */
async function findCertificate(where: { ofDemoOwner: boolean; state: "current" | "overdue" | "failed_later" }) {
  const db = testDb();
  const [owner] = await db.select({ id: users.id }).from(users).where(eq(users.email, demoAccounts.owner));
  const stateCondition =
    where.state === "current"
      ? and(eq(assemblies.baseState, "active"), eq(assemblies.lastPassedOn, testReports.testedOn), gt(assemblies.nextDueOn, sql`${today}`))
      : where.state === "overdue"
        ? and(eq(assemblies.baseState, "active"), eq(assemblies.lastPassedOn, testReports.testedOn), lt(assemblies.nextDueOn, sql`${today}`))
        : and(eq(assemblies.baseState, "failed"), lt(testReports.testedOn, assemblies.lastTestedOn));
  const rows = await db
    .select({ code: certificates.code, reportId: testReports.id, siteName: sites.name, address: sites.addressLine1, city: sites.city, ownerName: owners.name, ownerUserId: owners.userId, serial: assemblies.serial, programId: testReports.programId, testerId: testReports.testerId })
    .from(certificates)
    .innerJoin(testReports, eq(testReports.id, certificates.reportId))
    .innerJoin(assemblies, eq(assemblies.id, testReports.assemblyId))
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .innerJoin(siteOwners, eq(siteOwners.siteId, sites.id))
    .innerJoin(owners, eq(owners.id, siteOwners.ownerId))
    .where(and(isNull(certificates.supersededAt), eq(testReports.status, "accepted"), eq(testReports.programId, 1), where.ofDemoOwner ? eq(owners.userId, owner!.id) : or(isNull(owners.userId), ne(owners.userId, owner!.id)), stateCondition))
    .orderBy(testReports.id)
    .limit(20);
  // Not the demo owner's: skip any site that also has the demo owner.
  const row = rows.find((r) => (where.ofDemoOwner ? r.ownerUserId === owner!.id : r.ownerUserId !== owner!.id));
  if (!row) throw new Error(`No ${where.state} certificate in the demo data`);
  return row;
}

function binary(res: unknown, callback: (error: Error | null, body: Buffer) => void) {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on("data", (chunk: Buffer) => chunks.push(chunk));
  stream.on("end", () => callback(null, Buffer.concat(chunks)));
}

function pdfText(bytes: Buffer): { text: string; pages: number } {
  const dir = mkdtempSync(path.join(tmpdir(), "zw-cert-"));
  const file = path.join(dir, "certificate.pdf");
  writeFileSync(file, bytes);
  const info = spawnSync("pdfinfo", [file], { encoding: "utf8" }).stdout;
  // Layout spacing and line breaks do not matter here: compare words with single spaces.
  return { text: spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).stdout.replace(/\s+/g, " "), pages: Number(/Pages:\s+(\d+)/.exec(info)?.[1] ?? 0) };
}

describe("the certificate PDF", () => {
  test("one page with site, assembly, test date, tester, next due date, the code and the verify address", async () => {
    const cert = await findCertificate({ ofDemoOwner: true, state: "current" });
    const owner = await as(demoAccounts.owner);
    const response = await owner.get(`/api/certificates/${cert.code}/pdf`).buffer(true).parse(binary);
    expect(response.status).toBe(200);
    expect(response.headers["content-type"]).toBe("application/pdf");
    const { text, pages } = pdfText(response.body as Buffer);
    expect(pages).toBe(1);
    expect(text).toContain("Certificate of backflow assembly test compliance");
    expect(text).toContain("Quillmere Valley Water District");
    expect(text).toContain(cert.siteName);
    expect(text).toContain(cert.serial);
    expect(text).toContain("TEST DATE RESULT");
    expect(text).toMatch(/Next test due by \d{1,2} \w+ \d{4}/);
    expect(text).toContain(formatCertificateCode(cert.code));
    expect(text).toMatch(new RegExp(`http://127\\.0\\.0\\.1:\\d+/verify/${cert.code}`));
    expect(text).toContain("TESTER TESTER'S CERTIFICATE");
    expect(text).toMatch(/REPORT NUMBER QV-\d{4}-\d{6}/);
  });

  test("others get not found, never a hint that it exists", async () => {
    const cert = await findCertificate({ ofDemoOwner: false, state: "current" });
    expect((await (await as(demoAccounts.owner)).get(`/api/certificates/${cert.code}/pdf`)).status).toBe(404);
    expect((await (await as(demoAccounts.neighbourInspector)).get(`/api/certificates/${cert.code}/pdf`)).status).toBe(404);
    expect((await api().get(`/api/certificates/${cert.code}/pdf`)).status).toBe(401);
    // The program's own staff may.
    expect((await (await as(demoAccounts.inspector)).get(`/api/certificates/${cert.code}/pdf`)).status).toBe(200);
  });
});

describe("the public check at /verify/<code>", () => {
  test("a genuine, current certificate: says so, and shows nothing private", async () => {
    const cert = await findCertificate({ ofDemoOwner: true, state: "current" });
    const page = await api().get(`/verify/${cert.code}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Genuine and current");
    expect(page.text).toContain("Quillmere Valley Water District");
    expect(page.text).toContain(cert.city);
    expect(page.text).toContain(`…${cert.serial.slice(-4)}`);
    for (const secret of [cert.ownerName, "Wendeline", cert.address, cert.siteName, cert.serial, "owner@quillmere-demo.example"]) expect(page.text).not.toContain(secret);
    // The grouped form printed on paper, typed into the form, lands on the same answer.
    const typed = await api().get(`/verify?code=${encodeURIComponent(formatCertificateCode(cert.code).toLowerCase())}`).redirects(0);
    expect(typed.status).toBe(307);
    expect(typed.headers.location).toContain(`/verify/${cert.code}`);
  });

  test("genuine but lapsed: past its due date, or a later test failed, says why", async () => {
    const overdue = await findCertificate({ ofDemoOwner: false, state: "overdue" });
    const page = await api().get(`/verify/${overdue.code}`);
    expect(page.text).toContain("Genuine, but no longer proof of compliance");
    expect(page.text).toMatch(/The next yearly test was due by \d{1,2} \w+ \d{4}, and no later passing test is on file/);
    const failedLater = await findCertificate({ ofDemoOwner: true, state: "failed_later" });
    const failedPage = await api().get(`/verify/${failedLater.code}`);
    expect(failedPage.text).toMatch(/A later test, on \d{1,2} \w+ \d{4}, found the assembly failing/);
  });

  test.each([
    { label: "a made-up code of the right shape", code: "ABCDEFGHJKMN" },
    { label: "too short", code: "ABC" },
    { label: "letters never used in codes", code: "O0O0O0O0O0O0" },
    { label: "markup", code: encodeURIComponent("<script>x</script>") },
    { label: "a very long string", code: "A".repeat(300) },
  ])("$label: not found, and nothing else", async ({ code }) => {
    const page = await api().get(`/verify/${code}`);
    expect(page.status).toBe(404);
    expect(page.text).toContain("No certificate has this code.");
    expect(page.text).not.toContain("Genuine");
    expect(page.text).not.toContain("<script>x</script>");
  });

  test("look-ups that miss are throttled per client", async () => {
    const address = `203.0.113.${Math.floor(Math.random() * 200) + 20}-${unique()}`;
    for (let i = 0; i < 60; i++) expect((await verifyCertificate({ code: "ABCDEFGHJKMN", address })).status).toBe("not_found");
    await expect(verifyCertificate({ code: "ABCDEFGHJKMN", address })).rejects.toBeInstanceOf(TooManyRequestsError);
  });
});

describe("re-issuing a certificate", () => {
  test("the inspector re-issues: a new code verifies as current, the old one as replaced", async () => {
    const cert = await findCertificate({ ofDemoOwner: false, state: "current" });
    expect((await (await as(demoAccounts.tester)).post(`/api/certificates/${cert.code}/reissue`, { confirm: true })).status).toBe(403);
    expect((await (await as(demoAccounts.neighbourInspector)).post(`/api/certificates/${cert.code}/reissue`, { confirm: true })).status).toBe(404);
    const before = await countAllTables();
    const unconfirmed = await (await as(demoAccounts.inspector)).post(`/api/certificates/${cert.code}/reissue`, {});
    expect(unconfirmed.status).toBe(422);
    expect(await countAllTables()).toEqual(before);

    const inspector = await as(demoAccounts.inspector);
    const reissued = await inspector.post(`/api/certificates/${cert.code}/reissue`, { confirm: true });
    expect(reissued.status).toBe(200);
    const fresh = reissued.body.code as string;
    expect(fresh).toMatch(/^[A-Z2-9]{12}$/);
    expect(fresh).not.toBe(cert.code);

    const old = await api().get(`/verify/${cert.code}`);
    expect(old.text).toContain("Replaced: not valid");
    expect((await api().get(`/verify/${fresh}`)).text).toContain("Genuine and current");
    // Twice: the old one is already replaced.
    const twice = await inspector.post(`/api/certificates/${cert.code}/reissue`, { confirm: true });
    expect(twice.status).toBe(409);
    const [row] = await testDb().select({ supersededAt: certificates.supersededAt }).from(certificates).where(eq(certificates.code, cert.code));
    expect(row?.supersededAt).toBeTruthy();
    const audit = await testDb().execute(sql`SELECT COUNT(*) AS n FROM audit_log WHERE action = 'certificate.reissued' AND JSON_UNQUOTE(JSON_EXTRACT(after, '$.code')) = ${fresh}`);
    expect(Number((audit as unknown as [{ n: number }[]])[0][0]!.n)).toBe(1);
  });
});
