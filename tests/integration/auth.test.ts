// Sign-in, sign-out, registration → approval, password reset through the mail stand-in, and
// the bad input around them: each refused with a clear message and nothing written.
import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { authTokens, testerApprovals, users } from "@/db/schema";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { closeTestDb, countAllTables, testDb } from "../helpers/db";
import { api, as, cookieFrom, ORIGIN, unique } from "../helpers/http";
import { firstLink, waitForMessage } from "../helpers/mail";

afterAll(closeTestDb);

const signIn = (email: string, password: string) => api().post("/api/auth/session").set("Origin", ORIGIN).send({ email, password });

function registration(overrides: Record<string, unknown> = {}) {
  const id = unique("reg");
  return {
    name: "Perrin Hazelrigg",
    email: `${id}@testers.example`,
    phone: "(555) 030-1234",
    password: "a-long-enough-password",
    companyName: "Fernhollow Test & Repair",
    programIds: [1],
    certifyingBody: "Tri-County Cross-Connection Certification Council",
    certificationNumber: `BT-${id.slice(-6)}`,
    certificationExpiresOn: "2029-06-30",
    ...overrides,
  };
}

describe("sign-in and sign-out", () => {
  test("a demo account signs in, reaches its home, and signs out", async () => {
    const response = await signIn(demoAccounts.inspector, DEMO_PASSWORD);
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ ok: true, role: "inspector", home: "/inspector" });
    const cookie = cookieFrom(response);
    expect(cookie).toBeTruthy();
    const setCookie = String(response.headers["set-cookie"]);
    expect(setCookie).toMatch(/HttpOnly/i);
    expect(setCookie).toMatch(/SameSite=Lax/i);

    const home = await api().get("/inspector").set("Cookie", cookie!).redirects(0);
    expect(home.status).toBe(200);

    const out = await api().delete("/api/auth/session").set("Cookie", cookie!).set("Origin", ORIGIN);
    expect(out.status).toBe(200);
    const after = await api().get("/inspector").set("Cookie", cookie!).redirects(0);
    expect(after.status).toBe(307);
  });

  test("a wrong password gets one clear message and no session", async () => {
    const response = await signIn(demoAccounts.owner, "not-the-password");
    expect(response.status).toBe(422);
    expect(response.body.error).toMatch(/do not match/);
    expect(cookieFrom(response)).toBeNull();
  });

  test("a malformed e-mail address is refused with a field message", async () => {
    const response = await signIn("not-an-address", "whatever-password");
    expect(response.status).toBe(422);
    expect(response.body.fieldErrors.email[0]).toMatch(/e-mail address/);
  });

  test("repeated failures on one account are throttled", async () => {
    const email = `${unique("nobody")}@testers.example`;
    for (let i = 0; i < 5; i++) expect((await signIn(email, `wrong-${i}`)).status).toBe(422);
    const locked = await signIn(email, "wrong-again");
    expect(locked.status).toBe(429);
    expect(locked.headers["retry-after"]).toBeDefined();
    expect(locked.body.error).toMatch(/Too many attempts/);
  });

  test("a state-changing request from another site is refused", async () => {
    const response = await api().post("/api/auth/session").set("Origin", "https://elsewhere.example").send({ email: demoAccounts.owner, password: DEMO_PASSWORD });
    expect(response.status).toBe(403);
    expect(cookieFrom(response)).toBeNull();
  });

  test("an oversized body is refused before it is read", async () => {
    const before = await countAllTables();
    const response = await api()
      .post("/api/auth/register")
      .set("Origin", ORIGIN)
      .send(registration({ name: "x".repeat(40_000) }));
    expect(response.status).toBe(413);
    expect(response.body.error).toMatch(/too large/);
    expect(await countAllTables()).toEqual(before);
  });
});

