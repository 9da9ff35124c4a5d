import "server-only";
import { randomBytes, randomUUID } from "node:crypto";
import { and, asc, eq, inArray, isNotNull, lt, ne, sql, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb, type Executor } from "@/db/client";
import { assemblies, authTokens, jobLeases, noticeRuns, notices, owners, programs, programSettings, siteOwners, sites } from "@/db/schema";
import type { NoticeEmailProps, NoticeItem, NoticeTemplateKind } from "@/emails/notice-shared";
import { NoticeTemplateError } from "@/emails/notice-shared";
import { getEnv } from "@/lib/env";
import { isDuplicateKey } from "@/lib/errors";
import { getMailClient } from "@/lib/mail/client";
import { fromAddress, MAIL_BATCH_SIZE, type RenderedEmail } from "@/lib/mail/send";
import { noticeScheduleFromSettings, programRulesFromSettings, todayInZone } from "@/lib/programs/settings";
import { addDays, noticeKey, noticeThresholds, planNotices, validateNoticeSchedule, validateProgramRules, type NoticeCandidate, type NoticeKind, type PlannedNotice } from "@/lib/rules";
import { renderLettersPdf, type LetterPage } from "@/lib/pdf/letters-document";
import { getFileStore } from "@/lib/storage/file-store";
import { generateReadableCode, hashToken } from "@/lib/auth/tokens";
import { checkWordFor, describeAssembly, formatLongDate, formatOwnerCode, OWNER_CODE_LENGTH } from "./notices-format";
import { createNoticeRenderer, noticeWordings, prepareNoticeProps, type NoticeRenderer } from "./notices-render";
import { finishPendingFactsRecompute } from "./inventory-facts";
import { createOwnerTokens, expiryOf, expiryWords, ownerLinkUrl, resolveOwnerUsersForEmails, resolveOwnerUsersForLetters } from "./owner-access";

/**
 * The notice batch: today's plan from lib/rules, each notice recorded under its unique key
 * BEFORE anything is sent, then sent in batches through the mail service, exactly once.
 *
 * - Recorded first: a run that stops anywhere loses nothing (the rows are there) and a re-run
 *   plans nothing twice (the plan skips recorded keys, the unique index refuses doubles).
 * - One run per program at a time: a lease in job_leases, taken and renewed with atomic
 *   conditional writes. A second run finds it held and sends nothing.
 * - A batch, once handed to the service, keeps its idempotency key (notices.batch_key) until
 *   it is known to be delivered: a run that dies, or an answer that is lost or unclear, means
 *   the same batch goes again under the same key, and the service delivers it once.
 * - A refused batch is retried by a later run with growing back-off (attempts,
 *   next_attempt_at), up to MAX_NOTICE_ATTEMPTS, and every failure is kept in the log.
 * - Owners without an e-mail address get a printed letter: the run makes one PDF of the day's
 *   letters, one per page, each with the account number and a one-time sign-in code.
 */

export const NOTICE_LEASE_SECONDS = 120;
export const MAX_NOTICE_ATTEMPTS = 8;
/** A property manager gets one message per stage listing their assemblies, not one message each. */
const MAX_ASSEMBLIES_PER_MESSAGE = 50;
/** The service refusing this many batches in a row ends the sending part of a run: the rest waits for the next run. */
const FAILED_BATCHES_BEFORE_PAUSE = 3;
const RECORD_CHUNK = 1000;
const LOG_LINES_KEPT = 300;

// Common practice for retrying a mail service [M]: 15 min, 1 h, 4 h, 12 h, then daily.
const retryMinutes = [15, 60, 240, 720, 1440];
export function retryDelayMinutes(attempts: number): number {
  return retryMinutes[Math.min(Math.max(attempts, 1), retryMinutes.length) - 1]!;
}

export type NoticeRunStatus = "finished" | "failed" | "skipped";

export interface NoticeRunSummary {
  programId: number;
  programName: string;
  runId: number | null;
  status: NoticeRunStatus;
  today: string | null;
  /** Notices lib/rules planned today (one per assembly and stage). */
  planned: number;
  /** Rows written (one per recipient); 0 on a re-run the same day. */
  recorded: number;
  messages: number;
  sent: number;
  failed: number;
  withdrawn: number;
  letters: number;
  message: string;
  log: string[];
}

export interface NoticeRunOptions {
  trigger: "schedule" | "button";
  startedBy?: number | null;
  /** The clock (tests move it forward to pass a back-off or an expired lease). */
  now?: () => Date;
  leaseSeconds?: number;
  /** Who holds the lease; unique per run. */
  holder?: string;
  onLog?: (line: string) => void;
}

// ---------------------------------------------------------------- the lease

function leaseNameFor(programId: number): string {
  return `notices:program:${programId}`;
}

/** Takes the lease if nobody holds it or the holder's time ran out: one insert or one conditional update, both atomic. */
export async function acquireLease(name: string, holder: string, now: Date, seconds: number): Promise<boolean> {
  const db = getDb();
  const expiresAt = new Date(now.getTime() + seconds * 1000);
  try {
    await db.insert(jobLeases).values({ name, holder, expiresAt });
    return true;
  } catch (error) {
    if (!isDuplicateKey(error)) throw error;
  }
  const [taken] = await db
    .update(jobLeases)
    .set({ holder, expiresAt })
    .where(and(eq(jobLeases.name, name), lt(jobLeases.expiresAt, now)));
  return taken.affectedRows === 1;
}

/** Extends the lease; false when it is no longer ours (then the run must stop sending at once). */
export async function renewLease(name: string, holder: string, now: Date, seconds: number): Promise<boolean> {
  const [renewed] = await getDb()
    .update(jobLeases)
    .set({ expiresAt: new Date(now.getTime() + seconds * 1000) })
    .where(and(eq(jobLeases.name, name), eq(jobLeases.holder, holder)));
  // mysql2 asks for found rows: a matched row counts even when its value did not change.
  return renewed.affectedRows === 1;
}

export async function releaseLease(name: string, holder: string): Promise<void> {
  await getDb()
    .delete(jobLeases)
    .where(and(eq(jobLeases.name, name), eq(jobLeases.holder, holder)));
}

// ---------------------------------------------------------------- program and plan

interface ProgramContext {
  id: number;
  slug: string;
  name: string;
  timezone: string;
  replyTo: string;
  phone: string;
  mailingAddress: string;
  schedule: ReturnType<typeof noticeScheduleFromSettings>;
  discontinueDaysAfterFinal: number;
}

