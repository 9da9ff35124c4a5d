import "server-only";
import { and, asc, eq, gt, inArray, lte, sql } from "drizzle-orm";
import { getDb, type Executor } from "@/db/client";
import { assemblies, programSettings, testReports } from "@/db/schema";
import { programRulesFromSettings } from "@/lib/programs/settings";
import { deriveAssemblyFacts, type AssemblyFacts, type ProgramRules } from "@/lib/rules";

/**
 * The bulk twin of recomputeAssemblyFacts (lib/data/assembly-facts.ts), for the two jobs that
 * touch thousands of assemblies at once: a settings change that moves due dates, and an
 * inventory import. It applies the same rules the same way — every report of the assembly in
 * test-date then filing order, returned and superseded ones not counted, lib/rules'
 * deriveAssemblyFacts, and a new due cycle clearing the notice stage — but reads the histories
 * of a whole chunk with one query and writes only the rows whose facts changed, with one
 * statement. Single-assembly changes keep using recomputeAssemblyFacts.
 */

/** Report statuses whose test does not count (the same set as recomputeAssemblyFacts). */
const notCounted = new Set(["returned", "superseded"]);

export const FACTS_CHUNK_SIZE = 1000;

interface FactsRow {
  id: number;
  status: "active" | "awaiting_confirmation" | "removed" | "replaced";
  installedOn: string | null;
  hazard: "severe" | "high" | "low";
  baseState: "active" | "failed" | "inactive";
  lastTestedOn: string | null;
  lastOutcome: "pass" | "fail" | null;
  lastPassedOn: string | null;
  nextDueOn: string | null;
  repairDueOn: string | null;
  noticeCycle: string | null;
}

const factsColumns = {
  id: assemblies.id,
  status: assemblies.status,
  installedOn: assemblies.installedOn,
  hazard: assemblies.hazard,
  baseState: assemblies.baseState,
  lastTestedOn: assemblies.lastTestedOn,
  lastOutcome: assemblies.lastOutcome,
  lastPassedOn: assemblies.lastPassedOn,
  nextDueOn: assemblies.nextDueOn,
  repairDueOn: assemblies.repairDueOn,
  noticeCycle: assemblies.noticeCycle,
};

function isSameFacts(row: FactsRow, facts: AssemblyFacts): boolean {
  return (
    row.baseState === facts.baseState &&
    row.lastTestedOn === facts.lastTestedOn &&
    row.lastOutcome === facts.lastOutcome &&
    row.lastPassedOn === facts.lastPassedOn &&
    row.nextDueOn === facts.nextDueOn &&
    row.repairDueOn === facts.repairDueOn
  );
}

/** The facts of a chunk of locked rows from their histories; writes the changed ones. Returns how many changed. */
async function recomputeLockedRows(tx: Executor, rows: FactsRow[], rules: ProgramRules): Promise<number> {
  if (rows.length === 0) return 0;
  const ids = rows.map((r) => r.id);
  const reports = await tx
    .select({ assemblyId: testReports.assemblyId, testedOn: testReports.testedOn, outcome: testReports.finalOutcome, status: testReports.status })
    .from(testReports)
    .where(inArray(testReports.assemblyId, ids))
    .orderBy(asc(testReports.assemblyId), asc(testReports.testedOn), asc(testReports.submittedAt));
  const historyOf = new Map<number, { testedOn: string; outcome: "pass" | "fail"; accepted: boolean }[]>();
  for (const r of reports) {
    const list = historyOf.get(r.assemblyId) ?? [];
    list.push({ testedOn: r.testedOn, outcome: r.outcome, accepted: !notCounted.has(r.status) });
    historyOf.set(r.assemblyId, list);
  }
  const changes: Record<string, unknown>[] = [];
  for (const row of rows) {
    const facts = deriveAssemblyFacts({ status: row.status, installedOn: row.installedOn, hazard: row.hazard, tests: historyOf.get(row.id) ?? [] }, rules);
    const cycle = facts.repairDueOn ?? facts.nextDueOn;
    const clearsNotice = cycle !== row.noticeCycle;
    if (isSameFacts(row, facts) && (!clearsNotice || row.noticeCycle === null)) continue;
    changes.push({ id: row.id, ...facts, clearNotice: clearsNotice ? 1 : 0 });
  }
  await writeFacts(tx, changes);
  return changes.length;
}

/**
 * One UPDATE for many rows: the new facts travel as one JSON parameter, unpacked by
 * JSON_TABLE and joined on the primary key.
 */
async function writeFacts(tx: Executor, changes: Record<string, unknown>[]): Promise<void> {
  if (changes.length === 0) return;
  const json = JSON.stringify(changes);
  await tx.execute(sql`
    UPDATE assemblies a
    JOIN JSON_TABLE(${json}, '$[*]' COLUMNS (
      id INT UNSIGNED PATH '$.id',
      base_state VARCHAR(10) PATH '$.baseState',
      last_tested_on DATE PATH '$.lastTestedOn',
      last_outcome VARCHAR(4) PATH '$.lastOutcome',
      last_passed_on DATE PATH '$.lastPassedOn',
      next_due_on DATE PATH '$.nextDueOn',
      repair_due_on DATE PATH '$.repairDueOn',
      clear_notice TINYINT PATH '$.clearNotice'
    )) f ON f.id = a.id
    SET a.base_state = f.base_state,
        a.last_tested_on = f.last_tested_on,
        a.last_outcome = f.last_outcome,
        a.last_passed_on = f.last_passed_on,
        a.next_due_on = f.next_due_on,
        a.repair_due_on = f.repair_due_on,
        a.notice_stage = IF(f.clear_notice = 1, NULL, a.notice_stage),
        a.notice_cycle = IF(f.clear_notice = 1, NULL, a.notice_cycle),
        a.updated_at = ${new Date()}`);
}

