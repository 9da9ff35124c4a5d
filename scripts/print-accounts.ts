// Prints the demo accounts after `npm start`, read from the database so it never lies.
import { inArray, sql } from "drizzle-orm";
import { closeDb, getDb } from "@/db/client";
import { users } from "@/db/schema";
import { DEMO_PASSWORD, demoAccountEmails } from "@/db/seed/demo-accounts";

async function main() {
  const rows = await getDb()
    .select({ email: users.email, name: users.name, role: users.role })
    .from(users)
    .where(inArray(users.email, demoAccountEmails()))
    .orderBy(sql`FIELD(${users.role}, 'admin', 'inspector', 'tester', 'owner')`, users.email);
  if (rows.length === 0) {
    console.log("No demo accounts in this database.");
    return;
  }
  console.log(`\nDemo accounts (password for all: ${DEMO_PASSWORD})`);
  for (const r of rows) console.log(`  ${r.role.padEnd(9)} ${r.email.padEnd(44)} ${r.name}`);
  console.log("");
}

main()
  .then(() => closeDb())
  .catch(async (e) => {
    console.error(e);
    await closeDb();
    process.exit(1);
  });
