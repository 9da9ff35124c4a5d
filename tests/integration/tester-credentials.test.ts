// A tester's certification and kits: added, documented (uploads checked by content and size),
// re-verified and retired; another tester's records are "not found"; bad input writes nothing.
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { auditLog, certifications, testKits } from "@/db/schema";
import { addDays, addMonths } from "@/lib/rules";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { api, as, ORIGIN } from "../helpers/http";
import { createTester, today } from "./tester-fixtures";

afterAll(closeTestDb);

// The smallest file each check needs: the magic bytes decide, not the name.
const pdfBytes = Buffer.from("%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n", "latin1");
const pngBytes = Buffer.from("89504e470d0a1a0a0000000d4948445200000001000000010806000000", "hex");

async function upload(cookie: string, purpose: string, bytes: Buffer, filename: string) {
  return api().post(`/api/files?purpose=${purpose}`).set("Cookie", cookie).set("Origin", ORIGIN).attach("file", bytes, filename);
}

async function refusedWithNothingWritten(request: () => Promise<{ status: number; body: { error?: string; fieldErrors?: Record<string, string[]> } }>, status: number, field?: string) {
  const before = await countAllTables();
  const response = await request();
  expect(response.status, JSON.stringify(response.body)).toBe(status);
  expect(typeof response.body.error).toBe("string");
  if (field) expect(Object.keys(response.body.fieldErrors ?? {})).toContain(field);
  expect(await countAllTables()).toEqual(before);
}

describe("the certification", () => {
  test("a renewed certification with its uploaded copy becomes the current one", async () => {
    const tester = await createTester();
    const session = await as(tester.email);
    const file = await upload(session.cookie, "certification", pdfBytes, "renewal.pdf");
    expect(file.status).toBe(201);
    expect(file.body.contentType).toBe("application/pdf");
    const expiresOn = addMonths(today(), 36);
    const added = await session.post("/api/tester/certifications", { certifyingBody: "Western Basin Water Works Training Board", number: "BT-778812", issuedOn: today(), expiresOn, attachmentId: file.body.id });
    expect(added.status).toBe(201);
    const list = await session.get("/api/tester/credentials");
    expect(list.status).toBe(200);
    expect(list.body.certifications[0]).toMatchObject({ number: "BT-778812", expiresOn, isCurrent: true, document: { id: file.body.id, name: "renewal.pdf" } });
    expect(list.body.certifications).toHaveLength(2);
    const audit = await testDb().select().from(auditLog).where(eq(auditLog.entityId, String(added.body.id)));
    expect(audit.map((a) => a.action)).toContain("certification.added");
    // The tester can read their own upload back; another tester cannot.
    expect((await session.get(`/api/files/${file.body.id}`)).status).toBe(200);
    const stranger = await createTester();
    expect((await (await as(stranger.email)).get(`/api/files/${file.body.id}`)).status).toBe(404);
  });

  test("the copy can be attached afterwards", async () => {
    const tester = await createTester();
    const session = await as(tester.email);
    const file = await upload(session.cookie, "certification", pngBytes, "photo.png");
    expect(file.status).toBe(201);
    const response = await session.patch(`/api/tester/certifications/${tester.certificationId}`, { attachmentId: file.body.id });
    expect(response.status).toBe(200);
    const [row] = await testDb().select().from(certifications).where(eq(certifications.id, tester.certificationId));
    expect(row!.attachmentId).toBe(file.body.id);
  });

  test.each([
    { label: "no certificate number", body: { certifyingBody: "Tri-County Council", number: "", expiresOn: addMonths(today(), 24) }, field: "number" },
    { label: "an expiry date that has passed", body: { certifyingBody: "Tri-County Council", number: "BT-1", expiresOn: addDays(today(), -1) }, field: "expiresOn" },
    { label: "an expiry before the issue date", body: { certifyingBody: "Tri-County Council", number: "BT-1", issuedOn: addMonths(today(), -1), expiresOn: addMonths(today(), -2) }, field: "expiresOn" },
    { label: "a date that is not a date", body: { certifyingBody: "Tri-County Council", number: "BT-1", expiresOn: "2027-02-30" }, field: "expiresOn" },
    { label: "an upload that does not exist", body: { certifyingBody: "Tri-County Council", number: "BT-1", expiresOn: addMonths(today(), 24), attachmentId: 999_999_999 }, field: "attachmentId" },
  ])("refused: $label", async ({ body, field }) => {
    const tester = await createTester();
    const session = await as(tester.email);
    await refusedWithNothingWritten(() => session.post("/api/tester/certifications", body), 422, field);
  });

  test("refused: someone else's upload, or a kit record as a certificate", async () => {
    const tester = await createTester();
    const other = await createTester();
    const otherFile = await upload((await as(other.email)).cookie, "certification", pdfBytes, "theirs.pdf");
    const session = await as(tester.email);
    const kitFile = await upload(session.cookie, "kit_verification", pdfBytes, "kit.pdf");
    const body = { certifyingBody: "Tri-County Council", number: "BT-2", expiresOn: addMonths(today(), 24) };
    await refusedWithNothingWritten(() => session.post("/api/tester/certifications", { ...body, attachmentId: otherFile.body.id }), 422, "attachmentId");
    await refusedWithNothingWritten(() => session.post("/api/tester/certifications", { ...body, attachmentId: kitFile.body.id }), 422, "attachmentId");
    await refusedWithNothingWritten(() => session.patch(`/api/tester/certifications/${other.certificationId}`, { attachmentId: kitFile.body.id }), 404);
  });

  test("an upload that is not what its name says, or too large, is refused", async () => {
    const tester = await createTester();
    const session = await as(tester.email);
    const before = await countAllTables();
    const fake = await upload(session.cookie, "certification", Buffer.from("this is plain text pretending to be a PDF"), "certificate.pdf");
    expect(fake.status).toBe(422);
    expect(fake.body.error).toMatch(/whatever its name says/);
    // Over the 10 MB limit by more than the form's framing, so the declared length alone refuses it.
    const big = Buffer.concat([pdfBytes, Buffer.alloc(10 * 1024 * 1024 + 100 * 1024)]);
    const tooLarge = await upload(session.cookie, "certification", big, "huge.pdf");
    expect(tooLarge.status).toBe(413);
    expect(await countAllTables()).toEqual(before);
  });
});