async function rulesOfProgram(executor: Executor, programId: number): Promise<ProgramRules> {
  const [settings] = await executor.select().from(programSettings).where(eq(programSettings.programId, programId));
  if (!settings) throw new Error(`Program ${programId} has no settings`);
  return programRulesFromSettings(settings);
}

/** Recomputes the given assemblies of one program inside the caller's transaction (rows locked). */
export async function recomputeFactsForAssemblies(tx: Executor, programId: number, assemblyIds: readonly number[], rules?: ProgramRules): Promise<number> {
  if (assemblyIds.length === 0) return 0;
  const programRules = rules ?? (await rulesOfProgram(tx, programId));
  let changed = 0;
  for (let i = 0; i < assemblyIds.length; i += FACTS_CHUNK_SIZE) {
    const ids = assemblyIds.slice(i, i + FACTS_CHUNK_SIZE);
    const rows = (await tx
      .select(factsColumns)
      .from(assemblies)
      .where(and(eq(assemblies.programId, programId), inArray(assemblies.id, ids)))
      .orderBy(asc(assemblies.id))
      .for("update")) as FactsRow[];
    changed += await recomputeLockedRows(tx, rows, programRules);
  }
  return changed;
}

export interface ProgramRecomputeResult {
  assemblies: number;
  changed: number;
  milliseconds: number;
}

/**
 * Every assembly of a program, a chunk per transaction (locks are held for one chunk only, so
 * reviews and submissions carry on meanwhile). Used after a settings change that moves due
 * dates or repair deadlines. The settings are read again with every chunk, inside its
 * transaction: a change saved while a recompute runs applies to every chunk after it, and the
 * recompute that change asks for redoes the ones before.
 */
export async function recomputeProgramFacts(programId: number, options: { chunkSize?: number; onProgress?: (done: number) => Promise<void> | void } = {}): Promise<ProgramRecomputeResult> {
  const started = Date.now();
  const db = getDb();
  const chunkSize = options.chunkSize ?? FACTS_CHUNK_SIZE;
  let afterId = 0;
  let total = 0;
  let changed = 0;
  for (;;) {
    const result = await db.transaction(async (tx) => {
      const rules = await rulesOfProgram(tx, programId);
      const rows = (await tx
        .select(factsColumns)
        .from(assemblies)
        .where(and(eq(assemblies.programId, programId), gt(assemblies.id, afterId)))
        .orderBy(asc(assemblies.id))
        .limit(chunkSize)
        .for("update")) as FactsRow[];
      return { rows: rows.length, lastId: rows.at(-1)?.id ?? afterId, changed: await recomputeLockedRows(tx, rows, rules) };
    });
    total += result.rows;
    changed += result.changed;
    afterId = result.lastId;
    await options.onProgress?.(total);
    if (result.rows < chunkSize) break;
  }
  return { assemblies: total, changed, milliseconds: Date.now() - started };
}

/**
 * Finishes a recompute that a settings change asked for (program_settings.facts_pending_since),
 * if one is still owed: after the settings save that started it, or after one cut short. Its
 * progress is kept on the settings row (done of total, and when it last moved on) for the
 * settings page. The mark is cleared only up to the change it was read for, so a newer change
 * still counts.
 */
export async function finishPendingFactsRecompute(programId: number): Promise<ProgramRecomputeResult | null> {
  const db = getDb();
  const [row] = await db.select({ since: programSettings.factsPendingSince }).from(programSettings).where(eq(programSettings.programId, programId)).limit(1);
  if (!row?.since) return null;
  const [counted] = await db.select({ n: sql<number>`COUNT(*)` }).from(assemblies).where(eq(assemblies.programId, programId));
  const progress = (done: number) => db.update(programSettings).set({ factsRecomputeDone: done, factsRecomputeTotal: Number(counted?.n ?? 0), factsRecomputeAt: new Date() }).where(eq(programSettings.programId, programId));
  await progress(0);
  const result = await recomputeProgramFacts(programId, { onProgress: async (done) => void (await progress(done)) });
  await db
    .update(programSettings)
    .set({ factsPendingSince: null, factsRecomputeDone: null, factsRecomputeTotal: null, factsRecomputeAt: null })
    .where(and(eq(programSettings.programId, programId), lte(programSettings.factsPendingSince, row.since)));
  return result;
}

// One recompute at a time per program in this process; a request for one while it runs makes
// it go round once more, so a change saved meanwhile is never left owed.
const inFlight = new Map<number, { again: boolean; done: Promise<void> }>();

/**
 * Runs the owed recompute of a program to the end (again while changes keep arriving), calling
 * onFinished with each pass's figures. Settings saves hand it to after(), so the save answers
 * at once; the notice run awaits it before planning.
 */
export function runPendingFactsRecompute(programId: number, onFinished: (result: ProgramRecomputeResult) => Promise<void>): Promise<void> {
  const running = inFlight.get(programId);
  if (running) {
    running.again = true;
    return running.done;
  }
  const entry = { again: false, done: Promise.resolve() };
  inFlight.set(programId, entry);
  entry.done = (async () => {
    try {
      do {
        entry.again = false;
        const result = await finishPendingFactsRecompute(programId);
        if (result) await onFinished(result);
      } while (entry.again);
    } finally {
      inFlight.delete(programId);
    }
  })();
  return entry.done;
}
