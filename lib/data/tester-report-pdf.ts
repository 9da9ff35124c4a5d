import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { programs } from "@/db/schema";
import { NotFoundError } from "@/lib/errors";

/** The program's name and contact lines printed on a report (public information of the purveyor). */
export async function getReportProgramContact(programId: number): Promise<{ name: string; phone: string; mailingAddress: string; contactEmail: string; timezone: string }> {
  const [row] = await getDb()
    .select({ name: programs.name, phone: programs.phone, mailingAddress: programs.mailingAddress, contactEmail: programs.contactEmail, timezone: programs.timezone })
    .from(programs)
    .where(eq(programs.id, programId))
    .limit(1);
  if (!row) throw new NotFoundError("No such program.");
  return row;
}
