// The backup and restore commands: a restore into a fresh database matches the original's
// row counts and table checksums.
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import mysql from "mysql2/promise";
import { afterAll, describe, expect, test } from "vitest";
import { backupDatabase } from "@/scripts/db-backup";
import { restoreDatabase } from "@/scripts/db-restore";

const url = process.env.DATABASE_URL!;
const restoredName = "zw_restore_check";

afterAll(async () => {
  const c = await mysql.createConnection({ uri: process.env.TEST_DB_ADMIN_URL });
  await c.query(`DROP DATABASE IF EXISTS \`${restoredName}\``);
  await c.end();
});

describe("database backup and restore", () => {
  test("a restored copy has the same rows and checksums as the backup", async () => {
    const dir = mkdtempSync(path.join(tmpdir(), "zw-backup-"));
    const { file, manifest } = await backupDatabase(url, path.join(dir, "zoneward.sql.gz"));
    expect(file).toMatch(/\.sql\.gz$/);
    expect(manifest).toMatch(/manifest\.json$/);
    const result = await restoreDatabase(url, file, restoredName);
    expect(result.mismatches).toEqual([]);

    const c = await mysql.createConnection({ uri: `${process.env.TEST_DB_ADMIN_URL}/${restoredName}` });
    const [[row]] = (await c.query("SELECT COUNT(*) AS n FROM test_reports")) as unknown as [[{ n: number }]];
    expect(Number(row.n)).toBeGreaterThan(1000);
    await c.end();
  });

  test("a missing file or a bad target name is refused", async () => {
    await expect(restoreDatabase(url, "/nonexistent/backup.sql.gz", restoredName)).rejects.toThrow(/No such backup file/);
    await expect(restoreDatabase(url, "/nonexistent/backup.sql.gz", "bad name; DROP")).rejects.toThrow();
  });
});
