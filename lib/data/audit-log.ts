import "server-only";
import { and, asc, desc, eq, gte, inArray, like, lt, or, type SQL } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { auditLog, users } from "@/db/schema";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { InputError } from "@/lib/errors";
import { addDays } from "@/lib/rules";
import { csvLine } from "./import-csv";
import { getProgramContext } from "./settings";

/**
 * The program's audit log, newest first, walked by keyset on audit_program_at_idx
 * (program_id, at). Dates in the filter are the program's calendar days.
 */

export const auditQuerySchema = z.object({
  actorId: z.coerce.number().int().positive().optional().catch(undefined),
  action: z.string().trim().max(80).optional().catch(undefined),
  entityType: z.string().trim().max(40).optional().catch(undefined),
  entityId: z.string().trim().max(40).optional().catch(undefined),
  from: z.iso.date().optional().catch(undefined),
  to: z.iso.date().optional().catch(undefined),
  before: z.string().max(60).optional(),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export interface AuditRow {
  id: number;
  at: string;
  actorId: number | null;
  actorName: string | null;
  action: string;
  entityType: string;
  entityId: string;
  before: unknown;
  after: unknown;
}

export const AUDIT_PAGE_SIZE = 50;

/** The UTC instant of 00:00 on a calendar day in a time zone. */
export function startOfDayInZone(date: string, timezone: string): Date {
  const guess = new Date(`${date}T00:00:00Z`);
  const parts = new Intl.DateTimeFormat("en-US", { timeZone: timezone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit" }).formatToParts(guess);
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const asLocal = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"));
  return new Date(guess.getTime() - (asLocal - guess.getTime()));
}

function conditions(programId: number, timezone: string, query: AuditQuery): SQL[] {
  const where: SQL[] = [eq(auditLog.programId, programId)];
  if (query.actorId) where.push(eq(auditLog.actorId, query.actorId));
  if (query.action) where.push(query.action.endsWith(".") ? like(auditLog.action, `${query.action.replace(/[\\%_]/g, (c) => `\\${c}`)}%`) : eq(auditLog.action, query.action));
  if (query.entityType) where.push(eq(auditLog.entityType, query.entityType));
  if (query.entityId) where.push(eq(auditLog.entityId, query.entityId));
  if (query.from) where.push(gte(auditLog.at, startOfDayInZone(query.from, timezone)));
  if (query.to) where.push(lt(auditLog.at, startOfDayInZone(addDays(query.to, 1), timezone)));
  if (query.from && query.to && query.from > query.to) throw new InputError("The start date is after the end date.", { from: ["The start date is after the end date."] });
  return where;
}

function cursorCondition(before: string | undefined): SQL | undefined {
  if (!before) return undefined;
  const [at, id] = before.split("_");
  const when = new Date(at ?? "");
  const afterId = Number(id);
  if (Number.isNaN(when.getTime()) || !Number.isInteger(afterId)) throw new InputError("The page link is out of date: go back to the first page.");
  return or(lt(auditLog.at, when), and(eq(auditLog.at, when), lt(auditLog.id, afterId)));
}

export async function listAuditLog(actor: Actor, query: AuditQuery): Promise<{ rows: AuditRow[]; next: string | null }> {
  assertCan(actor, "audit.view");
  const context = await getProgramContext(staffProgramId(actor));
  const rows = await getDb()
    .select({ id: auditLog.id, at: auditLog.at, actorId: auditLog.actorId, actorName: users.name, action: auditLog.action, entityType: auditLog.entityType, entityId: auditLog.entityId, before: auditLog.before, after: auditLog.after })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(and(...conditions(context.id, context.timezone, query), cursorCondition(query.before)))
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(AUDIT_PAGE_SIZE + 1);
  const page = rows.slice(0, AUDIT_PAGE_SIZE);
  const last = page.at(-1);
  return {
    rows: page.map((r) => ({ ...r, at: r.at.toISOString() })),
    next: rows.length > AUDIT_PAGE_SIZE && last ? `${last.at.toISOString()}_${last.id}` : null,
  };
}

/** Choices for the filters: the program's staff and the kinds of action and record seen. */
export async function getAuditFilterOptions(actor: Actor): Promise<{ actors: { id: number; name: string; role: string }[]; entityTypes: string[]; actionGroups: string[] }> {
  assertCan(actor, "audit.view");
  const programId = staffProgramId(actor);
  const db = getDb();
  const [staff, types] = await Promise.all([
    db.select({ id: users.id, name: users.name, role: users.role }).from(users).where(and(eq(users.programId, programId), inArray(users.role, ["inspector", "admin"]))).orderBy(asc(users.name)),
    db.selectDistinct({ entityType: auditLog.entityType, action: auditLog.action }).from(auditLog).where(eq(auditLog.programId, programId)).limit(500),
  ]);
  return {
    actors: staff,
    entityTypes: [...new Set(types.map((t) => t.entityType))].sort(),
    actionGroups: [...new Set(types.map((t) => t.action))].sort(),
  };
}

export const AUDIT_EXPORT_LIMIT = 100_000;

/**
 * The filtered log as CSV, read in pages of 2,000 along the same index; every cell is
 * formula-neutralised (the details are JSON written by users' input, e.g. a return reason).
 */
export async function* exportAuditLogCsv(actor: Actor, query: AuditQuery): AsyncGenerator<string> {
  assertCan(actor, "audit.view");
  const context = await getProgramContext(staffProgramId(actor));
  const base = conditions(context.id, context.timezone, query);
  yield `\uFEFF${csvLine(["When (UTC)", `When (${context.timezone})`, "Who", "Action", "Record", "Record id", "Before", "After"])}\r\n`;
  const local = new Intl.DateTimeFormat("sv-SE", { timeZone: context.timezone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" });
  let before: string | undefined = query.before;
  let written = 0;
  while (written < AUDIT_EXPORT_LIMIT) {
    const rows = await getDb()
      .select({ id: auditLog.id, at: auditLog.at, actorName: users.name, actorEmail: users.email, action: auditLog.action, entityType: auditLog.entityType, entityId: auditLog.entityId, before: auditLog.before, after: auditLog.after })
      .from(auditLog)
      .leftJoin(users, eq(users.id, auditLog.actorId))
      .where(and(...base, cursorCondition(before)))
      .orderBy(desc(auditLog.at), desc(auditLog.id))
      .limit(2000);
    if (rows.length === 0) break;
    yield rows.map((r) => csvLine([r.at.toISOString(), local.format(r.at), r.actorName ? `${r.actorName} <${r.actorEmail}>` : "system", r.action, r.entityType, r.entityId, r.before ?? "", r.after ?? ""])).join("\r\n") + "\r\n";
    written += rows.length;
    const last = rows.at(-1)!;
    before = `${last.at.toISOString()}_${last.id}`;
    if (rows.length < 2000) break;
  }
}