/** Loads the program and refuses, with every reason, settings a notice cannot be written from. */
async function loadProgram(programId: number): Promise<{ program: ProgramContext | null; name: string; problems: string[] }> {
  const [row] = await getDb().select({ program: programs, settings: programSettings }).from(programs).leftJoin(programSettings, eq(programSettings.programId, programs.id)).where(eq(programs.id, programId)).limit(1);
  if (!row) return { program: null, name: `program ${programId}`, problems: [`There is no program ${programId}.`] };
  const { program, settings } = row;
  if (!settings) return { program: null, name: program.name, problems: ["The program has no settings row."] };
  const schedule = noticeScheduleFromSettings(settings);
  const problems = [
    ...validateNoticeSchedule(schedule).map((p) => `Notice schedule: ${p.message}`),
    ...validateProgramRules(programRulesFromSettings(settings)).map((p) => `Program rules: ${p.message}`),
  ];
  if (!program.name.trim()) problems.push("The program's name is missing.");
  if (!z.email().safeParse(program.replyToEmail).success) problems.push("The program's reply-to address is missing or invalid.");
  if (!program.phone.trim()) problems.push("The program's phone number is missing: every notice tells the owner whom to call.");
  if (!program.mailingAddress.trim()) problems.push("The program's mailing address is missing: the notices' legal footer names it.");
  if (!Number.isInteger(settings.discontinueDaysAfterFinal) || settings.discontinueDaysAfterFinal < 0) problems.push("The days between the final notice and a possible discontinuation of service must be a whole number, 0 or more.");
  try {
    todayInZone(program.timezone);
  } catch {
    problems.push(`The program's time zone ${JSON.stringify(program.timezone)} is unknown.`);
  }
  return {
    program: { id: program.id, slug: program.slug, name: program.name, timezone: program.timezone, replyTo: program.replyToEmail, phone: program.phone, mailingAddress: program.mailingAddress, schedule, discontinueDaysAfterFinal: settings.discontinueDaysAfterFinal },
    name: program.name,
    problems,
  };
}

interface PlannedRecipientRow {
  programId: number;
  assemblyId: number;
  kind: NoticeKind;
  dueCycle: string;
  noticeKey: string;
  ownerId: number | null;
  channel: "email" | "letter";
  recipientEmail: string | null;
}

const isDeliverableAddress = (email: string) => z.email().safeParse(email).success;

/** The candidates of today's plan, selected with the same comparisons lib/rules uses (indexed ranges). */
function candidateFilter(programId: number, bounds: ReturnType<typeof noticeThresholds>): SQL {
  return sql`${assemblies.programId} = ${programId} AND ${assemblies.status} = 'active' AND (
    (${assemblies.baseState} = 'active' AND ${assemblies.nextDueOn} IS NOT NULL AND ${assemblies.nextDueOn} <= ${bounds.reminderIfDueOnOrBefore})
    OR (${assemblies.baseState} = 'failed' AND ${assemblies.repairDueOn} >= ${bounds.today} AND ${assemblies.repairDueOn} <= ${bounds.repairReminderIfDueOnOrBefore}))`;
}

export interface TodaysPlan {
  today: string;
  candidates: number;
  planned: PlannedNotice[];
  rows: PlannedRecipientRow[];
}

/** What lib/rules plans for today, given every notice already recorded, with one row per recipient. */
export async function planTodaysNotices(program: Pick<ProgramContext, "id" | "timezone" | "schedule">, now: Date): Promise<TodaysPlan> {
  const db = getDb();
  const today = todayInZone(program.timezone, now);
  const bounds = noticeThresholds(today, program.schedule);
  const filter = candidateFilter(program.id, bounds);
  const candidateRows = await db.select({ id: assemblies.id, baseState: assemblies.baseState, nextDueOn: assemblies.nextDueOn, repairDueOn: assemblies.repairDueOn }).from(assemblies).where(filter).orderBy(asc(assemblies.id));
  const recorded = await db
    .select({ assemblyId: notices.assemblyId, kind: notices.kind, dueCycle: notices.dueCycle })
    .from(notices)
    .innerJoin(assemblies, and(eq(assemblies.id, notices.assemblyId), sql`${notices.dueCycle} IN (${assemblies.nextDueOn}, ${assemblies.repairDueOn})`))
    .where(filter);
  const alreadySent = new Set(recorded.map((r) => noticeKey(r.assemblyId, r.kind, r.dueCycle)));
  const candidates: NoticeCandidate[] = candidateRows.map((a) => ({ id: a.id, baseState: a.baseState, nextDueOn: a.nextDueOn, repairDueOn: a.repairDueOn }));
  const planned = planNotices({ today, schedule: program.schedule, assemblies: candidates, alreadySent });

  // Recipients: every contact of the site who receives notices; by e-mail when an address is on
  // file, else by letter. A site with no such contact still gets a letter, to "the owner or
  // occupant" at the service address: an assembly never slides because a contact is missing.
  const rows: PlannedRecipientRow[] = [];
  for (let i = 0; i < planned.length; i += 2000) {
    const chunk = planned.slice(i, i + 2000);
    const contacts = await db
      .select({ assemblyId: assemblies.id, ownerId: owners.id, email: owners.email })
      .from(assemblies)
      .innerJoin(siteOwners, and(eq(siteOwners.siteId, assemblies.siteId), eq(siteOwners.receivesNotices, true)))
      .innerJoin(owners, eq(owners.id, siteOwners.ownerId))
      .where(inArray(assemblies.id, chunk.map((p) => Number(p.assemblyId))))
      .orderBy(asc(owners.id));
    const byAssembly = new Map<number, typeof contacts>();
    for (const c of contacts) byAssembly.set(c.assemblyId, [...(byAssembly.get(c.assemblyId) ?? []), c]);
    for (const notice of chunk) {
      const assemblyId = Number(notice.assemblyId);
      const seen = new Set<string>();
      const list = byAssembly.get(assemblyId) ?? [];
      for (const contact of list) {
        const email = contact.email?.trim().toLowerCase() || null;
        // Two contacts with one address get one notice.
        const dedupe = email ?? `owner:${contact.ownerId}`;
        if (seen.has(dedupe)) continue;
        seen.add(dedupe);
        rows.push({ programId: program.id, assemblyId, kind: notice.kind, dueCycle: notice.dueCycle, noticeKey: `${notice.key}:o${contact.ownerId}`, ownerId: contact.ownerId, channel: email ? "email" : "letter", recipientEmail: email });
      }
      if (list.length === 0) rows.push({ programId: program.id, assemblyId, kind: notice.kind, dueCycle: notice.dueCycle, noticeKey: `${notice.key}:site`, ownerId: null, channel: "letter", recipientEmail: null });
    }
  }
  return { today, candidates: candidates.length, planned, rows };
}

