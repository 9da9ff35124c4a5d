import "server-only";
import { and, desc, eq, lt } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { attachments, importJobs, programs, users } from "@/db/schema";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { AppError, ConflictError, InputError, NotFoundError } from "@/lib/errors";
import { getFileStore } from "@/lib/storage/file-store";
import { saveUpload } from "./attachments";
import { recordAudit } from "./audit";
import { importFields, IMPORT_MAX_BYTES, type ImportFieldKey, type ImportMapping } from "./import-fields";
import { csvLine } from "./import-csv";
import { CHUNK_ROWS, ImportFileError, parseImportFile, readCsvText, validateRows, writeChunk, type RowProblem } from "./import-inventory";
import { getProgramContext } from "./settings";

const fieldKeys = importFields.map((f) => f.key) as [ImportFieldKey, ...ImportFieldKey[]];

export const startImportSchema = z.object({
  fileId: z.coerce.number().int().positive("Upload the file first."),
  mapping: z.partialRecord(z.enum(fieldKeys), z.string().trim().max(200)).refine((m) => Object.values(m).some(Boolean), "Map at least the account number column."),
});

/** A run that has not moved for this long is taken as interrupted (the server restarted). */
const STALE_AFTER_MS = 30 * 60_000;

export interface ImportJobView {
  id: number;
  status: "running" | "finished" | "failed";
  phase: string;
  fileName: string;
  totalRows: number;
  processedRows: number;
  insertedRows: number;
  updatedRows: number;
  unchangedRows: number;
  failedRows: number;
  message: string | null;
  errorFileId: number | null;
  startedAt: string;
  finishedAt: string | null;
  startedBy: string;
}

function viewOf(row: typeof importJobs.$inferSelect & { fileName: string; startedBy: string }): ImportJobView {
  const isStale = row.status === "running" && Date.now() - row.startedAt.getTime() > STALE_AFTER_MS;
  return {
    id: row.id,
    status: isStale ? "failed" : row.status,
    phase: isStale ? "interrupted" : row.status === "running" ? (row.processedRows === 0 ? "checking" : "importing") : row.status,
    fileName: row.fileName,
    totalRows: row.totalRows,
    processedRows: row.processedRows,
    insertedRows: row.insertedRows,
    updatedRows: row.updatedRows,
    unchangedRows: row.unchangedRows,
    failedRows: row.failedRows,
    message: isStale ? "The import was interrupted (the server restarted). The rows before it stopped are in; import the same file again to finish — nothing is duplicated." : row.message,
    errorFileId: row.errorFileId,
    startedAt: row.startedAt.toISOString(),
    finishedAt: row.finishedAt?.toISOString() ?? null,
    startedBy: row.startedBy,
  };
}

export async function getImportJob(actor: Actor, jobId: number): Promise<ImportJobView> {
  assertCan(actor, "inventory.import");
  const programId = staffProgramId(actor);
  const [row] = await getDb()
    .select({ job: importJobs, fileName: attachments.originalName, startedBy: users.name })
    .from(importJobs)
    .innerJoin(attachments, eq(attachments.id, importJobs.fileId))
    .innerJoin(users, eq(users.id, importJobs.createdBy))
    .where(and(eq(importJobs.id, jobId), eq(importJobs.programId, programId)))
    .limit(1);
  if (!row) throw new NotFoundError("No such import in your program.");
  return viewOf({ ...row.job, fileName: row.fileName, startedBy: row.startedBy });
}

export async function listImportJobs(actor: Actor, limit = 10): Promise<ImportJobView[]> {
  assertCan(actor, "inventory.import");
  const programId = staffProgramId(actor);
  const rows = await getDb()
    .select({ job: importJobs, fileName: attachments.originalName, startedBy: users.name })
    .from(importJobs)
    .innerJoin(attachments, eq(attachments.id, importJobs.fileId))
    .innerJoin(users, eq(users.id, importJobs.createdBy))
    .where(eq(importJobs.programId, programId))
    .orderBy(desc(importJobs.startedAt))
    .limit(limit);
  return rows.map((r) => viewOf({ ...r.job, fileName: r.fileName, startedBy: r.startedBy }));
}

export interface StartedImport {
  jobId: number;
  totalRows: number;
  emptyLines: number;
  /** Runs the import to the end; the route hands it to after() so the answer comes at once. */
  run: () => Promise<void>;
}

