import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db/client";
import { localRuleSets, programs, programSettings, testerApprovals } from "@/db/schema";
import type { Actor } from "@/lib/auth/permissions";
import { ForbiddenError, NotFoundError } from "@/lib/errors";
import { ruleSetForEdition, todayInZone } from "@/lib/programs/settings";
import { ruleSetById, type RuleSet } from "@/lib/rules";
import { prepared } from "./prepared";

export type ProgramSettingsRow = typeof programSettings.$inferSelect;

/** A program a tester may file in, with what the field-test form needs from its settings. */
export interface TesterProgram {
  id: number;
  name: string;
  shortName: string;
  reportPrefix: string;
  timezone: string;
  units: "psid" | "kPa";
  kitPolicy: "refuse" | "flag";
  ruleSet: RuleSet;
  settings: ProgramSettingsRow;
  /** Today in the program's time zone. */
  today: string;
}

type ProgramRow = { program: typeof programs.$inferSelect; settings: ProgramSettingsRow };

/** The programs' own rule-set editions, read only for programs that use one (most use a published edition). */
async function localEditionsFor(executor: Executor, rows: ProgramRow[]) {
  const programIds = rows.filter((r) => ruleSetById(r.settings.ruleSetEdition) === undefined).map((r) => r.program.id);
  if (programIds.length === 0) return [];
  return executor.select({ programId: localRuleSets.programId, edition: localRuleSets.edition, data: localRuleSets.data }).from(localRuleSets).where(inArray(localRuleSets.programId, programIds));
}

async function toTesterPrograms(executor: Executor, rows: ProgramRow[]): Promise<TesterProgram[]> {
  const locals = await localEditionsFor(executor, rows);
  return rows.map(({ program, settings }) => ({
    id: program.id,
    name: program.name,
    shortName: program.shortName,
    reportPrefix: program.reportPrefix,
    timezone: program.timezone,
    units: settings.units,
    kitPolicy: settings.kitPolicy,
    ruleSet: ruleSetForEdition(
      settings.ruleSetEdition,
      locals.filter((l) => l.programId === program.id),
    ),
    settings,
    today: todayInZone(program.timezone),
  }));
}

async function loadPrograms(executor: Executor, programIds: number[]): Promise<TesterProgram[]> {
  if (programIds.length === 0) return [];
  const rows = await executor
    .select({ program: programs, settings: programSettings })
    .from(programs)
    .innerJoin(programSettings, eq(programSettings.programId, programs.id))
    .where(inArray(programs.id, programIds))
    .orderBy(asc(programs.name));
  return toTesterPrograms(executor, rows);
}

/** Ids of the programs that approved this tester: one indexed look-up, for every search keystroke. */
export async function listApprovedProgramIds(actor: Actor): Promise<number[]> {
  if (actor.role !== "tester") return [];
  const statement = prepared("tester.approvedProgramIds", () =>
    getDb()
      .select({ programId: testerApprovals.programId })
      .from(testerApprovals)
      .where(and(eq(testerApprovals.testerId, sql.placeholder("testerId")), eq(testerApprovals.status, "approved")))
      .prepare(),
  );
  const rows = await statement.execute({ testerId: actor.id });
  return rows.map((r) => r.programId);
}

/** The programs that approved this tester (tester_approvals.status = 'approved'), by name. */
export async function listApprovedPrograms(actor: Actor, executor: Executor = getDb()): Promise<TesterProgram[]> {
  if (actor.role !== "tester") return [];
  const rows = await executor
    .select({ programId: testerApprovals.programId })
    .from(testerApprovals)
    .where(and(eq(testerApprovals.testerId, actor.id), eq(testerApprovals.status, "approved")));
  return loadPrograms(
    executor,
    rows.map((r) => r.programId),
  );
}

/**
 * The program, if this tester may file in it. A program the tester never applied to is "not
 * found"; one that has not approved them (pending, rejected, suspended) says so plainly.
 */
export async function requireApprovedProgram(actor: Actor, programId: number, executor: Executor = getDb()): Promise<TesterProgram> {
  // The approval, the program and its settings in one look-up.
  const [row] = await executor
    .select({ status: testerApprovals.status, program: programs, settings: programSettings })
    .from(testerApprovals)
    .innerJoin(programs, eq(programs.id, testerApprovals.programId))
    .innerJoin(programSettings, eq(programSettings.programId, programs.id))
    .where(and(eq(testerApprovals.testerId, actor.id), eq(testerApprovals.programId, programId)))
    .limit(1);
  if (!row) throw new NotFoundError("No such assembly in the programs you test for.");
  if (row.status !== "approved") {
    const why = row.status === "pending" ? "has not approved you yet" : row.status === "suspended" ? "has suspended your approval" : "did not approve your registration";
    throw new ForbiddenError(`${row.program.name} ${why}: you cannot file reports there.`);
  }
  const [program] = await toTesterPrograms(executor, [{ program: row.program, settings: row.settings }]);
  return program!;
}

/** "Today" for a tester's own records: the day in the zone of the first program that approved them (else UTC). */
export async function testerToday(actor: Actor): Promise<string> {
  const [row] = await getDb()
    .select({ timezone: programs.timezone })
    .from(testerApprovals)
    .innerJoin(programs, eq(programs.id, testerApprovals.programId))
    .where(and(eq(testerApprovals.testerId, actor.id), eq(testerApprovals.status, "approved")))
    .orderBy(asc(programs.id))
    .limit(1);
  return todayInZone(row?.timezone ?? "UTC");
}