describe("the test kits", () => {
  test("a kit is added with its record, re-verified with a new date and record, and retired", async () => {
    const tester = await createTester();
    const session = await as(tester.email);
    const record = await upload(session.cookie, "kit_verification", pdfBytes, "bench-check.pdf");
    const serial = `TR3-${Date.now().toString(36)}`;
    const added = await session.post("/api/tester/kits", { make: "Fennick Instruments", model: "Trident-3", serial, lastVerifiedOn: addDays(today(), -200), verificationResult: "passed", verifiedBy: "Quillmere Instrument Lab", attachmentId: record.body.id });
    expect(added.status, JSON.stringify(added.body)).toBe(201);
    const kitId = added.body.id as number;

    const newRecord = await upload(session.cookie, "kit_verification", pngBytes, "new-check.png");
    const verified = await session.post(`/api/tester/kits/${kitId}/verification`, { verifiedOn: addDays(today(), -1), result: "adjusted", verifiedBy: "Quillmere Instrument Lab", attachmentId: newRecord.body.id });
    expect(verified.status).toBe(200);
    const [kit] = await testDb().select().from(testKits).where(eq(testKits.id, kitId));
    expect(kit).toMatchObject({ lastVerifiedOn: addDays(today(), -1), verificationResult: "adjusted", attachmentId: newRecord.body.id, retiredAt: null });
    const list = await session.get("/api/tester/credentials");
    expect(list.body.kits.find((k: { id: number }) => k.id === kitId)).toMatchObject({ validUntil: addMonths(addDays(today(), -1), 12) });

    expect((await session.post(`/api/tester/kits/${kitId}/retire`)).status).toBe(200);
    await refusedWithNothingWritten(() => session.post(`/api/tester/kits/${kitId}/retire`), 409);
    await refusedWithNothingWritten(() => session.post(`/api/tester/kits/${kitId}/verification`, { verifiedOn: today(), result: "passed" }), 409);
    // The same serial added again puts the retired gauge back in service under its old id.
    const back = await session.post("/api/tester/kits", { make: "Fennick Instruments", model: "Trident-3", serial, lastVerifiedOn: today(), verificationResult: "passed" });
    expect(back.status).toBe(201);
    expect(back.body.id).toBe(kitId);
  });

  test("refused: a duplicate serial, a check dated in the future, an older check than the one on file", async () => {
    const tester = await createTester();
    const session = await as(tester.email);
    const [kit] = await testDb().select().from(testKits).where(eq(testKits.id, tester.kitId));
    await refusedWithNothingWritten(() => session.post("/api/tester/kits", { make: "Gaugewright", model: "DG-5", serial: kit!.serial, lastVerifiedOn: today() }), 409);
    await refusedWithNothingWritten(() => session.post("/api/tester/kits", { make: "Gaugewright", model: "DG-5", serial: "NEW-1", lastVerifiedOn: addDays(today(), 3) }), 422, "lastVerifiedOn");
    await refusedWithNothingWritten(() => session.post("/api/tester/kits", { make: "", model: "DG-5", serial: "NEW-2", lastVerifiedOn: today() }), 422, "make");
    await refusedWithNothingWritten(() => session.post(`/api/tester/kits/${tester.kitId}/verification`, { verifiedOn: addDays(kit!.lastVerifiedOn, -1), result: "passed" }), 422, "verifiedOn");
    await refusedWithNothingWritten(() => session.post(`/api/tester/kits/${tester.kitId}/verification`, { verifiedOn: today(), result: "so-so" }), 422, "result");
  });

  test("another tester's kit is not found", async () => {
    const tester = await createTester();
    const other = await createTester();
    const session = await as(tester.email);
    await refusedWithNothingWritten(() => session.post(`/api/tester/kits/${other.kitId}/verification`, { verifiedOn: today(), result: "passed" }), 404);
    await refusedWithNothingWritten(() => session.post(`/api/tester/kits/${other.kitId}/retire`), 404);
  });

  test("the credentials page and the home page warn 30 days ahead", async () => {
    const tester = await createTester({ certExpiresOn: addDays(today(), 12), kitVerifiedOn: addDays(addMonths(today(), -12), 20) });
    const session = await as(tester.email);
    const list = await session.get("/api/tester/credentials");
    const messages = (list.body.warnings as { message: string }[]).map((w) => w.message).join(" ");
    expect(messages).toMatch(/expires on .* \(in 12 days\)/);
    expect(messages).toMatch(/needs its accuracy check by .* \(in 20 days\)/);
    const home = await session.get("/tester");
    expect(home.status).toBe(200);
    expect(home.text).toContain("in 12 days");
    const page = await session.get("/tester/credentials");
    expect(page.status).toBe(200);
    expect(page.text).toContain("Credentials and kits");
  });
});
