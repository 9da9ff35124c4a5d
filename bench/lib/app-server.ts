// Starts the built app (next start) against a given database for a benchmark, in its own
// process group so stopping it stops everything it started.
import { spawn, type ChildProcess } from "node:child_process";
import { createHash, randomBytes } from "node:crypto";
import mysql from "mysql2/promise";

export interface RunningApp {
  url: string;
  stop: () => Promise<void>;
}

export async function startApp(options: { databaseUrl: string; port: number; env?: Record<string, string> }): Promise<RunningApp> {
  const url = `http://127.0.0.1:${options.port}`;
  const child: ChildProcess = spawn("node", ["--max-semi-space-size=64", "node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(options.port)], {
    env: { ...process.env, DATABASE_URL: options.databaseUrl, APP_URL: url, COOKIE_SECURE: "false", NEXT_TELEMETRY_DISABLED: "1", DB_POOL_SIZE: "40", ...options.env },
    stdio: ["ignore", "ignore", "inherit"],
    detached: true,
  });
  for (let i = 0; i < 300; i++) {
    const ok = await fetch(`${url}/api/health`).then((r) => r.ok, () => false);
    if (ok) break;
    if (child.exitCode !== null) throw new Error("the app exited at start");
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    stop: async () => {
      try {
        process.kill(-child.pid!, "SIGTERM");
      } catch {
        /* already gone */
      }
      await new Promise((r) => setTimeout(r, 500));
    },
  };
}

/** A session cookie for a user of the benchmark database, written as sign-in writes it. */
export async function sessionCookie(databaseUrl: string, email: string): Promise<string> {
  const c = await mysql.createConnection({ uri: databaseUrl });
  try {
    const [[user]] = (await c.query("SELECT id FROM users WHERE email = ?", [email])) as unknown as [[{ id: number } | undefined]];
    if (!user) throw new Error(`no user ${email} in the benchmark database (run npm run seed:scale first)`);
    const token = randomBytes(20).toString("base64url");
    await c.query("INSERT INTO sessions (id, user_id, expires_at) VALUES (?, ?, ?)", [createHash("sha256").update(token).digest("hex"), user.id, new Date(Date.now() + 86_400_000)]);
    return `zw_session=${token}`;
  } finally {
    await c.end();
  }
}
