import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";

/**
 * Debian's Chromium, headless, with every background connection off (the machine has no
 * network). Playwright gives each launch a fresh, empty profile directory of its own.
 */
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--disable-dev-shm-usage"],
  });
}

export function appUrl(pathname = "/"): string {
  const base = process.env.TEST_APP_URL ?? "http://127.0.0.1:3000";
  return new URL(pathname, base).toString();
}

export async function signInWithBrowser(context: BrowserContext, email: string, password: string): Promise<Page> {
  const page = await context.newPage();
  await page.goto(appUrl("/login"));
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await Promise.all([page.waitForURL((url) => !url.pathname.startsWith("/login")), page.getByRole("button", { name: "Sign in" }).click()]);
  return page;
}

export async function screenshot(page: Page, name: string): Promise<string> {
  const dir = process.env.SCREENSHOT_DIR ?? path.join(process.cwd(), ".data-test", "screenshots");
  mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}
