// npm run db:backup [FILE]: a consistent, compressed dump of the database (mariadb-dump with
// --single-transaction: no locks, a snapshot as of the start), plus a manifest of row counts
// and table checksums that db:restore checks the restored copy against.
import { spawn } from "node:child_process";
import { createWriteStream, mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { createGzip } from "node:zlib";
import mysql from "mysql2/promise";
import { binaries, clientArgs, clientEnv, targetFromUrl, waitFor, type DbTarget } from "./db-tools";

export async function tableFacts(t: DbTarget): Promise<Record<string, { rows: number; checksum: string }>> {
  const c = await mysql.createConnection({ host: t.host, port: t.port, user: t.user, password: t.password, database: t.database });
  try {
    const [tables] = (await c.query("SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name")) as unknown as [{ name: string }[]];
    const facts: Record<string, { rows: number; checksum: string }> = {};
    for (const { name } of tables) {
      const [[count]] = (await c.query(`SELECT COUNT(*) AS n FROM \`${name}\``)) as unknown as [[{ n: number }]];
      const [[sum]] = (await c.query(`CHECKSUM TABLE \`${name}\``)) as unknown as [[{ Checksum: number | string | null }]];
      facts[name] = { rows: Number(count.n), checksum: String(sum.Checksum) };
    }
    return facts;
  } finally {
    await c.end();
  }
}

export async function backupDatabase(url: string, file: string): Promise<{ file: string; manifest: string }> {
  const target = targetFromUrl(url);
  mkdirSync(path.dirname(file), { recursive: true });
  const dump = spawn(binaries.dump, [...clientArgs(target), "--single-transaction", "--quick", "--routines", "--triggers", "--hex-blob", "--add-drop-table", target.database], { env: clientEnv(target), stdio: ["ignore", "pipe", "pipe"] });
  const done = waitFor(dump, "mariadb-dump");
  await pipeline(dump.stdout, createGzip(), createWriteStream(file));
  await done;
  const manifest = `${file}.manifest.json`;
  writeFileSync(manifest, JSON.stringify({ database: target.database, takenAt: new Date().toISOString(), tables: await tableFacts(target) }, null, 2));
  return { file, manifest };
}

if (process.argv[1]?.endsWith("db-backup.ts")) {
  const stamp = new Date().toISOString().replace(/[-:]/g, "").replace("T", "-").slice(0, 15);
  const file = process.argv[2] ?? path.join(process.env.DATA_DIR ?? ".data", "backups", `zoneward-${stamp}.sql.gz`);
  backupDatabase(process.env.DATABASE_URL ?? "", file)
    .then(({ file: f, manifest }) => console.log(`backup written: ${f}\nmanifest: ${manifest}`))
    .catch((error: unknown) => {
      console.error(error instanceof Error ? error.message : error);
      process.exit(1);
    });
}
