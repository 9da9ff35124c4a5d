// Shared by the backup and restore commands: connection details from DATABASE_URL and the
// MariaDB client programs (paths found by scripts/lib.sh, else from PATH).
import { spawn } from "node:child_process";

export interface DbTarget {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

export function targetFromUrl(url: string): DbTarget {
  const u = new URL(url);
  return { host: u.hostname, port: Number(u.port || 3306), user: decodeURIComponent(u.username), password: decodeURIComponent(u.password), database: u.pathname.replace(/^\//, "") };
}

export function clientArgs(t: DbTarget): string[] {
  return ["--no-defaults", `--host=${t.host}`, `--port=${t.port}`, `--user=${t.user}`, "--protocol=tcp", "--default-character-set=utf8mb4"];
}

/** The password goes through the environment, never the command line (ps would show it). */
export function clientEnv(t: DbTarget): NodeJS.ProcessEnv {
  return { ...process.env, MYSQL_PWD: t.password };
}

export const binaries = {
  dump: process.env.MARIADB_DUMP || "mariadb-dump",
  client: process.env.MARIADB_CLIENT || "mariadb",
};

export function waitFor(child: ReturnType<typeof spawn>, what: string): Promise<void> {
  return new Promise((resolve, reject) => {
    let stderr = "";
    child.stderr?.on("data", (d: Buffer) => (stderr += d.toString()));
    child.on("error", reject);
    child.on("close", (code) => (code === 0 ? resolve() : reject(new Error(`${what} failed (exit ${code}): ${stderr.trim()}`))));
  });
}
