// Migrations build the schema from nothing; the demo seed is deterministic and idempotent.
import path from "node:path";
import { sql } from "drizzle-orm";
import { migrate } from "drizzle-orm/mysql2/migrator";
import { afterAll, describe, expect, test } from "vitest";
import { runSeed } from "@/db/seed";
import { createScratchDatabase } from "../helpers/db";

const drops: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const drop of drops) await drop();
});

async function tableCounts(db: Awaited<ReturnType<typeof createScratchDatabase>>["db"]) {
  const [rows] = (await db.execute(sql`SELECT table_name AS name, table_rows AS n FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'`)) as unknown as [{ name: string }[]];
  const out: Record<string, number> = {};
  for (const { name } of rows) {
    const [[row]] = (await db.execute(sql.raw(`SELECT COUNT(*) AS n FROM \`${name}\``))) as unknown as [[{ n: number }]];
    out[name] = Number(row.n);
  }
  return out;
}

describe("migrations and the demo seed", () => {
  test("the migrations apply to an empty database, and again without change", async () => {
    const scratch = await createScratchDatabase("zw_scratch_migrate");
    drops.push(scratch.drop);
    const folder = path.join(process.cwd(), "db/migrations");
    await migrate(scratch.db, { migrationsFolder: folder });
    const counts = await tableCounts(scratch.db);
    expect(Object.keys(counts)).toEqual(expect.arrayContaining(["programs", "users", "sessions", "assemblies", "test_reports", "reviews", "notices", "audit_log"]));
    await migrate(scratch.db, { migrationsFolder: folder });
    expect(await tableCounts(scratch.db)).toEqual(counts);
  });

  test("seeding twice changes nothing the second time; the same anchor gives the same data", async () => {
    const scratch = await createScratchDatabase("zw_scratch_seed");
    drops.push(scratch.drop);
    await migrate(scratch.db, { migrationsFolder: path.join(process.cwd(), "db/migrations") });
    const first = await runSeed(scratch.db, { ifEmpty: true, anchor: "2026-12-01", quiet: true });
    expect(first).not.toBeNull();
    expect(first!.assemblies).toBeGreaterThanOrEqual(2000);
    expect(first!.sites).toBeGreaterThanOrEqual(1500);
    const afterFirst = await tableCounts(scratch.db);
    expect(await runSeed(scratch.db, { ifEmpty: true, anchor: "2026-12-01", quiet: true })).toBeNull();
    expect(await tableCounts(scratch.db)).toEqual(afterFirst);

    const [[fingerprint]] = (await scratch.db.execute(sql`SELECT SUM(CRC32(CONCAT(report_number, fingerprint, tested_on))) AS s FROM test_reports`)) as unknown as [[{ s: number }]];
    const again = await runSeed(scratch.db, { fresh: true, anchor: "2026-12-01", quiet: true });
    expect(again).toEqual(first);
    const [[fingerprintAgain]] = (await scratch.db.execute(sql`SELECT SUM(CRC32(CONCAT(report_number, fingerprint, tested_on))) AS s FROM test_reports`)) as unknown as [[{ s: number }]];
    expect(fingerprintAgain.s).toEqual(fingerprint.s);
  });
});
