// Stops and restarts the test run's private MariaDB (for the fault tests), with the same
// flags scripts/lib.sh starts it with.
import { execFileSync, spawn } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { userInfo } from "node:os";
import path from "node:path";

const dir = process.env.TEST_DB_DATA_DIR ?? "";
const port = process.env.TEST_DB_PORT_NUMBER ?? "3318";
const socket = path.join(dir, "run", "mariadb.sock");
const pidFile = path.join(dir, "run", "mariadb.pid");

function binary(name: string): string {
  for (const candidate of [process.env[name === "mariadbd" ? "MARIADBD" : "MARIADB_ADMIN"], `/usr/sbin/${name}`, `/usr/bin/${name}`]) if (candidate && existsSync(candidate)) return candidate;
  return name;
}

export function isDatabaseServerAvailable(): boolean {
  return Boolean(dir) && existsSync(pidFile);
}

export async function stopDatabaseServer(): Promise<void> {
  const pid = Number(readFileSync(pidFile, "utf8").trim());
  execFileSync(binary("mariadb-admin"), ["--no-defaults", "--user=root", `--socket=${socket}`, "shutdown"]);
  for (let i = 0; i < 100; i++) {
    try {
      process.kill(pid, 0);
    } catch {
      return;
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error("MariaDB did not stop");
}

export async function startDatabaseServer(): Promise<void> {
  const child = spawn(
    binary("mariadbd"),
    [
      "--no-defaults",
      `--user=${userInfo().username}`,
      `--datadir=${path.join(dir, "data")}`,
      `--socket=${socket}`,
      `--pid-file=${pidFile}`,
      `--port=${port}`,
      "--bind-address=127.0.0.1",
      "--character-set-server=utf8mb4",
      "--collation-server=utf8mb4_unicode_ci",
      "--skip-log-bin",
      `--log-error=${path.join(dir, "run", "error.log")}`,
      "--max-connections=300",
      "--innodb-flush-log-at-trx-commit=2",
    ],
    { detached: true, stdio: "ignore" },
  );
  child.unref();
  for (let i = 0; i < 150; i++) {
    try {
      execFileSync(binary("mariadb-admin"), ["--no-defaults", "--user=root", `--socket=${socket}`, "ping"], { stdio: "ignore" });
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  throw new Error("MariaDB did not come back");
}
