// npm run db:restore FILE [--into NAME]: loads a backup into a fresh database (default: a new
// one named after the file, so nothing live is overwritten) and checks every table's row count
// and checksum against the backup's manifest. --into the configured database replaces it.
import { spawn } from "node:child_process";
import { createReadStream, existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { createGunzip } from "node:zlib";
import mysql from "mysql2/promise";
import { tableFacts } from "./db-backup";
import { binaries, clientArgs, clientEnv, targetFromUrl, waitFor } from "./db-tools";

export async function restoreDatabase(url: string, file: string, into: string): Promise<{ database: string; mismatches: string[] }> {
  if (!existsSync(file)) throw new Error(`No such backup file: ${file}`);
  if (!/^[A-Za-z0-9_]{1,64}$/.test(into)) throw new Error("The target database name may use letters, digits and _ only.");
  const target = { ...targetFromUrl(url), database: into };
  const admin = await mysql.createConnection({ host: target.host, port: target.port, user: target.user, password: target.password });
  await admin.query(`DROP DATABASE IF EXISTS \`${into}\``);
  await admin.query(`CREATE DATABASE \`${into}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.end();
  const load = spawn(binaries.client, [...clientArgs(target), into], { env: clientEnv(target), stdio: ["pipe", "ignore", "pipe"] });
  const done = waitFor(load, "mariadb (restore)");
  await pipeline(createReadStream(file), createGunzip(), load.stdin);
  await done;
  const mismatches: string[] = [];
  const manifestFile = `${file}.manifest.json`;
  if (existsSync(manifestFile)) {
    const expected = (JSON.parse(readFileSync(manifestFile, "utf8")) as { tables: Record<string, { rows: number; checksum: string }> }).tables;
    const actual = await tableFacts(target);
    for (const [name, facts] of Object.entries(expected)) {
      const got = actual[name];
      if (!got) mismatches.push(`${name}: missing`);
      else if (got.rows !== facts.rows) mismatches.push(`${name}: ${got.rows} rows, expected ${facts.rows}`);
      else if (got.checksum !== facts.checksum) mismatches.push(`${name}: checksum differs`);
    }
  }
  return { database: into, mismatches };
}

if (process.argv[1]?.endsWith("db-restore.ts")) {
  const args = process.argv.slice(2);
  const file = args.find((a) => !a.startsWith("--") && a !== args[args.indexOf("--into") + 1]);
  if (!file) {
    console.error("Usage: npm run db:restore FILE [--into DATABASE]");
    process.exit(2);
  }
  const url = process.env.DATABASE_URL ?? "";
  const intoIndex = args.indexOf("--into");
  const into = intoIndex >= 0 ? args[intoIndex + 1]! : `restored_${path.basename(file).replace(/\W+/g, "_").slice(0, 40)}`;
  restoreDatabase(url, file, into)
    .then(({ database, mismatches }) => {
      if (mismatches.length) {
        console.error(`restored into ${database}, but it differs from the backup:\n  ${mismatches.join("\n  ")}`);
        process.exit(1);
      }
      console.log(`restored into database ${database}; every table's row count and checksum match the backup`);
    })
    .catch((error: unknown) => {
      console.error(error instanceof Error ? error.message : error);
      process.exit(1);
    });
}
