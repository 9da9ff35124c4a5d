import "server-only";
import { eq } from "drizzle-orm";
import { cache } from "react";
import { getDb } from "@/db/client";
import { programs, programSettings } from "@/db/schema";

/** The program's display name (cached per request). */
export const programName = cache(async (programId: number): Promise<string | null> => {
  const [row] = await getDb().select({ name: programs.name }).from(programs).where(eq(programs.id, programId)).limit(1);
  return row?.name ?? null;
});

export const getProgramWithSettings = cache(async (programId: number) => {
  const [row] = await getDb()
    .select({ program: programs, settings: programSettings })
    .from(programs)
    .innerJoin(programSettings, eq(programSettings.programId, programs.id))
    .where(eq(programs.id, programId))
    .limit(1);
  return row ?? null;
});
