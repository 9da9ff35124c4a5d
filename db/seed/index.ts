// npm run seed (--fresh: empty every table first) / npm start (--if-empty: only a new database).
// Usage: tsx db/seed/index.ts [--fresh | --if-empty] [--anchor YYYY-MM-DD] [--quiet]
import { sql } from "drizzle-orm";
import { closeDb, getDb, type Database } from "@/db/client";
import { programs } from "@/db/schema";
import { todayInZone } from "@/lib/programs/settings";
import { seedDemo } from "./demo";
import { DEMO_PASSWORD } from "./demo-accounts";

/** Every table of ours, children before parents. */
export async function emptyAllTables(db: Database): Promise<void> {
  const [rows] = (await db.execute(sql`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' AND table_name NOT LIKE '__drizzle%'`)) as unknown as [{ name: string }[]];
  await db.execute(sql`SET FOREIGN_KEY_CHECKS = 0`);
  try {
    for (const { name } of rows) await db.execute(sql.raw(`TRUNCATE TABLE \`${name}\``));
  } finally {
    await db.execute(sql`SET FOREIGN_KEY_CHECKS = 1`);
  }
}

export async function isDatabaseEmpty(db: Database): Promise<boolean> {
  const [row] = await db.select({ n: sql<number>`COUNT(*)` }).from(programs);
  return Number(row?.n ?? 0) === 0;
}

/** Seeds the demo; with ifEmpty, does nothing to a database that already has a program (idempotent). */
export async function runSeed(db: Database, options: { fresh?: boolean; ifEmpty?: boolean; anchor?: string; quiet?: boolean }): Promise<Record<string, number> | null> {
  const log = options.quiet ? () => {} : (line: string) => console.log(`[seed] ${line}`);
  if (options.fresh) {
    log("emptying every table");
    await emptyAllTables(db);
  } else if (!(await isDatabaseEmpty(db))) {
    log("the database already has data: nothing to seed");
    return null;
  }
  const anchor = options.anchor ?? todayInZone("Etc/GMT+6");
  const started = Date.now();
  const counts = await seedDemo(db, { anchor, log });
  log(`demo seeded as of ${anchor} in ${((Date.now() - started) / 1000).toFixed(1)} s: ${Object.entries(counts).map(([k, v]) => `${v} ${k}`).join(", ")}`);
  log(`every demo account's password: ${DEMO_PASSWORD}`);
  return counts;
}

async function main() {
  const args = process.argv.slice(2);
  const anchorIndex = args.indexOf("--anchor");
  const anchor = anchorIndex >= 0 ? args[anchorIndex + 1] : process.env.SEED_ANCHOR || undefined;
  if (anchor && !/^\d{4}-\d{2}-\d{2}$/.test(anchor)) throw new Error("--anchor takes a date written YYYY-MM-DD");
  await runSeed(getDb(), { fresh: args.includes("--fresh"), ifEmpty: args.includes("--if-empty"), anchor, quiet: args.includes("--quiet") });
}

if (process.argv[1]?.endsWith("seed/index.ts")) {
  main()
    .then(() => closeDb())
    .catch(async (error: unknown) => {
      console.error(error);
      await closeDb();
      process.exit(1);
    });
}