describe("tester registration and approval", () => {
  test("a registered tester waits for approval, the inspector approves, the tester is told", async () => {
    const body = registration();
    const response = await api().post("/api/auth/register").set("Origin", ORIGIN).send(body);
    expect(response.status).toBe(201);
    expect(cookieFrom(response)).toBeTruthy();
    const db = testDb();
    const [user] = await db.select().from(users).where(eq(users.email, body.email));
    expect(user).toMatchObject({ role: "tester", status: "active" });
    const [approval] = await db.select().from(testerApprovals).where(and(eq(testerApprovals.testerId, user!.id), eq(testerApprovals.programId, 1)));
    expect(approval!.status).toBe("pending");
    await waitForMessage(body.email, (m) => /received your tester registration/.test(m.subject));

    const inspector = await as(demoAccounts.inspector);
    const decided = await inspector.post(`/api/testers/${approval!.id}/decision`, { decision: "approve" });
    expect(decided.status).toBe(200);
    const [after] = await db.select().from(testerApprovals).where(eq(testerApprovals.id, approval!.id));
    expect(after!.status).toBe("approved");
    await waitForMessage(body.email, (m) => /approved to file tests/.test(m.subject));

    const again = await inspector.post(`/api/testers/${approval!.id}/decision`, { decision: "approve" });
    expect(again.status).toBe(409);
  });

  test("another program's inspector cannot decide this registration", async () => {
    const body = registration();
    await api().post("/api/auth/register").set("Origin", ORIGIN).send(body).expect(201);
    const db = testDb();
    const [user] = await db.select().from(users).where(eq(users.email, body.email));
    const [approval] = await db.select().from(testerApprovals).where(eq(testerApprovals.testerId, user!.id));
    const neighbour = await as(demoAccounts.neighbourInspector);
    const response = await neighbour.post(`/api/testers/${approval!.id}/decision`, { decision: "approve" });
    expect(response.status).toBe(404);
  });

  test("a duplicate registration is refused and writes nothing", async () => {
    const body = registration({ email: demoAccounts.tester });
    const before = await countAllTables();
    const response = await api().post("/api/auth/register").set("Origin", ORIGIN).send(body);
    expect(response.status).toBe(422);
    expect(response.body.fieldErrors.email[0]).toMatch(/already exists/);
    expect(await countAllTables()).toEqual(before);
  });

  test("bad registration fields are named", async () => {
    const response = await api()
      .post("/api/auth/register")
      .set("Origin", ORIGIN)
      .send(registration({ password: "short", programIds: [], certificationExpiresOn: "31/12/2029" }));
    expect(response.status).toBe(422);
    expect(Object.keys(response.body.fieldErrors).sort()).toEqual(["certificationExpiresOn", "password", "programIds"]);
  });
});

describe("password reset through the mail stand-in", () => {
  async function registeredTester() {
    const body = registration();
    await api().post("/api/auth/register").set("Origin", ORIGIN).send(body).expect(201);
    return body;
  }

  test("the e-mailed link sets a new password once", async () => {
    const tester = await registeredTester();
    const asked = await api().post("/api/auth/password-reset").set("Origin", ORIGIN).send({ email: tester.email });
    expect(asked.status).toBe(202);
    const message = await waitForMessage(tester.email, (m) => /new Zoneward password/.test(m.subject));
    expect(message.text).toBeTruthy();
    const link = firstLink(message, "/reset-password/");
    const token = link.split("/reset-password/")[1]!;
    const page = await api().get(new URL(link).pathname);
    expect(page.status).toBe(200);
    expect(page.text).toContain("Choose a new password");

    const reset = await api().post("/api/auth/password-reset/confirm").set("Origin", ORIGIN).send({ token, password: "a-brand-new-password", confirm: "a-brand-new-password" });
    expect(reset.status).toBe(200);
    expect((await signIn(tester.email, "a-brand-new-password")).status).toBe(200);
    expect((await signIn(tester.email, tester.password)).status).toBe(422);

    const before = await countAllTables();
    const reused = await api().post("/api/auth/password-reset/confirm").set("Origin", ORIGIN).send({ token, password: "yet-another-password", confirm: "yet-another-password" });
    expect(reused.status).toBe(422);
    expect(reused.body.error).toMatch(/expired or was already used/);
    expect(await countAllTables()).toEqual(before);
  });

  test("an expired link is refused", async () => {
    const tester = await registeredTester();
    await api().post("/api/auth/password-reset").set("Origin", ORIGIN).send({ email: tester.email }).expect(202);
    const message = await waitForMessage(tester.email, (m) => /new Zoneward password/.test(m.subject));
    const token = firstLink(message, "/reset-password/").split("/reset-password/")[1]!;
    const db = testDb();
    const [user] = await db.select().from(users).where(eq(users.email, tester.email));
    await db.update(authTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(authTokens.userId, user!.id));
    const response = await api().post("/api/auth/password-reset/confirm").set("Origin", ORIGIN).send({ token, password: "a-brand-new-password", confirm: "a-brand-new-password" });
    expect(response.status).toBe(422);
    expect((await signIn(tester.email, tester.password)).status).toBe(200);
  });

  test("an unknown address gets the same answer and no message", async () => {
    const email = `${unique("ghost")}@testers.example`;
    const response = await api().post("/api/auth/password-reset").set("Origin", ORIGIN).send({ email });
    expect(response.status).toBe(202);
    expect(response.body.message).toMatch(/If this address has an account/);
  });
});