/**
 * Checks the whole file before anything is written — its size, its encoding, its header against
 * the mapping, every row against zod — then records the job and returns the work to run. A file
 * that fails these checks is refused with its reason and no job; rows that fail go to the error
 * report while the others are imported.
 */
export async function startImport(actor: Actor, input: z.infer<typeof startImportSchema>): Promise<StartedImport> {
  assertCan(actor, "inventory.import");
  const context = await getProgramContext(staffProgramId(actor));
  const db = getDb();
  const [file] = await db.select().from(attachments).where(eq(attachments.id, input.fileId)).limit(1);
  if (!file || file.uploadedBy !== actor.id || file.purpose !== "inventory_import") throw new NotFoundError("No such uploaded file: upload the CSV again.");
  if (file.sizeBytes >= IMPORT_MAX_BYTES) {
    throw new AppError(`The file is ${(file.sizeBytes / 1024 / 1024).toFixed(1)} MB; an import takes files under ${IMPORT_MAX_BYTES / 1024 / 1024} MB. Split it into parts (each with the header row) and import them one after the other.`, 413, "too_large");
  }
  const mapping = input.mapping as ImportMapping;
  let parsed;
  try {
    parsed = parseImportFile(readCsvText(await getFileStore().get(file.storageKey)), mapping);
  } catch (error) {
    if (error instanceof ImportFileError) throw new InputError(error.message, { file: [error.message] });
    throw error;
  }
  const { valid, invalid } = validateRows(parsed, mapping, context.today);

  const jobId = await db.transaction(async (tx) => {
    // One import at a time per program: two runs of one file must not both insert its rows.
    await tx.select({ id: programs.id }).from(programs).where(eq(programs.id, context.id)).for("update");
    const [running] = await tx
      .select({ id: importJobs.id, startedAt: importJobs.startedAt })
      .from(importJobs)
      .where(and(eq(importJobs.programId, context.id), eq(importJobs.status, "running")))
      .orderBy(desc(importJobs.startedAt))
      .limit(1);
    if (running && Date.now() - running.startedAt.getTime() < STALE_AFTER_MS) throw new ConflictError("Another import is running for the program: wait for it to finish, then start this one.", "import_running");
    if (running) await tx.update(importJobs).set({ status: "failed", message: "Interrupted (the server restarted).", finishedAt: new Date() }).where(and(eq(importJobs.programId, context.id), eq(importJobs.status, "running"), lt(importJobs.startedAt, new Date(Date.now() - STALE_AFTER_MS))));
    const [row] = await tx
      .insert(importJobs)
      .values({ programId: context.id, createdBy: actor.id, fileId: file.id, mapping, status: "running", totalRows: parsed.records.length, message: parsed.emptyLines ? `${parsed.emptyLines} empty line${parsed.emptyLines === 1 ? "" : "s"} skipped.` : null, startedAt: new Date() })
      .$returningId();
    await recordAudit(tx, { programId: context.id, actorId: actor.id, action: "inventory.import_started", entityType: "import_job", entityId: row!.id, after: { fileName: file.originalName, rows: parsed.records.length, mapping } });
    return row!.id;
  });

  const cellsByRow = new Map(parsed.records.map((r) => [r.row, r.cells]));
  const run = () => runImport(actor, { jobId, programId: context.id, rules: context.rules, today: context.today, header: parsed.header, fileName: file.originalName, emptyLines: parsed.emptyLines, total: parsed.records.length, valid, invalid, cellsOf: (row) => cellsByRow.get(row) ?? [] });
  return { jobId, totalRows: parsed.records.length, emptyLines: parsed.emptyLines, run };
}

interface RunInput {
  jobId: number;
  programId: number;
  rules: Awaited<ReturnType<typeof getProgramContext>>["rules"];
  today: string;
  header: string[];
  fileName: string;
  emptyLines: number;
  total: number;
  valid: ReturnType<typeof validateRows>["valid"];
  invalid: RowProblem[];
  cellsOf: (row: number) => string[];
}

