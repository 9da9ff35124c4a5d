// Each role signs in with the browser and lands on its own home page; screenshots are kept.
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Browser } from "playwright-core";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { appUrl, launchBrowser, screenshot, signInWithBrowser } from "../helpers/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("signing in as each role", () => {
  test.each([
    { role: "tester", email: demoAccounts.tester, home: "/tester", heading: /Hello, Dana/ },
    { role: "inspector", email: demoAccounts.inspector, home: "/inspector", heading: /Quillmere Valley Water District/ },
    { role: "admin", email: demoAccounts.admin, home: "/admin", heading: /Quillmere Valley Water District/ },
    { role: "owner", email: demoAccounts.owner, home: "/owner", heading: /My sites/ },
  ])("$role", async ({ role, email, home, heading }) => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await signInWithBrowser(context, email, DEMO_PASSWORD);
    expect(new URL(page.url()).pathname).toBe(home);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toMatch(heading);
    await screenshot(page, `home-${role}`);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((url) => url.pathname === "/login");
    await context.close();
  });

  test("a wrong password shows the message on the form", async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await page.goto(appUrl("/login"));
    await page.getByLabel("E-mail address").fill(demoAccounts.tester);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toMatch(/do not match/);
    await screenshot(page, "login-wrong-password-phone");
    await context.close();
  });
});
