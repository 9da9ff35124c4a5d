// How owners get in: the single-use link in a notice e-mail, the account number and one-time
// code on a printed letter, a link asked for by e-mail. Expired or used secrets get a clear
// message and change nothing; the code form is throttled.
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { closeDb } from "@/db/client";
import { authTokens, owners, users } from "@/db/schema";
import { hashToken } from "@/lib/auth/tokens";
import { runNoticesForProgram, type NoticeRunSummary } from "@/lib/data/notices-run";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { api, as, cookieFrom, ORIGIN, unique } from "../helpers/http";
import { firstLink, messagesTo, waitForMessage } from "../helpers/mail";
import { createNoticeWorld, type NoticeWorld } from "./notices-world";

let world: NoticeWorld;
let run: NoticeRunSummary;
let lettered: { accountNumber: string; ownerId: number };

beforeAll(async () => {
  world = await createNoticeWorld();
  const pia = await world.addSite({ name: "Pia's print shop", contacts: [{ name: "Pia Larchmont", email: world.email("pia") }] });
  await world.addAssembly(pia.siteId, { label: "darkroom sink supply", nextDueInDays: -10 });
  const quinn = await world.addSite({ name: "Quinn's barn", contacts: [{ name: "Quinn Hobday", email: null }] });
  await world.addAssembly(quinn.siteId, { label: "stock trough supply", kind: "DC", nextDueInDays: -10 });
  lettered = { accountNumber: quinn.accountNumber, ownerId: quinn.ownerIds[0]! };
  run = await runNoticesForProgram(world.programId, { trigger: "schedule" });
});
afterAll(async () => {
  await closeDb();
  await closeTestDb();
});

const post = (url: string, body: unknown, cookie?: string) => {
  const request = api().post(url).set("Origin", ORIGIN).send(body as object);
  return cookie ? request.set("Cookie", cookie) : request;
};

function binary(res: unknown, callback: (error: Error | null, body: Buffer) => void) {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on("data", (chunk: Buffer) => chunks.push(chunk));
  stream.on("end", () => callback(null, Buffer.concat(chunks)));
}

function pdfToText(bytes: Buffer): string {
  const dir = mkdtempSync(path.join(tmpdir(), "zw-letters-"));
  const file = path.join(dir, "letters.pdf");
  writeFileSync(file, bytes);
  return spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).stdout;
}

describe("the link in a notice e-mail", () => {
  test("opening it shows whom it is for without using it; the button signs in once", async () => {
    const [message] = await messagesTo(world.email("pia"));
    expect(message).toBeTruthy();
    const link = firstLink(message!, "/o/");
    const token = new URL(link).pathname.split("/").pop()!;

    const page = await api().get(`/o/${token}`).redirects(0);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Welcome, Pia Larchmont");
    expect(cookieFrom(page)).toBeNull();
    // A mail scanner opening it again changes nothing: it still works.
    expect((await api().get(`/o/${token}`)).text).toContain("Welcome, Pia Larchmont");

    const signIn = await post("/api/owner/session/link", { token });
    expect(signIn.status).toBe(200);
    const cookie = cookieFrom(signIn)!;
    expect(cookie).toBeTruthy();
    const home = await api().get("/owner").set("Cookie", cookie).redirects(0);
    expect(home.status).toBe(200);
    expect(home.text).toContain("Pia&#x27;s print shop");
    expect(home.text).toContain("darkroom sink supply");

    // The account was made when the notice went out, linked to the owners row, and is now active.
    const [account] = await testDb().select({ status: users.status, role: users.role }).from(users).where(eq(users.email, world.email("pia")));
    expect(account).toEqual({ status: "active", role: "owner" });

    // Used: a clear message, and nothing changes.
    const before = await countAllTables();
    const again = await post("/api/owner/session/link", { token });
    expect(again.status).toBe(422);
    expect(again.body.error).toMatch(/expired or was already used/);
    expect(cookieFrom(again)).toBeNull();
    expect(await countAllTables()).toEqual(before);
    expect((await api().get(`/o/${token}`)).text).toContain("This link no longer works");
  });

  test("an expired link is refused with the same message and changes nothing", async () => {
    const [account] = await testDb().select({ id: users.id }).from(users).where(eq(users.email, world.email("pia")));
    const secret = `expired-${unique()}-aaaaaaaaaaaaaaaa`;
    await testDb().insert(authTokens).values({ tokenHash: hashToken(secret), userId: account!.id, purpose: "owner_link", expiresAt: new Date(Date.now() - 60_000), createdAt: new Date(Date.now() - 31 * 86_400_000) });
    expect((await api().get(`/o/${secret}`)).text).toContain("This link no longer works");
    const before = await countAllTables();
    const refused = await post("/api/owner/session/link", { token: secret });
    expect(refused.status).toBe(422);
    expect(refused.body.error).toMatch(/expired or was already used/);
    expect(await countAllTables()).toEqual(before);
  });

  test.each([
    { label: "a made-up token", token: "not-a-token-of-ours-aaaaaaaaaaaa" },
    { label: "a token of the wrong shape", token: "x" },
    { label: "a password-reset token is not an owner link", token: "" },
  ])("$label is refused", async ({ token }) => {
    const refused = await post("/api/owner/session/link", { token });
    expect(refused.status).toBe(422);
    expect(cookieFrom(refused)).toBeNull();
  });
});