/** Writes the plan's rows (a duplicate key is skipped, never an error) and moves the assemblies' notice stage, in one transaction per chunk. */
async function recordPlan(plan: TodaysPlan, runId: number, now: Date): Promise<number> {
  let recorded = 0;
  for (let i = 0; i < plan.rows.length; i += RECORD_CHUNK) {
    const chunk = plan.rows.slice(i, i + RECORD_CHUNK);
    await getDb().transaction(async (tx) => {
      // The plan already skips recorded keys; these are only rows a crash left between the
      // plan and here. A plain insert after that: a duplicate is then a bug and fails loudly.
      const existing = new Set((await tx.select({ key: notices.noticeKey }).from(notices).where(inArray(notices.noticeKey, chunk.map((r) => r.noticeKey)))).map((r) => r.key));
      const fresh = chunk.filter((r) => !existing.has(r.noticeKey));
      if (fresh.length === 0) return;
      await tx.insert(notices).values(fresh.map((r) => ({ ...r, status: "pending" as const, plannedOn: plan.today, runId, createdAt: now })));
      recorded += fresh.length;
      const stages = [...new Map(fresh.filter((r) => r.kind !== "repair_reminder").map((r) => [r.assemblyId, r])).values()];
      if (stages.length) {
        // Only while the assembly is still in that cycle (a test accepted meanwhile starts a new one).
        await tx.execute(sql`UPDATE assemblies SET
          notice_stage = CASE id ${sql.join(stages.map((s) => sql`WHEN ${s.assemblyId} THEN ${s.kind}`), sql` `)} END,
          notice_cycle = CASE id ${sql.join(stages.map((s) => sql`WHEN ${s.assemblyId} THEN ${s.dueCycle}`), sql` `)} END
          WHERE base_state = 'active' AND (id, next_due_on) IN (${sql.join(stages.map((s) => sql`(${s.assemblyId}, ${s.dueCycle})`), sql`, `)})`);
      }
    });
  }
  return recorded;
}

// ---------------------------------------------------------------- sending

interface DueRow {
  id: number;
  kind: NoticeKind;
  assemblyId: number;
  dueCycle: string;
  ownerId: number | null;
  recipientEmail: string | null;
  attempts: number;
  batchKey: string | null;
}

interface Message {
  email: string;
  kind: NoticeKind;
  rows: DueRow[];
}

/** Deterministic: the same rows always make the same messages in the same order (a re-sent batch must match its first send). */
function groupIntoMessages(rows: readonly DueRow[]): Message[] {
  const groups = new Map<string, DueRow[]>();
  for (const row of [...rows].sort((a, b) => a.id - b.id)) {
    const key = `${row.recipientEmail ?? ""}|${row.kind}`;
    groups.set(key, [...(groups.get(key) ?? []), row]);
  }
  const messages: Message[] = [];
  for (const group of groups.values()) {
    for (let i = 0; i < group.length; i += MAX_ASSEMBLIES_PER_MESSAGE) {
      const part = group.slice(i, i + MAX_ASSEMBLIES_PER_MESSAGE);
      messages.push({ email: part[0]!.recipientEmail ?? "", kind: part[0]!.kind, rows: part });
    }
  }
  return messages.sort((a, b) => a.rows[0]!.id - b.rows[0]!.id);
}

const dueRowColumns = { id: notices.id, kind: notices.kind, assemblyId: notices.assemblyId, dueCycle: notices.dueCycle, ownerId: notices.ownerId, recipientEmail: notices.recipientEmail, attempts: notices.attempts, batchKey: notices.batchKey };

/** Rows that are due: never tried, or failed and past their back-off. */
function dueCondition(now: Date): SQL {
  return sql`(${notices.status} = 'pending' OR (${notices.status} = 'failed' AND ${notices.nextAttemptAt} IS NOT NULL AND ${notices.nextAttemptAt} <= ${now}))`;
}

/**
 * Withdraws due rows that are no longer needed: the assembly was tested (its cycle moved on),
 * left service, or a later stage of the same cycle was recorded. Returns the rows still due.
 */
async function withdrawStale<T extends DueRow>(rows: T[]): Promise<{ keep: T[]; withdrawn: number }> {
  if (rows.length === 0) return { keep: rows, withdrawn: 0 };
  const db = getDb();
  const stale = new Map<number, string>();
  for (let i = 0; i < rows.length; i += 2000) {
    const chunk = rows.slice(i, i + 2000);
    const ids = [...new Set(chunk.map((r) => r.assemblyId))];
    const facts = await db.select({ id: assemblies.id, status: assemblies.status, baseState: assemblies.baseState, nextDueOn: assemblies.nextDueOn, repairDueOn: assemblies.repairDueOn }).from(assemblies).where(inArray(assemblies.id, ids));
    const byId = new Map(facts.map((f) => [f.id, f]));
    const later = await db.select({ assemblyId: notices.assemblyId, kind: notices.kind, dueCycle: notices.dueCycle }).from(notices).where(and(inArray(notices.assemblyId, ids), inArray(notices.kind, ["overdue", "final"])));
    const laterKeys = new Set(later.map((l) => `${l.assemblyId}|${l.kind}|${l.dueCycle}`));
    for (const row of chunk) {
      const fact = byId.get(row.assemblyId);
      const isStillInCycle =
        fact !== undefined && fact.status === "active" && (row.kind === "repair_reminder" ? fact.baseState === "failed" && fact.repairDueOn === row.dueCycle : fact.baseState === "active" && fact.nextDueOn === row.dueCycle);
      if (!isStillInCycle) stale.set(row.id, "No longer needed: the assembly was tested, repaired or taken out of service since the notice was planned.");
      else if (row.kind === "reminder" && (laterKeys.has(`${row.assemblyId}|overdue|${row.dueCycle}`) || laterKeys.has(`${row.assemblyId}|final|${row.dueCycle}`))) stale.set(row.id, "No longer needed: a later notice for the same due date took its place.");
      else if (row.kind === "overdue" && laterKeys.has(`${row.assemblyId}|final|${row.dueCycle}`)) stale.set(row.id, "No longer needed: the final notice for the same due date took its place.");
    }
  }
  const byReason = new Map<string, number[]>();
  for (const [id, reason] of stale) byReason.set(reason, [...(byReason.get(reason) ?? []), id]);
  for (const [reason, ids] of byReason) {
    for (let i = 0; i < ids.length; i += RECORD_CHUNK) {
      await db
        .update(notices)
        .set({ status: "withdrawn", lastError: reason, nextAttemptAt: null })
        .where(and(inArray(notices.id, ids.slice(i, i + RECORD_CHUNK)), ne(notices.status, "sent")));
    }
  }
  return { keep: rows.filter((r) => !stale.has(r.id)), withdrawn: stale.size };
}

