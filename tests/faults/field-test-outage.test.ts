// The database goes away just as a tester presses Submit in the browser: the form says the
// service is briefly unavailable and keeps the test on the phone; after the database is back,
// a reload brings the test back and Submit files it, once.
import { and, eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { testReports } from "@/db/schema";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { appUrl, launchBrowser, screenshot, signInWithBrowser } from "../helpers/browser";
import { isDatabaseServerAvailable, startDatabaseServer, stopDatabaseServer } from "../helpers/database-server";
import { closeTestDb, testDb } from "../helpers/db";
import { pickUntestedRp, today } from "../integration/tester-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe.runIf(isDatabaseServerAvailable())("a database outage as the tester submits", () => {
  test("the form keeps the test and says to try again; once the database is back the report is filed once", async () => {
    const assembly = await pickUntestedRp(5);
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true });
    const page = await signInWithBrowser(context, demoAccounts.tester, DEMO_PASSWORD);
    await page.goto(appUrl(`/tester/reports/new?assembly=${assembly.id}`));
    await page.getByText("Gaugewright DG-5").click();
    await page.getByRole("radio", { name: "As approved", exact: true }).click();
    await page.getByRole("radio", { name: "Air gap present" }).click();
    await page.getByLabel(/Line pressure/).fill("61");
    await page.locator("#initial-reliefValveOpeningPoint").fill("2.5");
    await page.locator("#initial-check1Differential").fill("6.1");
    await page.locator("#initial-check1ClosedTight").getByRole("radio", { name: "Closed tight" }).click();
    await page.locator("#initial-check2ClosedTight").getByRole("radio", { name: "Held tight" }).click();
    await page.locator("#initial-shutoff2Tight").getByRole("radio", { name: "Tight", exact: true }).click();
    await expect.poll(() => page.getByTestId("initial-outcome").getAttribute("data-outcome")).toBe("pass");
    await page.locator("#field-attestationName").fill("Dana Whitlock-Ray");
    await page.getByLabel("The readings are true and were taken by me.").check();
    await expect.poll(() => page.getByTestId("save-status").getAttribute("data-server"), { timeout: 15_000 }).toBe("saved");

    await closeTestDb();
    await stopDatabaseServer();
    try {
      await page.getByTestId("submit-report").click();
      await expect.poll(() => page.getByText(/briefly unavailable/).count(), { timeout: 30_000 }).toBeGreaterThan(0);
      await screenshot(page, "tester-submit-during-outage");
      expect(new URL(page.url()).pathname).toBe("/tester/reports/new");
      // The phone still holds the test, readings and all.
      const stored = await page.evaluate(() => Object.entries(localStorage).filter(([key]) => key.startsWith("zw:draft:")).map(([, value]) => value));
      expect(stored).toHaveLength(1);
      expect(stored[0]).toContain("2.5");
    } finally {
      await startDatabaseServer();
    }

    // The app finds the database again by itself.
    await expect.poll(async () => (await page.request.get(appUrl("/api/health"))).status(), { timeout: 60_000, interval: 500 }).toBe(200);
    await page.reload();
    await expect.poll(() => page.getByText(/Continuing the test saved on this/).count(), { timeout: 15_000 }).toBe(1);
    expect(await page.locator("#initial-reliefValveOpeningPoint").inputValue()).toBe("2.5");
    await page.locator("#field-attestationName").fill("Dana Whitlock-Ray");
    const attest = page.getByLabel("The readings are true and were taken by me.");
    if (!(await attest.isChecked())) await attest.check();
    await Promise.all([page.waitForURL(/\/tester\/reports\/\d+\?filed=1/, { timeout: 30_000 }), page.getByTestId("submit-report").click()]);

    const filed = await testDb().select({ id: testReports.id }).from(testReports).where(and(eq(testReports.assemblyId, assembly.id), eq(testReports.testedOn, today())));
    expect(filed).toHaveLength(1);
    await context.close();
  });
});
