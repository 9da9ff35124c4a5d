// A tester files a report while the program charges a fee (through the submission API, as the
// field-test form does), pays it in the browser on the stand-in's checkout page, sees "payment
// being confirmed" until the webhook lands, then the report queued. The cancel case uses a
// report made with the fee test factory.
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Browser } from "playwright-core";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { appUrl, launchBrowser, screenshot, signInWithBrowser } from "../helpers/browser";
import { closeTestDb } from "../helpers/db";
import { createOwedReport, reportFeeState, userIdOf } from "../helpers/fees-factory";
import { sessionCookieFor } from "../helpers/http";
import { createAssembly, createTester, rpSubmission } from "../integration/tester-fixtures";
import { holdStandInWebhooks, listStandInEvents, replayWebhook, sessionIdFromUrl } from "../helpers/payments";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

async function chooseOnly(page: import("playwright-core").Page, reportNumber: string) {
  const selectAll = page.getByRole("checkbox", { name: "Select all" }).first();
  if (await selectAll.isChecked()) await selectAll.uncheck();
  await page.getByRole("checkbox", { name: `Pay the fee of report ${reportNumber}` }).check();
}

describe("paying a filing fee in the browser", () => {
  test("file a report, pay on the checkout page, see it confirmed, the report queued and the receipt listed", async () => {
    const tester = await createTester({ programIds: [1] });
    const assembly = await createAssembly({ programId: 1, kind: "RP" });
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const token = (await sessionCookieFor(tester.email)).split("=")[1]!;
    await context.addCookies([{ name: "zw_session", value: token, url: appUrl("/") }]);
    const page = await context.newPage();
    const filed = await page.request.post(appUrl("/api/reports"), { data: rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name }) });
    expect(filed.status()).toBe(201);
    const reportId = ((await filed.json()) as { id: number }).id;
    const report = { id: reportId, reportNumber: ((await filed.json()) as { reportNumber: string }).reportNumber };
    expect(await reportFeeState(report.id)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed", feeCents: 1500 });

    await page.goto(appUrl("/tester"));
    await page.getByRole("link", { name: "Fees" }).first().click();
    await page.waitForURL((url) => url.pathname === "/tester/fees");
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Filing fees");
    await chooseOnly(page, report.reportNumber);
    await screenshot(page, "fees-outstanding");

    await Promise.all([page.waitForURL((url) => url.pathname.startsWith("/checkout/")), page.getByRole("button", { name: "Pay $15.00" }).click()]);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Pay $15.00");
    expect(await page.textContent("body")).toContain(`Filing fee, report ${report.reportNumber}`);
    await screenshot(page, "fees-standin-checkout");

    // The webhook is kept back: coming back from the checkout page alone confirms nothing.
    const sessionId = sessionIdFromUrl(page.url());
    await holdStandInWebhooks(sessionId);
    await Promise.all([page.waitForURL((url) => url.pathname === "/tester/fees/return"), page.getByRole("button", { name: "Pay $15.00" }).click()]);
    await expect.poll(() => page.getByRole("status").first().textContent()).toContain("Payment being confirmed");
    await screenshot(page, "fees-return-confirming");
    expect(await reportFeeState(report.id)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed" });
    const completed = (await listStandInEvents("checkout.session.completed")).data.find((e) => e.data.object.id === sessionId)!;
    expect((await replayWebhook(completed.id)).results[0]!.status).toBe(200);
    await expect.poll(() => page.getByRole("status").first().textContent(), { timeout: 20_000 }).toContain("Payment confirmed");
    await expect.poll(() => page.getByText("Queued for review").count()).toBeGreaterThan(0);
    await screenshot(page, "fees-return-confirmed");
    expect(await reportFeeState(report.id)).toMatchObject({ status: "queued", feeStatus: "paid" });

    await page.goto(appUrl(`/tester/reports/${report.id}`));
    await screenshot(page, "fees-report-after-payment");
    await page.goto(appUrl("/tester/fees"));
    await page.getByRole("link", { name: "Receipts" }).first().click();
    await page.waitForURL((url) => url.pathname === "/tester/fees/receipts");
    expect(await page.textContent("main")).toContain(report.reportNumber);
    await screenshot(page, "fees-receipts");
    await context.close();
  });

  test("cancel on the checkout page: nothing charged, the fee is still there to pay (phone size)", async () => {
    const report = await createOwedReport({ testerId: await userIdOf(demoAccounts.tester), feeCents: 1500 });
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await signInWithBrowser(context, demoAccounts.tester, DEMO_PASSWORD);
    await page.goto(appUrl("/tester/fees"));
    await chooseOnly(page, report.reportNumber);
    await Promise.all([page.waitForURL((url) => url.pathname.startsWith("/checkout/")), page.getByRole("button", { name: "Pay $15.00" }).click()]);
    await Promise.all([page.waitForURL((url) => url.pathname === "/tester/fees/return"), page.getByRole("button", { name: "Cancel" }).click()]);
    await expect.poll(() => page.getByRole("status").first().textContent()).toContain("Checkout canceled");
    await screenshot(page, "fees-return-canceled-phone");
    expect(await reportFeeState(report.id)).toMatchObject({ status: "awaiting_fee", feeStatus: "owed" });
    await page.getByRole("link", { name: "Back to filing fees" }).click();
    await page.waitForURL((url) => url.pathname === "/tester/fees");
    await expect.poll(() => page.getByRole("checkbox", { name: `Pay the fee of report ${report.reportNumber}` }).count()).toBe(1);
    await screenshot(page, "fees-outstanding-phone");
    await context.close();
  });
});
