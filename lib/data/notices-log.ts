import "server-only";
import { and, count, desc, eq, inArray, isNotNull, like, or, sql, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { assemblies, noticeRuns, notices, owners, sites, users } from "@/db/schema";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { ConflictError, InputError, NotFoundError } from "@/lib/errors";
import { previewNoticePlan, startNoticeRun, type NoticePlanPreview, type StartedRun } from "./notices-run";
import { getFileStore } from "@/lib/storage/file-store";
import { recordAudit } from "./audit";
import { formatLongDate } from "./notices-format";

/** The program's notice log for inspectors and admins: runs, every notice, the day's letters. */

export interface NoticeRunView {
  id: number;
  runOn: string;
  trigger: "schedule" | "button";
  startedByName: string | null;
  status: "running" | "finished" | "failed" | "skipped";
  planned: number;
  sent: number;
  failed: number;
  letters: number;
  total: number;
  /** 0–100, for the progress bar. */
  percent: number;
  hasLetters: boolean;
  lettersPrinted: boolean;
  log: string[];
  startedAt: string;
  finishedAt: string | null;
}

function toRunView(r: typeof noticeRuns.$inferSelect & { startedByName: string | null }, lettersPrinted = false): NoticeRunView {
  const done = r.sent + r.failed + (r.lettersStorageKey ? r.letters : 0);
  const percent = r.status === "running" ? (r.total > 0 ? Math.min(99, Math.round((done / r.total) * 100)) : 0) : 100;
  return {
    id: r.id,
    runOn: r.runOn,
    trigger: r.trigger,
    startedByName: r.startedByName,
    status: r.status,
    planned: r.planned,
    sent: r.sent,
    failed: r.failed,
    letters: r.letters,
    total: r.total,
    percent,
    hasLetters: Boolean(r.lettersStorageKey),
    lettersPrinted,
    log: (r.log ?? "").split("\n").filter(Boolean),
    startedAt: r.startedAt.toISOString(),
    finishedAt: r.finishedAt?.toISOString() ?? null,
  };
}

const runColumns = {
  id: noticeRuns.id,
  programId: noticeRuns.programId,
  runOn: noticeRuns.runOn,
  startedBy: noticeRuns.startedBy,
  trigger: noticeRuns.trigger,
  status: noticeRuns.status,
  planned: noticeRuns.planned,
  sent: noticeRuns.sent,
  failed: noticeRuns.failed,
  letters: noticeRuns.letters,
  total: noticeRuns.total,
  log: noticeRuns.log,
  lettersStorageKey: noticeRuns.lettersStorageKey,
  startedAt: noticeRuns.startedAt,
  finishedAt: noticeRuns.finishedAt,
  startedByName: users.name,
};

export async function listNoticeRuns(actor: Actor, limit = 15): Promise<NoticeRunView[]> {
  assertCan(actor, "notices.view");
  const programId = staffProgramId(actor);
  const rows = await getDb().select(runColumns).from(noticeRuns).leftJoin(users, eq(users.id, noticeRuns.startedBy)).where(eq(noticeRuns.programId, programId)).orderBy(desc(noticeRuns.id)).limit(limit);
  const withLetters = rows.filter((r) => r.lettersStorageKey).map((r) => r.id);
  const unprinted = withLetters.length
    ? await getDb()
        .selectDistinct({ runId: notices.runId })
        .from(notices)
        .where(and(inArray(notices.runId, withLetters), eq(notices.status, "letter_ready")))
    : [];
  const waiting = new Set(unprinted.map((u) => u.runId));
  return rows.map((r) => toRunView(r, Boolean(r.lettersStorageKey) && !waiting.has(r.id)));
}

export async function getNoticeRun(actor: Actor, runId: number): Promise<NoticeRunView> {
  assertCan(actor, "notices.view");
  const programId = staffProgramId(actor);
  const [row] = await getDb()
    .select(runColumns)
    .from(noticeRuns)
    .leftJoin(users, eq(users.id, noticeRuns.startedBy))
    .where(and(eq(noticeRuns.id, runId), eq(noticeRuns.programId, programId)))
    .limit(1);
  if (!row) throw new NotFoundError("No such notice run.");
  const [unprinted] = row.lettersStorageKey ? await getDb().select({ n: count() }).from(notices).where(and(eq(notices.runId, runId), eq(notices.status, "letter_ready"))) : [{ n: 0 }];
  return toRunView(row, Boolean(row.lettersStorageKey) && Number(unprinted?.n ?? 0) === 0);
}

export const noticeLogFilterSchema = z.object({
  status: z.enum(["all", "sent", "waiting", "failed", "letters", "withdrawn"]).catch("all"),
  kind: z.enum(["all", "reminder", "overdue", "final", "repair_reminder"]).catch("all"),
  q: z.string().trim().max(100).catch(""),
  page: z.coerce.number().int().min(1).max(10_000).catch(1),
});
export type NoticeLogFilter = z.infer<typeof noticeLogFilterSchema>;

export interface NoticeLogRow {
  id: number;
  kind: string;
  dueCycleWords: string;
  plannedOnWords: string;
  recipient: string;
  channel: "email" | "letter";
  status: string;
  attempts: number;
  nextAttemptAt: string | null;
  lastError: string | null;
  messageId: string | null;
  sentAt: string | null;
  siteLine: string;
  location: string;
  assemblyId: number;
  runId: number | null;
}

const PAGE_SIZE = 50;

/** Who was sent what, when, and the message id; filterable, newest first. */
export async function listNotices(actor: Actor, filter: NoticeLogFilter): Promise<{ rows: NoticeLogRow[]; total: number; page: number; pages: number }> {
  assertCan(actor, "notices.view");
  const programId = staffProgramId(actor);
  const conditions: SQL[] = [eq(notices.programId, programId)];
  if (filter.status === "sent") conditions.push(eq(notices.status, "sent"));
  if (filter.status === "waiting") conditions.push(or(eq(notices.status, "pending"), and(eq(notices.status, "failed"), isNotNull(notices.nextAttemptAt)))!);
  if (filter.status === "failed") conditions.push(eq(notices.status, "failed"));
  if (filter.status === "letters") conditions.push(eq(notices.channel, "letter"));
  if (filter.status === "withdrawn") conditions.push(eq(notices.status, "withdrawn"));
  if (filter.kind !== "all") conditions.push(eq(notices.kind, filter.kind));
  if (filter.q) {
    const pattern = `%${filter.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    conditions.push(or(like(notices.recipientEmail, pattern), like(owners.name, pattern), like(sites.addressLine1, pattern), like(sites.accountNumber, pattern))!);
  }
  const where = and(...conditions);
  const db = getDb();
  const base = db
    .select({
      id: notices.id,
      kind: notices.kind,
      dueCycle: notices.dueCycle,
      plannedOn: notices.plannedOn,
      recipientEmail: notices.recipientEmail,
      ownerName: owners.name,
      channel: notices.channel,
      status: notices.status,
      attempts: notices.attempts,
      nextAttemptAt: notices.nextAttemptAt,
      lastError: notices.lastError,
      messageId: notices.messageId,
      sentAt: notices.sentAt,
      siteName: sites.name,
      address: sites.addressLine1,
      accountNumber: sites.accountNumber,
      location: assemblies.location,
      assemblyId: notices.assemblyId,
      runId: notices.runId,
    })
    .from(notices)
    .innerJoin(assemblies, eq(assemblies.id, notices.assemblyId))
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .leftJoin(owners, eq(owners.id, notices.ownerId));
  const [[totalRow], rows] = await Promise.all([
    db.select({ n: count() }).from(notices).innerJoin(assemblies, eq(assemblies.id, notices.assemblyId)).innerJoin(sites, eq(sites.id, assemblies.siteId)).leftJoin(owners, eq(owners.id, notices.ownerId)).where(where),
    base
      .where(where)
      .orderBy(desc(notices.id))
      .limit(PAGE_SIZE)
      .offset((filter.page - 1) * PAGE_SIZE),
  ]);
  const total = Number(totalRow?.n ?? 0);
  return {
    total,
    page: filter.page,
    pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
    rows: rows.map((r) => ({
      id: r.id,
      kind: r.kind,
      dueCycleWords: formatLongDate(r.dueCycle),
      plannedOnWords: formatLongDate(r.plannedOn),
      recipient: r.channel === "email" ? `${r.ownerName ?? "Owner"} <${r.recipientEmail ?? ""}>` : `${r.ownerName ?? "The owner or occupant"} (letter)`,
      channel: r.channel,
      status: r.status,
      attempts: r.attempts,
      nextAttemptAt: r.nextAttemptAt?.toISOString() ?? null,
      lastError: r.lastError,
      messageId: r.messageId,
      sentAt: r.sentAt?.toISOString() ?? null,
      siteLine: `${r.siteName}, ${r.address} (${r.accountNumber})`,
      location: r.location,
      assemblyId: r.assemblyId,
      runId: r.runId,
    })),
  };
}

/** Counts for the page header: what waits for a retry, what needs a person. */
export async function noticeAttention(actor: Actor): Promise<{ waitingRetry: number; gaveUp: number; lettersToPrint: number; inFlight: number }> {
  assertCan(actor, "notices.view");
  const programId = staffProgramId(actor);
  const [row] = await getDb()
    .select({
      waitingRetry: sql<number>`SUM(${notices.status} = 'failed' AND ${notices.nextAttemptAt} IS NOT NULL)`,
      gaveUp: sql<number>`SUM(${notices.status} = 'failed' AND ${notices.nextAttemptAt} IS NULL)`,
      lettersToPrint: sql<number>`SUM(${notices.status} = 'letter_ready')`,
      inFlight: sql<number>`SUM(${notices.status} = 'pending')`,
    })
    .from(notices)
    .where(and(eq(notices.programId, programId), inArray(notices.status, ["failed", "letter_ready", "pending"])));
  return { waitingRetry: Number(row?.waitingRetry ?? 0), gaveUp: Number(row?.gaveUp ?? 0), lettersToPrint: Number(row?.lettersToPrint ?? 0), inFlight: Number(row?.inFlight ?? 0) };
}

/** A run's letters PDF, for the program's staff. */
export async function readRunLetters(actor: Actor, runId: number): Promise<{ bytes: Buffer; fileName: string }> {
  assertCan(actor, "notices.view");
  const programId = staffProgramId(actor);
  const [row] = await getDb()
    .select({ key: noticeRuns.lettersStorageKey, runOn: noticeRuns.runOn })
    .from(noticeRuns)
    .where(and(eq(noticeRuns.id, runId), eq(noticeRuns.programId, programId)))
    .limit(1);
  if (!row?.key) throw new NotFoundError("This run made no letters.");
  return { bytes: await getFileStore().get(row.key), fileName: `notice-letters-${row.runOn}-run-${runId}.pdf` };
}

/** After printing: the run's letters count as posted. */
export async function markRunLettersPrinted(actor: Actor, runId: number): Promise<{ marked: number }> {
  assertCan(actor, "notices.view");
  const programId = staffProgramId(actor);
  return getDb().transaction(async (tx) => {
    const [run] = await tx
      .select({ key: noticeRuns.lettersStorageKey })
      .from(noticeRuns)
      .where(and(eq(noticeRuns.id, runId), eq(noticeRuns.programId, programId)))
      .for("update");
    if (!run?.key) throw new NotFoundError("This run made no letters.");
    const [result] = await tx
      .update(notices)
      .set({ status: "letter_printed" })
      .where(and(eq(notices.runId, runId), eq(notices.programId, programId), eq(notices.status, "letter_ready")));
    if (result.affectedRows === 0) throw new ConflictError("These letters are already marked as printed.", "already_printed");
    await recordAudit(tx, { programId, actorId: actor.id, action: "notices.letters_printed", entityType: "notice_run", entityId: runId, after: { letters: result.affectedRows } });
    return { marked: result.affectedRows };
  });
}



/** Today's plan for the actor's program, as the notices page shows it before a run. */
export async function previewTodaysNotices(actor: Actor): Promise<NoticePlanPreview> {
  assertCan(actor, "notices.view");
  return previewNoticePlan(staffProgramId(actor));
}

/**
 * The admin's button: takes the program's lease and opens the run at once (so the page can
 * follow it), then returns the work to do in the background. Another run in progress is a
 * 409; settings that cannot produce a correct notice are refused with every reason.
 */
export async function startNoticeRunFromButton(actor: Actor): Promise<StartedRun> {
  assertCan(actor, "notices.run");
  const started = await startNoticeRun(staffProgramId(actor), { trigger: "button", startedBy: actor.id });
  if ("execute" in started) return started;
  if (started.status === "skipped") throw new ConflictError("A notice run is already in progress for this program. Follow it below; nothing will be sent twice.", "run_in_progress");
  throw new InputError(`The notices cannot run: ${started.message} Nothing was recorded or sent.`);
}
