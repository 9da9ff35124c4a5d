// Integration and browser suites run against the app that `npm test` built and started.
export default async function checkAppIsUp(): Promise<void> {
  const url = process.env.TEST_APP_URL;
  if (!url) throw new Error("TEST_APP_URL is not set: run the suites through `npm test`, which starts the app, the database and the mail stand-in.");
  const response = await fetch(new URL("/api/health", url)).catch(() => null);
  if (!response?.ok) throw new Error(`The app under test does not answer at ${url}/api/health.`);
}
