// Applies the committed Drizzle migrations to DATABASE_URL (creating nothing else).
import path from "node:path";
import { migrate } from "drizzle-orm/mysql2/migrator";
import { closeDb, getDb } from "@/db/client";

export async function applyMigrations(): Promise<void> {
  await migrate(getDb(), { migrationsFolder: path.join(process.cwd(), "db/migrations") });
}

if (process.argv[1] && import.meta.url.endsWith(path.basename(process.argv[1]))) {
  applyMigrations()
    .then(() => closeDb())
    .catch(async (error: unknown) => {
      console.error(error);
      await closeDb();
      process.exit(1);
    });
}