async function runImport(actor: Actor, input: RunInput): Promise<void> {
  const db = getDb();
  const problems = [...input.invalid];
  const totals = { inserted: 0, updated: 0, unchanged: 0 };
  let databaseFailures = 0;
  // Chunks follow the file's order, so the bar's position is a position in the file.
  const invalidRows = input.invalid.map((p) => p.row).sort((a, b) => a - b);
  let position = input.valid[0]?.row ?? 0;
  try {
    for (let i = 0; i < input.valid.length; i += CHUNK_ROWS) {
      const chunk = input.valid.slice(i, i + CHUNK_ROWS);
      position = chunk[0]!.row;
      const lastRow = chunk.at(-1)!.row;
      const invalidSoFar = countUpTo(invalidRows, lastRow);
      const result = await db.transaction(async (tx) => {
        const written = await writeChunk(tx, chunk, { programId: input.programId, actorId: actor.id, jobId: input.jobId, rules: input.rules, today: input.today, cellsOf: input.cellsOf });
        await tx
          .update(importJobs)
          .set({
            processedRows: Math.min(i + chunk.length + invalidSoFar, input.total),
            insertedRows: totals.inserted + written.inserted,
            updatedRows: totals.updated + written.updated,
            unchangedRows: totals.unchanged + written.unchanged,
            failedRows: invalidSoFar + databaseFailures + written.failed.length,
          })
          .where(eq(importJobs.id, input.jobId));
        return written;
      });
      totals.inserted += result.inserted;
      totals.updated += result.updated;
      totals.unchanged += result.unchanged;
      databaseFailures += result.failed.length;
      problems.push(...result.failed);
    }
    problems.sort((a, b) => a.row - b.row);
    const errorFileId = problems.length ? await saveErrorReport(actor, input, problems) : null;
    const summary = [`${totals.inserted} new, ${totals.updated} updated, ${totals.unchanged} unchanged, ${problems.length} not imported.`, input.emptyLines ? `${input.emptyLines} empty line${input.emptyLines === 1 ? "" : "s"} skipped.` : ""].filter(Boolean).join(" ");
    await db.transaction(async (tx) => {
      await tx
        .update(importJobs)
        .set({ status: "finished", processedRows: input.total, insertedRows: totals.inserted, updatedRows: totals.updated, unchangedRows: totals.unchanged, failedRows: problems.length, errorFileId, message: summary, finishedAt: new Date() })
        .where(eq(importJobs.id, input.jobId));
      await recordAudit(tx, { programId: input.programId, actorId: actor.id, action: "inventory.import_finished", entityType: "import_job", entityId: input.jobId, after: { fileName: input.fileName, ...totals, failed: problems.length } });
    });
  } catch (error) {
    console.error("[import] job", input.jobId, "stopped", error);
    const message = `The import stopped near row ${position} because of a problem on our side. The rows before it are in; import the same file again to finish — nothing is duplicated.`;
    await db
      .update(importJobs)
      .set({ status: "failed", message, insertedRows: totals.inserted, updatedRows: totals.updated, unchangedRows: totals.unchanged, finishedAt: new Date() })
      .where(eq(importJobs.id, input.jobId))
      .catch(() => {});
  }
}

function countUpTo(sorted: number[], row: number): number {
  let low = 0;
  let high = sorted.length;
  while (low < high) {
    const mid = (low + high) >> 1;
    if (sorted[mid]! <= row) low = mid + 1;
    else high = mid;
  }
  return low;
}

/** Control characters (other than tab) would make the report unreadable; they are shown as spaces. */
const cleanCell = (value: string) => value.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g, " ");

/** The rows that were not imported, why, and their original cells: a CSV to fix and import again. */
async function saveErrorReport(actor: Actor, input: RunInput, problems: RowProblem[]): Promise<number> {
  const lines = [csvLine(["Row", "Why it was not imported", ...input.header.map(cleanCell)])];
  for (const p of problems) lines.push(csvLine([p.row, p.problems.join("; "), ...input.header.map((_, i) => cleanCell(p.cells[i] ?? ""))]));
  const text = `\uFEFF${lines.join("\r\n")}\r\n`;
  const baseName = input.fileName.replace(/\.[^.]*$/, "");
  const saved = await saveUpload(actor, { purpose: "import_errors", fileName: `${baseName}-not-imported.csv`, bytes: new TextEncoder().encode(text), maxBytes: 200 * 1024 * 1024 });
  return saved.id;
}