interface NoticeDetail {
  id: number;
  ownerName: string | null;
  mailingAddress: string | null;
  siteId: number;
  siteName: string;
  siteAddress: string;
  siteCity: string;
  accountNumber: string;
  kind: string;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  lastTestedOn: string | null;
}

async function loadDetails(ids: readonly number[]): Promise<Map<number, NoticeDetail>> {
  const rows = await getDb()
    .select({
      id: notices.id,
      ownerName: owners.name,
      mailingAddress: owners.mailingAddress,
      siteId: sites.id,
      siteName: sites.name,
      siteAddress: sites.addressLine1,
      siteCity: sites.city,
      accountNumber: sites.accountNumber,
      kind: assemblies.kind,
      make: assemblies.make,
      model: assemblies.model,
      size: assemblies.size,
      serial: assemblies.serial,
      location: assemblies.location,
      lastTestedOn: assemblies.lastTestedOn,
    })
    .from(notices)
    .innerJoin(assemblies, eq(assemblies.id, notices.assemblyId))
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .leftJoin(owners, eq(owners.id, notices.ownerId))
    .where(inArray(notices.id, [...ids]));
  return new Map(rows.map((r) => [r.id, r]));
}

function siteLine(d: Pick<NoticeDetail, "siteName" | "siteAddress" | "siteCity">): string {
  return [d.siteName, d.siteAddress, d.siteCity].map((s) => s.trim()).filter(Boolean).join(", ");
}

function itemFor(row: DueRow, d: NoticeDetail): NoticeItem {
  return {
    assembly: describeAssembly(d),
    location: d.location.trim() || "location not recorded",
    site: siteLine(d),
    accountNumber: d.accountNumber,
    checkWord: checkWordFor(d.kind),
    dueOn: formatLongDate(row.dueCycle),
    failedOn: row.kind === "repair_reminder" && d.lastTestedOn ? formatLongDate(d.lastTestedOn) : undefined,
  };
}

function noticePropsFor(program: ProgramContext, message: { kind: NoticeKind; rows: DueRow[] }, details: Map<number, NoticeDetail>, today: string, link: { url: string; isSigned: boolean; expiresOn: string }): NoticeEmailProps {
  const first = details.get(message.rows[0]!.id);
  return {
    programName: program.name,
    programPhone: program.phone,
    programReplyTo: program.replyTo,
    programAddress: program.mailingAddress,
    recipientName: first?.ownerName?.trim() || "Owner or occupant",
    noticeDate: formatLongDate(today),
    items: message.rows.flatMap((row) => {
      const d = details.get(row.id);
      return d ? [itemFor(row, d)] : [];
    }),
    portalUrl: link.url,
    isSignedLink: link.isSigned,
    linkExpiresOn: link.expiresOn,
    testersUrl: new URL("/testers", getEnv().APP_URL).toString(),
    discontinueOn: message.kind === "final" ? formatLongDate(addDays(today, program.discontinueDaysAfterFinal)) : undefined,
  };
}

type SendOutcome = { ok: true; ids: (string | null)[] } | { ok: false; isDefinite: boolean; statusCode: number | null; name: string; message: string };

/** One call of the service's batch API; errors come back as values (the SDK never throws). */
async function sendBatch(emails: RenderedEmail[], idempotencyKey: string): Promise<SendOutcome> {
  const { data, error } = await getMailClient().batch.send(
    emails.map((e) => ({ from: e.from, to: e.to, subject: e.subject, html: e.html, text: e.text, replyTo: e.reply_to, tags: e.tags })),
    { idempotencyKey },
  );
  if (!error && data) return { ok: true, ids: data.data.map((d) => d.id) };
  const statusCode = (error as { statusCode?: number | null } | null)?.statusCode ?? null;
  const name = error?.name ?? "no_answer";
  // The key was already used with another body: the service accepted this batch on an earlier
  // attempt whose answer we lost (each attempt carries fresh sign-in links).
  if (statusCode === 409 && name === "invalid_idempotent_request") return { ok: true, ids: emails.map(() => null) };
  // 4xx other than 409: refused as asked, nothing was sent. Anything else (5xx, 409 "still
  // processing", no answer) may have been delivered: only the same key may try again.
  const isDefinite = statusCode !== null && statusCode >= 400 && statusCode < 500 && statusCode !== 409;
  return { ok: false, isDefinite, statusCode, name, message: error?.message ?? "The mail service gave no answer." };
}

// ---------------------------------------------------------------- one run

class RunLog {
  readonly lines: string[] = [];
  constructor(
    private readonly now: () => Date,
    private readonly onLog?: (line: string) => void,
  ) {}
  add(message: string): void {
    const line = `${this.now().toISOString().slice(11, 19)} ${message}`;
    this.lines.push(line);
    if (this.lines.length > LOG_LINES_KEPT) this.lines.splice(1, 1);
    this.onLog?.(line);
  }
  text(): string {
    return this.lines.join("\n");
  }
}

interface Counters {
  planned: number;
  recorded: number;
  messages: number;
  sent: number;
  failed: number;
  withdrawn: number;
  letters: number;
  total: number;
}

class LeaseLostError extends Error {
  constructor() {
    super("Another run took over this program's notices (this run was too slow to renew its lease); this run stopped sending.");
  }
}

interface RunState {
  program: ProgramContext;
  runId: number;
  leaseName: string;
  holder: string;
  leaseSeconds: number;
  now: () => Date;
  log: RunLog;
  counters: Counters;
  renderer: NoticeRenderer;
  today: string;
}

async function saveProgress(state: RunState): Promise<void> {
  const c = state.counters;
  await getDb().update(noticeRuns).set({ planned: c.planned, sent: c.sent, failed: c.failed, letters: c.letters, total: c.total, log: state.log.text() }).where(eq(noticeRuns.id, state.runId));
}

async function keepLeaseOrStop(state: RunState): Promise<void> {
  if (!(await renewLease(state.leaseName, state.holder, state.now(), state.leaseSeconds))) throw new LeaseLostError();
}