describe("the account number and code on a letter", () => {
  let code = "";

  test("the day's letters: one per page, with the account number and a one-time code", async () => {
    expect(run.letters).toBe(1);
    const admin = await as(world.adminEmail);
    const response = await admin.get(`/api/notices/runs/${run.runId}/letters`).buffer(true).parse(binary);
    expect(response.status).toBe(200);
    expect(response.headers["content-type"]).toBe("application/pdf");
    const text = pdfToText(response.body as Buffer);
    expect(text).toContain("Quinn Hobday");
    expect(text.replace(/\s+/g, " ")).toContain("Overdue: the yearly test was due on");
    expect(text).toContain("stock trough supply");
    expect(text).toContain(lettered.accountNumber);
    const match = text.match(/one-time code[\s\S]*?([A-Z0-9]{5}-[A-Z0-9]{5})/i);
    expect(match).toBeTruthy();
    code = match![1]!;
    // Staff of another program cannot read them.
    const other = await (await as("inspector@tansyridge-water.example")).get(`/api/notices/runs/${run.runId}/letters`);
    expect(other.status).toBe(404);
  });

  test("a wrong account number with the right code is refused, and changes nothing", async () => {
    const before = await countAllTables();
    const refused = await post("/api/owner/session/code", { accountNumber: `${lettered.accountNumber}9`, code });
    expect(refused.status).toBe(422);
    expect(refused.body.error).toMatch(/do not match a current letter/);
    expect(await countAllTables()).toEqual(before);
  });

  test("the code signs in once (typed in lower case, with a space), and the owner can add an e-mail address", async () => {
    const typed = code.toLowerCase().replace("-", " ");
    const signIn = await post("/api/owner/session/code", { accountNumber: lettered.accountNumber.toLowerCase(), code: typed });
    expect(signIn.status).toBe(200);
    const cookie = cookieFrom(signIn)!;
    const home = await api().get("/owner").set("Cookie", cookie).redirects(0);
    expect(home.status).toBe(200);
    expect(home.text).toContain("Quinn&#x27;s barn");
    expect(home.text).toContain("Get notices by e-mail");

    const again = await post("/api/owner/session/code", { accountNumber: lettered.accountNumber, code });
    expect(again.status).toBe(422);

    const email = world.email("quinn");
    const added = await post("/api/owner/contact", { email }, cookie);
    expect(added.status).toBe(200);
    const [row] = await testDb().select({ email: owners.email }).from(owners).where(eq(owners.id, lettered.ownerId));
    expect(row?.email).toBe(email);
    const twice = await post("/api/owner/contact", { email: world.email("quinn2") }, cookie);
    expect(twice.status).toBe(422);
  });

  test.each([
    { label: "no code", body: { accountNumber: "QV100154" }, field: "code" },
    { label: "a code of the wrong length", body: { accountNumber: "QV100154", code: "ABCDE" }, field: "code" },
    { label: "letters that are never in a code (O, 0, I, 1)", body: { accountNumber: "QV100154", code: "OOOOO-IIII1" }, field: "code" },
    { label: "an account number with odd characters", body: { accountNumber: "QV'; --", code: "ABCDE-FGHJK" }, field: "accountNumber" },
  ])("bad input, $label: a field message", async ({ body, field }) => {
    const refused = await post("/api/owner/session/code", body);
    expect(refused.status).toBe(422);
    expect(Object.keys(refused.body.fieldErrors ?? {})).toContain(field);
  });

  test("guessing is throttled per account number: after 5 wrong codes, a pause", async () => {
    const account = `ZZ${unique().slice(-8).toUpperCase()}`;
    for (let i = 0; i < 5; i++) expect((await post("/api/owner/session/code", { accountNumber: account, code: "ABCDE-FGHJK" })).status).toBe(422);
    const locked = await post("/api/owner/session/code", { accountNumber: account, code: "ABCDE-FGHJK" });
    expect(locked.status).toBe(429);
    expect(locked.body.error).toMatch(/Too many attempts/);
    expect(locked.headers["retry-after"]).toBeTruthy();
  });
});

describe("asking for a sign-in link", () => {
  test("an address on file gets a link; an unknown one gets the same answer and no mail", async () => {
    const known = await post("/api/owner/sign-in-link", { email: world.email("pia") });
    const stranger = `${unique("nobody")}@owners.example`;
    const unknown = await post("/api/owner/sign-in-link", { email: stranger });
    expect(known.status).toBe(200);
    expect(unknown.status).toBe(200);
    expect(unknown.body).toEqual(known.body);
    const message = await waitForMessage(world.email("pia"), (m) => m.subject === "Your link to see your backflow assemblies");
    const token = new URL(firstLink(message, "/o/")).pathname.split("/").pop()!;
    expect((await post("/api/owner/session/link", { token })).status).toBe(200);
    expect(await messagesTo(stranger)).toHaveLength(0);
    const [created] = await testDb().select({ id: users.id }).from(users).where(inArray(users.email, [stranger]));
    expect(created).toBeUndefined();
  });

  test("a malformed address is refused with a field message", async () => {
    const refused = await post("/api/owner/sign-in-link", { email: "not-an-address" });
    expect(refused.status).toBe(422);
    expect(refused.body.fieldErrors?.email).toBeTruthy();
  });
});
