// Security headers on every kind of answer: pages carry a Content-Security-Policy with a fresh
// nonce that their own scripts carry too (the browser tests prove the app works under it);
// route handlers carry a fixed, stricter policy; nothing may frame a page; no server banner.
import { afterAll, describe, expect, test } from "vitest";
import { eq } from "drizzle-orm";
import { testReports, users } from "@/db/schema";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { closeTestDb, testDb } from "../helpers/db";
import { api, as } from "../helpers/http";

afterAll(closeTestDb);

function directives(policy: string | undefined): Map<string, string> {
  const map = new Map<string, string>();
  for (const part of (policy ?? "").split(";")) {
    const [name, ...values] = part.trim().split(/\s+/);
    if (name) map.set(name, values.join(" "));
  }
  return map;
}

describe("pages", () => {
  test("the sign-in page: a nonce-based script policy, no framing, no inline script without the nonce", async () => {
    const response = await api().get("/login");
    expect(response.status).toBe(200);
    const csp = directives(response.headers["content-security-policy"]);
    const scriptSrc = csp.get("script-src") ?? "";
    const nonce = scriptSrc.match(/'nonce-([^']+)'/)?.[1];
    expect(nonce, "script-src carries a nonce").toBeTruthy();
    expect(scriptSrc).toContain("'strict-dynamic'");
    expect(scriptSrc).not.toContain("'unsafe-inline'");
    expect(scriptSrc).not.toContain("'unsafe-eval'");
    expect(csp.get("frame-ancestors")).toBe("'none'");
    expect(csp.get("object-src")).toBe("'none'");
    expect(csp.get("base-uri")).toBe("'self'");
    expect(csp.get("form-action")).toBe("'self'");
    // Every script tag the page ships carries this response's nonce.
    const scripts = [...response.text.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag, tag).toContain(`nonce="${nonce}"`);
    expect(response.headers["x-frame-options"]).toBe("DENY");
    expect(response.headers["referrer-policy"]).toBe("strict-origin-when-cross-origin");
    expect(response.headers["x-content-type-options"]).toBe("nosniff");
    expect(response.headers["permissions-policy"]).toContain("camera=()");
    expect(response.headers["x-powered-by"]).toBeUndefined();
  });

  test("each page answer has its own nonce", async () => {
    const [first, second] = await Promise.all([api().get("/login"), api().get("/login")]);
    const nonceOf = (r: typeof first) => directives(r.headers["content-security-policy"]).get("script-src")?.match(/'nonce-([^']+)'/)?.[1];
    expect(nonceOf(first)).toBeTruthy();
    expect(nonceOf(first)).not.toBe(nonceOf(second));
  });

  test("a signed-in page carries the same policy", async () => {
    const inspector = await as(demoAccounts.inspector);
    const response = await inspector.get("/inspector/reports");
    expect(response.status).toBe(200);
    expect(directives(response.headers["content-security-policy"]).get("frame-ancestors")).toBe("'none'");
    expect(response.headers["cache-control"] ?? "").not.toMatch(/\bpublic\b/);
  });
});

describe("route handlers", () => {
  test.each(["/api/health", "/api/auth/session", "/api/certificates/NOSUCHCODE0000"])("%s: a policy that allows nothing to run, nosniff, no banner", async (path) => {
    const response = await api().get(path);
    expect(response.status).toBeLessThan(500);
    const csp = directives(response.headers["content-security-policy"]);
    expect(csp.get("default-src")).toBe("'none'");
    expect(csp.get("frame-ancestors")).toBe("'self'");
    expect(response.headers["x-content-type-options"]).toBe("nosniff");
    expect(response.headers["referrer-policy"]).toBe("strict-origin-when-cross-origin");
    expect(response.headers["x-powered-by"]).toBeUndefined();
  });

  test("a PDF download is not cached by shared caches and is not sniffed", async () => {
    const tester = await as(demoAccounts.tester);
    const [report] = await testDb()
      .select({ id: testReports.id })
      .from(testReports)
      .innerJoin(users, eq(users.id, testReports.testerId))
      .where(eq(users.email, demoAccounts.tester))
      .limit(1);
    const id = report?.id;
    expect(id, "the demo tester has a report").toBeTruthy();
    const response = await tester.get(`/api/reports/${id}/pdf`);
    expect(response.status).toBe(200);
    expect(response.headers["content-type"]).toBe("application/pdf");
    expect(response.headers["cache-control"]).toContain("no-store");
    expect(response.headers["x-content-type-options"]).toBe("nosniff");
  });
});