/** Marks rows sent, one statement per batch. */
async function markSent(rows: { id: number; messageId: string | null }[], now: Date): Promise<void> {
  if (rows.length === 0) return;
  await getDb().execute(sql`UPDATE notices SET status = 'sent', sent_at = ${now}, next_attempt_at = NULL, last_error = NULL,
    message_id = CASE id ${sql.join(rows.map((r) => sql`WHEN ${r.id} THEN ${r.messageId}`), sql` `)} END
    WHERE id IN (${sql.join(rows.map((r) => sql`${r.id}`), sql`, `)}) AND status <> 'sent'`);
}

/**
 * A failed attempt: back-off from the attempt count; after the last attempt the notice waits
 * for a person (shown in the log). Keeps the batch key unless the service surely sent nothing.
 */
async function markFailed(rows: readonly DueRow[], error: string, keepBatchKey: boolean, now: Date, extra: { runId?: number; countAttempt?: boolean } = {}): Promise<void> {
  for (const attempts of new Set(rows.map((r) => r.attempts + (extra.countAttempt ? 1 : 0)))) {
    const ids = rows.filter((r) => r.attempts + (extra.countAttempt ? 1 : 0) === attempts).map((r) => r.id);
    const isGivenUp = attempts >= MAX_NOTICE_ATTEMPTS;
    await getDb()
      .update(notices)
      .set({
        status: "failed",
        attempts,
        lastError: (isGivenUp ? `Gave up after ${attempts} attempts. ` : "") + error.slice(0, 2000),
        nextAttemptAt: isGivenUp ? null : new Date(now.getTime() + retryDelayMinutes(attempts) * 60_000),
        ...(keepBatchKey ? {} : { batchKey: null }),
        ...(extra.runId ? { runId: extra.runId } : {}),
      })
      .where(and(inArray(notices.id, ids), ne(notices.status, "sent")));
  }
}

/** Hands one batch to the service and records the answer. Returns false when the service refused it. */
async function sendOneBatch(state: RunState, messages: Message[], batchKey: string | null): Promise<boolean> {
  const { program, now, log, counters } = state;
  await keepLeaseOrStop(state);
  const allRows = messages.flatMap((m) => m.rows);
  const details = await loadDetails(allRows.map((r) => r.id));

  // Every variable checked before anything is claimed or sent: a notice that cannot be written
  // fails loudly (kept in the log and on the row) and never goes out half-filled.
  let sendable = messages;
  if (batchKey === null) {
    const checked: Message[] = [];
    for (const message of messages) {
      try {
        prepareNoticeProps(message.kind, noticePropsFor(program, message, details, state.today, { url: ownerLinkUrl(null), isSigned: false, expiresOn: "" }));
        if (!isDeliverableAddress(message.email)) throw new NoticeTemplateError(message.kind, [`The recipient address ${JSON.stringify(message.email)} is not a valid e-mail address.`]);
        checked.push(message);
      } catch (error) {
        const reason = error instanceof Error ? error.message : String(error);
        log.add(`NOT SENT (notice ${message.rows.map((r) => r.id).join(", ")}): ${reason}`);
        await markFailed(message.rows, reason, false, now(), { runId: state.runId, countAttempt: true });
        counters.failed += 1;
      }
    }
    sendable = checked;
    if (sendable.length === 0) return true;
  }

  // Claim: the batch key, attempt count and sign-in links are committed together before the
  // service sees anything, so a crash from here on leaves a batch the next run can finish.
  const key = batchKey ?? `nb_${randomBytes(16).toString("hex")}`;
  const rows = sendable.flatMap((m) => m.rows);
  const links = await getDb().transaction(async (tx) => {
    if (batchKey === null) {
      const [claimed] = await tx
        .update(notices)
        .set({ batchKey: key, attempts: sql`${notices.attempts} + 1`, runId: state.runId })
        .where(and(inArray(notices.id, rows.map((r) => r.id)), sql`${notices.batchKey} IS NULL`, inArray(notices.status, ["pending", "failed"])));
      if (claimed.affectedRows !== rows.length) throw new Error(`Could not claim ${rows.length} notices for sending (${claimed.affectedRows} were free).`);
    } else {
      await tx.update(notices).set({ runId: state.runId, attempts: sql`${notices.attempts} + 1` }).where(eq(notices.batchKey, key));
    }
    const recipients = sendable.map((m) => ({ email: m.email, name: details.get(m.rows[0]!.id)?.ownerName ?? "Property owner", ownerIds: [...new Set(m.rows.map((r) => r.ownerId).filter((id): id is number => id !== null))] }));
    const userIds = await resolveOwnerUsersForEmails(tx, recipients, now());
    const signable = sendable.map((m) => userIds.get(m.email) ?? null);
    const secrets = await createOwnerTokens(tx, "owner_link", signable.filter((id): id is number => id !== null), now());
    let next = 0;
    return signable.map((userId) => (userId === null ? null : secrets[next++]!));
  });
  for (const row of rows) row.attempts += 1;

  const expiresOn = expiryWords(expiryOf("owner_link", now()));
  const emails: RenderedEmail[] = [];
  try {
    for (const [index, message] of sendable.entries()) {
      const token = links[index] ?? null;
      const rendered = await state.renderer.render(message.kind, noticePropsFor(program, message, details, state.today, { url: ownerLinkUrl(token), isSigned: token !== null, expiresOn }));
      emails.push({
        from: fromAddress(program.name),
        to: [message.email],
        subject: rendered.subject,
        html: rendered.html,
        text: rendered.text,
        reply_to: [program.replyTo],
        tags: [
          { name: "notice", value: message.kind },
          { name: "program", value: program.slug.replace(/[^A-Za-z0-9_-]/g, "_") },
        ],
      });
    }
  } catch (error) {
    // Nothing reached the service: free the rows for a later run and say why.
    const reason = error instanceof Error ? error.message : String(error);
    log.add(`NOT SENT (batch of ${sendable.length}): ${reason}`);
    await markFailed(rows, reason, false, now());
    counters.failed += sendable.length;
    return false;
  }

  const outcome = await sendBatch(emails, key);
  if (!outcome.ok && outcome.statusCode === 422 && emails.length > 1) {
    // The service checks a whole batch at once: one message it refuses must not hold back the
    // others. Each goes alone, under a key derived from the batch's and its own first notice
    // (not its position, which a later attempt may change), so a repeat is safe too.
    log.add(`The mail service refused the batch as a whole (${outcome.message}); sending its ${emails.length} messages one by one.`);
    const delivered: { id: number; messageId: string | null }[] = [];
    let isAnyRefused = false;
    for (const [index, email] of emails.entries()) {
      const message = sendable[index]!;
      const single = await sendBatch([email], `${key}.${message.rows[0]!.id}`);
      if (single.ok) {
        delivered.push(...message.rows.map((r) => ({ id: r.id, messageId: single.ids[0] ?? null })));
        counters.sent += 1;
      } else {
        isAnyRefused = true;
        log.add(`FAILED ${message.email} (${message.kind}): ${single.statusCode ?? "no answer"} ${single.message}`);
        await markFailed(message.rows, `${single.statusCode ?? "no answer"} ${single.name}: ${single.message}`, !single.isDefinite, now());
        counters.failed += 1;
      }
    }
    await markSent(delivered, now());
    return !isAnyRefused || delivered.length > 0;
  }
  if (outcome.ok) {
    const ids = outcome.ids;
    const delivered = sendable.flatMap((m, index) => m.rows.map((r) => ({ id: r.id, messageId: ids[index] ?? null })));
    await markSent(delivered, now());
    counters.sent += sendable.length;
    return true;
  }
  const reason = `${outcome.statusCode ?? "no answer"} ${outcome.name}: ${outcome.message}`;
  log.add(`FAILED batch of ${sendable.length} messages (${reason}); ${outcome.isDefinite ? "nothing was sent, it will be retried" : "it may have been delivered, so it will be retried under the same key"} after ${retryDelayMinutes(rows[0]?.attempts ?? 1)} minutes.`);
  await markFailed(rows, reason, !outcome.isDefinite, now());
  counters.failed += sendable.length;
  return false;
}

async function sendEmails(state: RunState): Promise<void> {
  const { program, now, log } = state;
  const db = getDb();
  // 1. Batches an earlier run handed to the service without recording the answer, or that were
  //    refused in a way that may still have delivered them: the same batch, the same key.
  const keyed = await db
    .select(dueRowColumns)
    .from(notices)
    .where(and(eq(notices.programId, program.id), eq(notices.channel, "email"), isNotNull(notices.batchKey), dueCondition(now())))
    .orderBy(asc(notices.id));
  const byKey = new Map<string, DueRow[]>();
  for (const row of keyed) byKey.set(row.batchKey!, [...(byKey.get(row.batchKey!) ?? []), row]);
  // 2. Everything else that is due.
  const free = await db
    .select(dueRowColumns)
    .from(notices)
    .where(and(eq(notices.programId, program.id), eq(notices.channel, "email"), sql`${notices.batchKey} IS NULL`, dueCondition(now())))
    .orderBy(asc(notices.id));
  const { keep, withdrawn } = await withdrawStale(free);
  state.counters.withdrawn += withdrawn;
  if (withdrawn) log.add(`Withdrew ${withdrawn} notices that are no longer needed.`);
  const messages = groupIntoMessages(keep);
  const resumed = [...byKey.values()].map((rows) => groupIntoMessages(rows));
  state.counters.messages = messages.length + resumed.reduce((n, b) => n + b.length, 0);
  state.counters.total += state.counters.messages;
  if (resumed.length) log.add(`Resuming ${resumed.length} batches handed to the mail service by an earlier attempt, under their own keys.`);
  log.add(`Sending ${state.counters.messages} e-mails (${keep.length + keyed.length} notices) in batches of up to ${MAIL_BATCH_SIZE}.`);
  await saveProgress(state);

  let refusedInARow = 0;
  const batches: { messages: Message[]; key: string | null }[] = [
    ...resumed.map((m, i) => ({ messages: m, key: [...byKey.keys()][i]! })),
    ...Array.from({ length: Math.ceil(messages.length / MAIL_BATCH_SIZE) }, (_, i) => ({ messages: messages.slice(i * MAIL_BATCH_SIZE, (i + 1) * MAIL_BATCH_SIZE), key: null })),
  ];
  for (const [index, batch] of batches.entries()) {
    const isAccepted = await sendOneBatch(state, batch.messages, batch.key);
    refusedInARow = isAccepted ? 0 : refusedInARow + 1;
    await saveProgress(state);
    if (refusedInARow >= FAILED_BATCHES_BEFORE_PAUSE && index < batches.length - 1) {
      const left = batches.slice(index + 1).reduce((n, b) => n + b.messages.length, 0);
      log.add(`The mail service refused ${refusedInARow} batches in a row: stopping here. The other ${left} e-mails stay recorded and go out with the next run.`);
      break;
    }
  }
}

// ---------------------------------------------------------------- letters

interface LetterRow extends DueRow {
  siteId: number;
}

function dueLineOf(kind: NoticeKind, item: NoticeItem): string {
  if (kind === "repair_reminder") return `Failed its ${item.checkWord} on ${item.failedOn ?? "a recent date"}; repair and retest due by ${item.dueOn}`;
  return `Yearly ${item.checkWord} ${kind === "reminder" ? "due by" : "was due on"} ${item.dueOn}`;
}

async function makeLetters(state: RunState): Promise<void> {
  const { program, now, log, counters } = state;
  const db = getDb();
  const due = await db
    .select({ ...dueRowColumns, siteId: assemblies.siteId })
    .from(notices)
    .innerJoin(assemblies, eq(assemblies.id, notices.assemblyId))
    .where(and(eq(notices.programId, program.id), eq(notices.channel, "letter"), dueCondition(now())))
    .orderBy(asc(notices.id));
  if (due.length === 0) return;
  const { keep: rows, withdrawn } = await withdrawStale<LetterRow>(due);
  counters.withdrawn += withdrawn;
  if (rows.length === 0) return;

  // One letter per contact, site and stage: the account number printed on it is the site's.
  const groups = new Map<string, LetterRow[]>();
  for (const row of rows) {
    const key = `${row.ownerId ?? "site"}|${row.siteId}|${row.kind}`;
    groups.set(key, [...(groups.get(key) ?? []), row]);
  }
  const details = await loadDetails(rows.map((r) => r.id));
  const accessUrl = new URL("/owner-access", getEnv().APP_URL).toString();
  const letters: { rows: LetterRow[]; page: Omit<LetterPage, "code" | "codeExpiresOn"> }[] = [];
  for (const group of groups.values()) {
    const first = details.get(group[0]!.id)!;
    const message = { kind: group[0]!.kind, rows: group };
    try {
      // The same variables and wording as the e-mail, checked the same way.
      const props = prepareNoticeProps(message.kind, noticePropsFor(program, message, details, state.today, { url: accessUrl, isSigned: false, expiresOn: "" }));
      const wording = noticeWordings[message.kind](props);
      letters.push({
        rows: group,
        page: {
          kind: message.kind,
          headline: wording.headline,
          intro: wording.intro,
          action: wording.action,
          caution: wording.caution,
          items: props.items.map((item) => ({ assembly: item.assembly, location: item.location, site: item.site, accountNumber: item.accountNumber, dueLine: dueLineOf(message.kind, item) })),
          recipientName: first.ownerName?.trim() || "The owner or occupant",
          recipientAddress: first.mailingAddress?.trim() || siteLine(first),
          accountNumber: first.accountNumber,
          accessUrl,
          testersUrl: props.testersUrl,
          reference: `${program.slug}-${group.map((r) => r.id).join("-")}`.slice(0, 60),
        },
      });
    } catch (error) {
      const reason = error instanceof Error ? error.message : String(error);
      log.add(`NOT PRINTED (notice ${group.map((r) => r.id).join(", ")}): ${reason}`);
      await markFailed(group, reason, false, now(), { runId: state.runId, countAttempt: true });
      counters.failed += 1;
    }
  }
  if (letters.length === 0) return;
  counters.total += letters.length;
  log.add(`Writing ${letters.length} printed letters (${letters.reduce((n, l) => n + l.rows.length, 0)} notices) for contacts without an e-mail address.`);
  await saveProgress(state);

  // Accounts first (harmless if the rest fails), then the codes, the PDF, and last, in one
  // transaction, the codes' hashes and the rows marked ready: a letter is in exactly one PDF.
  const letterOwners = letters.flatMap((l) => (l.rows[0]!.ownerId === null ? [] : [{ ownerId: l.rows[0]!.ownerId, name: details.get(l.rows[0]!.id)?.ownerName ?? "Property owner" }]));
  const accounts = await db.transaction((tx) => resolveOwnerUsersForLetters(tx, letterOwners, now()));
  const userIds = letters.map((l) => (l.rows[0]!.ownerId === null ? null : (accounts.get(l.rows[0]!.ownerId) ?? null)));
  const codes = userIds.map((userId) => (userId === null ? null : generateReadableCode(OWNER_CODE_LENGTH)));
  const codeExpiresOn = expiryWords(expiryOf("owner_code", now()));
  const pdf = await renderLettersPdf({
    programName: program.name,
    programAddress: program.mailingAddress,
    programPhone: program.phone,
    programReplyTo: program.replyTo,
    date: formatLongDate(state.today),
    pages: letters.map((l, index) => ({ ...l.page, code: codes[index] ? formatOwnerCode(codes[index]) : null, codeExpiresOn })),
  });
  const store = getFileStore();
  const storageKey = await store.put(pdf);
  const ids = letters.flatMap((l) => l.rows.map((r) => r.id));
  try {
    await db.transaction(async (tx) => {
      await insertCodes(tx, userIds, codes, now());
      const [marked] = await tx
        .update(notices)
        .set({ status: "letter_ready", runId: state.runId, sentAt: now(), attempts: sql`${notices.attempts} + 1`, lastError: null, nextAttemptAt: null })
        .where(and(inArray(notices.id, ids), inArray(notices.status, ["pending", "failed"])));
      if (marked.affectedRows !== ids.length) throw new Error("Some letters changed while the PDF was being made; the next run makes them again.");
      await tx.update(noticeRuns).set({ lettersStorageKey: storageKey, letters: letters.length }).where(eq(noticeRuns.id, state.runId));
    });
  } catch (error) {
    await store.remove(storageKey);
    throw error;
  }
  counters.letters = letters.length;
  log.add(`The letters are ready to print: ${letters.length} pages.`);
}

/** Stores the letters' one-time codes (hashes only). */
async function insertCodes(tx: Executor, userIds: (number | null)[], codes: (string | null)[], now: Date): Promise<void> {
  const rows = userIds.flatMap((userId, index) => (userId !== null && codes[index] ? [{ tokenHash: hashToken(codes[index]), userId, purpose: "owner_code" as const, expiresAt: expiryOf("owner_code", now), createdAt: now }] : []));
  if (rows.length) await tx.insert(authTokens).values(rows);
}

// ---------------------------------------------------------------- entry points

export interface StartedRun {
  runId: number;
  programId: number;
  /** Does the work; resolves with the summary (never throws: failures end up in the run's status and log). */
  execute: () => Promise<NoticeRunSummary>;
}

function emptySummary(programId: number, programName: string, status: NoticeRunStatus, message: string, runId: number | null, log: string[], today: string | null = null): NoticeRunSummary {
  return { programId, programName, runId, status, today, planned: 0, recorded: 0, messages: 0, sent: 0, failed: 0, withdrawn: 0, letters: 0, message, log };
}

/**
 * Takes the program's lease and opens a run row. A run already holding the lease means
 * status "skipped" (recorded, so the log shows it) and nothing else; a program whose settings
 * cannot produce a notice means status "failed" with every reason, and nothing sent.
 */
export async function startNoticeRun(programId: number, options: NoticeRunOptions): Promise<StartedRun | NoticeRunSummary> {
  const now = options.now ?? (() => new Date());
  const holder = options.holder ?? `${process.pid}:${randomUUID()}`;
  const leaseSeconds = options.leaseSeconds ?? NOTICE_LEASE_SECONDS;
  const log = new RunLog(now, options.onLog);
  const db = getDb();
  const { program, name, problems } = await loadProgram(programId);
  const today = program ? todayInZone(program.timezone, now()) : null;
  const leaseName = leaseNameFor(programId);
  if (!program) {
    log.add(`Not run: ${problems.join(" ")}`);
    return emptySummary(programId, name, "failed", problems.join(" "), null, log.lines);
  }
  const openRun = async (status: "running" | "failed" | "skipped", lines: string[]) => {
    const [row] = await db
      .insert(noticeRuns)
      .values({ programId, runOn: today!, startedBy: options.startedBy ?? null, trigger: options.trigger, status, log: lines.join("\n"), startedAt: now(), finishedAt: status === "running" ? null : now() })
      .$returningId();
    return row!.id;
  };
  if (problems.length) {
    log.add(`Not run: the program's settings cannot produce a correct notice. ${problems.join(" ")} Nothing was recorded or sent.`);
    // A scheduled run leaves the refusal in the log for the admin to find; the button shows it at once and writes nothing.
    const runId = options.trigger === "schedule" ? await openRun("failed", log.lines) : null;
    return emptySummary(programId, name, "failed", problems.join(" "), runId, log.lines, today);
  }
  if (!(await acquireLease(leaseName, holder, now(), leaseSeconds))) {
    const [lease] = await db.select({ expiresAt: jobLeases.expiresAt }).from(jobLeases).where(eq(jobLeases.name, leaseName)).limit(1);
    log.add(`Skipped: another notice run is sending for ${name} right now${lease ? ` (its lease runs until ${lease.expiresAt.toISOString().slice(11, 19)} UTC)` : ""}. Nothing was sent twice.`);
    const runId = await openRun("skipped", log.lines);
    return emptySummary(programId, name, "skipped", "Another notice run is in progress for this program.", runId, log.lines, today);
  }
  let runId: number;
  try {
    // Runs left "running" by a process that died are over: this run picks up their notices.
    await db
      .update(noticeRuns)
      .set({ status: "failed", finishedAt: now(), log: sql`CONCAT(COALESCE(${noticeRuns.log}, ''), ${"\nInterrupted before it finished; a later run picked up its notices."})` })
      .where(and(eq(noticeRuns.programId, programId), eq(noticeRuns.status, "running")));
    log.add(`Notice run for ${name}, ${formatLongDate(today!)} (${options.trigger === "button" ? "started from the notices page" : "scheduled"}).`);
    runId = await openRun("running", log.lines);
  } catch (error) {
    await releaseLease(leaseName, holder);
    throw error;
  }
  return {
    runId,
    programId,
    execute: () => executeRun({ program, runId, leaseName, holder, leaseSeconds, now, log, counters: { planned: 0, recorded: 0, messages: 0, sent: 0, failed: 0, withdrawn: 0, letters: 0, total: 0 }, renderer: createNoticeRenderer(), today: today! }),
  };
}

async function executeRun(state: RunState): Promise<NoticeRunSummary> {
  const { program, runId, log, counters, now } = state;
  let status: NoticeRunStatus = "finished";
  let message = "";
  try {
    // Notices are planned from each assembly's stored due dates: a recompute still owed after a
    // settings change (one cut short) is finished first.
    const recomputed = await finishPendingFactsRecompute(program.id);
    if (recomputed) {
      log.add(`First finished recomputing due dates after a settings change: ${recomputed.assemblies} assemblies, ${recomputed.changed} changed.`);
      await keepLeaseOrStop(state);
    }
    const plan = await planTodaysNotices(program, now());
    counters.planned = plan.planned.length;
    const byKind = (["reminder", "overdue", "final", "repair_reminder"] as const).map((k) => `${plan.planned.filter((p) => p.kind === k).length} ${k.replace("_", " ")}`).join(", ");
    log.add(`Planned ${plan.planned.length} notices among ${plan.candidates} assemblies due or nearly due (${byKind}).`);
    await keepLeaseOrStop(state);
    counters.recorded = await recordPlan(plan, runId, now());
    log.add(`Recorded ${counters.recorded} new notices (${plan.rows.length - counters.recorded} were already recorded).`);
    await saveProgress(state);
    await sendEmails(state);
    await keepLeaseOrStop(state);
    await makeLetters(state);
    const [{ waiting } = { waiting: 0 }] = await getDb()
      .select({ waiting: sql<number>`COUNT(*)` })
      .from(notices)
      .where(and(eq(notices.programId, program.id), eq(notices.channel, "email"), inArray(notices.status, ["pending", "failed"]), isNotNull(notices.nextAttemptAt)));
    message = `${counters.sent} e-mails sent, ${counters.failed} failed, ${counters.letters} letters to print${counters.withdrawn ? `, ${counters.withdrawn} withdrawn` : ""}.`;
    if (Number(waiting) > 0) message += ` ${waiting} notices wait for a retry.`;
    if (counters.failed > 0) status = "failed";
    log.add(`Done: ${message}`);
  } catch (error) {
    status = "failed";
    message = error instanceof Error ? error.message : String(error);
    log.add(`STOPPED: ${message} Notices recorded so far stay recorded; the next run continues from here.`);
    if (!(error instanceof LeaseLostError) && !(error instanceof NoticeTemplateError)) console.error("[notices] run failed", error);
  } finally {
    await getDb()
      .update(noticeRuns)
      .set({ status, planned: counters.planned, sent: counters.sent, failed: counters.failed, letters: counters.letters, total: counters.total, log: log.text(), finishedAt: now() })
      .where(eq(noticeRuns.id, runId))
      .catch((error: unknown) => console.error("[notices] could not close the run", error));
    await releaseLease(state.leaseName, state.holder).catch(() => {});
  }
  return { programId: program.id, programName: program.name, runId, status, today: state.today, planned: counters.planned, recorded: counters.recorded, messages: counters.messages, sent: counters.sent, failed: counters.failed, withdrawn: counters.withdrawn, letters: counters.letters, message, log: log.lines };
}

/** Runs one program's notices to the end. */
export async function runNoticesForProgram(programId: number, options: NoticeRunOptions): Promise<NoticeRunSummary> {
  const started = await startNoticeRun(programId, options);
  return "execute" in started ? started.execute() : started;
}

/** The scheduled run (npm run notices): every program, one after the other. */
export async function runNoticesForAllPrograms(options: NoticeRunOptions & { programIds?: number[] }): Promise<NoticeRunSummary[]> {
  const ids = options.programIds ?? (await getDb().select({ id: programs.id }).from(programs).orderBy(asc(programs.id))).map((p) => p.id);
  const summaries: NoticeRunSummary[] = [];
  for (const id of ids) summaries.push(await runNoticesForProgram(id, options));
  return summaries;
}

export type { NoticeTemplateKind };

// ---------------------------------------------------------------- for the notices page

export interface NoticePlanPreview {
  today: string | null;
  problems: string[];
  byKind: Record<NoticeKind, number>;
  emails: number;
  letters: number;
}

/** What a run would plan today, without recording anything (the admin sees it before pressing the button). */
export async function previewNoticePlan(programId: number, now = new Date()): Promise<NoticePlanPreview> {
  const { program, problems } = await loadProgram(programId);
  const byKind: Record<NoticeKind, number> = { reminder: 0, overdue: 0, final: 0, repair_reminder: 0 };
  if (!program || problems.length) return { today: program ? todayInZone(program.timezone, now) : null, problems, byKind, emails: 0, letters: 0 };
  const plan = await planTodaysNotices(program, now);
  for (const p of plan.planned) byKind[p.kind] += 1;
  return { today: plan.today, problems: [], byKind, emails: plan.rows.filter((r) => r.channel === "email").length, letters: plan.rows.filter((r) => r.channel === "letter").length };
}
