import "server-only";
import { and, asc, count, desc, eq, exists, gte, inArray, isNull, lte, ne, or, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { createElement } from "react";
import { z } from "zod";
import { getDb } from "@/db/client";
import { auditLog, certifications, companies, programs, testerApprovals, testKits, testReports, users } from "@/db/schema";
import TesterRegistrationDecisionEmail, { subjectOfTesterRegistrationDecision, type RegistrationDecision } from "@/emails/tester-registration-decision";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";
import { ConflictError, NotFoundError } from "@/lib/errors";
import { sendEmailQuietly } from "@/lib/mail/send";
import { todayInZone } from "@/lib/programs/settings";
import { addMonths } from "@/lib/rules";
import { recordAudit } from "./audit";
import { getProgramContext } from "./settings";

export interface TesterApprovalRow {
  approvalId: number;
  testerId: number;
  name: string;
  email: string;
  phone: string;
  company: string | null;
  status: "pending" | "approved" | "rejected" | "suspended";
  reason: string | null;
  requestedAt: Date;
  decidedAt: Date | null;
  certification: { body: string; number: string; expiresOn: string; attachmentId: number | null } | null;
}

/** The program's testers and registrations, pending first. */
export async function listTesterApprovals(actor: Actor, filter: { status?: TesterApprovalRow["status"] } = {}): Promise<TesterApprovalRow[]> {
  assertCan(actor, "testers.review");
  const programId = staffProgramId(actor);
  const db = getDb();
  const rows = await db
    .select({
      approvalId: testerApprovals.id,
      testerId: users.id,
      name: users.name,
      email: users.email,
      phone: users.phone,
      company: companies.name,
      status: testerApprovals.status,
      reason: testerApprovals.reason,
      requestedAt: testerApprovals.createdAt,
      decidedAt: testerApprovals.decidedAt,
    })
    .from(testerApprovals)
    .innerJoin(users, eq(users.id, testerApprovals.testerId))
    .leftJoin(companies, eq(companies.id, users.companyId))
    .where(and(eq(testerApprovals.programId, programId), filter.status ? eq(testerApprovals.status, filter.status) : undefined))
    .orderBy(asc(testerApprovals.createdAt));
  // One query for every tester's certifications; the latest expiry is the current one.
  const testerIds = [...new Set(rows.map((r) => r.testerId))];
  const certs = new Map<number, TesterApprovalRow["certification"]>();
  if (testerIds.length) {
    const all = await db
      .select({ testerId: certifications.testerId, body: certifications.certifyingBody, number: certifications.number, expiresOn: certifications.expiresOn, attachmentId: certifications.attachmentId })
      .from(certifications)
      .where(inArray(certifications.testerId, testerIds))
      .orderBy(desc(certifications.expiresOn));
    for (const { testerId, ...cert } of all) if (!certs.has(testerId)) certs.set(testerId, cert);
  }
  return rows.map((r) => ({ ...r, certification: certs.get(r.testerId) ?? null }));
}

export const testerDecisionSchema = z.object({
  approvalId: z.coerce.number().int().positive(),
  decision: z.enum(["approve", "reject", "suspend", "reinstate"]),
  reason: z.string().trim().max(500).optional().default(""),
});

const transitions = {
  approve: { from: ["pending", "rejected"], to: "approved", mail: "approved" },
  reject: { from: ["pending"], to: "rejected", mail: "rejected" },
  suspend: { from: ["approved"], to: "suspended", mail: "suspended" },
  reinstate: { from: ["suspended"], to: "approved", mail: "reinstated" },
} as const satisfies Record<string, { from: readonly string[]; to: string; mail: RegistrationDecision }>;

/** Approve, reject, suspend or reinstate a tester in the inspector's program; e-mailed and audited. */
export async function decideTesterApproval(actor: Actor, input: z.infer<typeof testerDecisionSchema>): Promise<void> {
  assertCan(actor, "testers.review");
  const programId = staffProgramId(actor);
  if ((input.decision === "reject" || input.decision === "suspend") && !input.reason) {
    throw new ConflictError("Give a reason: the tester will see it.", "reason_required");
  }
  const db = getDb();
  const rule = transitions[input.decision];
  const result = await db.transaction(async (tx) => {
    const [row] = await tx
      .select({ id: testerApprovals.id, status: testerApprovals.status, testerId: testerApprovals.testerId, email: users.email, name: users.name, programName: programs.name, replyTo: programs.replyToEmail })
      .from(testerApprovals)
      .innerJoin(users, eq(users.id, testerApprovals.testerId))
      .innerJoin(programs, eq(programs.id, testerApprovals.programId))
      .where(and(eq(testerApprovals.id, input.approvalId), eq(testerApprovals.programId, programId)))
      .for("update");
    if (!row) throw new NotFoundError("No such registration in your program.");
    if (!(rule.from as readonly string[]).includes(row.status)) throw new ConflictError(`This registration is already ${row.status}; refresh the page.`, "already_decided");
    const now = new Date();
    await tx
      .update(testerApprovals)
      .set({ status: rule.to, reason: input.reason || null, decidedBy: actor.id, decidedAt: now })
      .where(eq(testerApprovals.id, row.id));
    await recordAudit(tx, { programId, actorId: actor.id, action: `tester.${rule.mail}`, entityType: "tester_approval", entityId: row.id, before: { status: row.status }, after: { status: rule.to, reason: input.reason || null } });
    return row;
  });
  await sendEmailQuietly({
    to: result.email,
    subject: subjectOfTesterRegistrationDecision({ programName: result.programName, decision: rule.mail }),
    fromName: result.programName,
    replyTo: result.replyTo,
    react: createElement(TesterRegistrationDecisionEmail, { name: result.name, programName: result.programName, decision: rule.mail, reason: input.reason || null, signInUrl: new URL("/login", getEnv().APP_URL).toString() }),
  });
}

/** The programs a tester may file in (approved), and where they are waiting. */
export async function listMyProgramApprovals(actor: Actor) {
  assertCan(actor, "tester.home");
  return getDb()
    .select({ programId: programs.id, programName: programs.name, status: testerApprovals.status, reason: testerApprovals.reason })
    .from(testerApprovals)
    .innerJoin(programs, eq(programs.id, testerApprovals.programId))
    .where(eq(testerApprovals.testerId, actor.id))
    .orderBy(programs.name);
}

// ------------------------------------------------------------------ roster, detail, public list

export interface TesterRosterRow extends TesterApprovalRow {
  isCertificationValid: boolean;
  kits: { serial: string; lastVerifiedOn: string; isCurrent: boolean }[];
  reportsLast12Months: number;
}

/**
 * The program's roster: every registration with its certificate, kits and recent filing, for
 * the inspector who approves, suspends and reinstates. "Valid" is judged on the program's today.
 */
export async function listTesterRoster(actor: Actor, filter: { status?: TesterApprovalRow["status"]; q?: string } = {}): Promise<{ rows: TesterRosterRow[]; today: string }> {
  assertCan(actor, "testers.review");
  const context = await getProgramContext(staffProgramId(actor));
  const rows = await listTesterApprovals(actor, { status: filter.status });
  const q = filter.q?.trim().toLowerCase();
  const matching = q ? rows.filter((r) => [r.name, r.email, r.company ?? "", r.certification?.number ?? ""].some((v) => v.toLowerCase().includes(q))) : rows;
  const ids = matching.map((r) => r.testerId);
  const db = getDb();
  const yearAgo = addMonths(context.today, -12);
  const [kits, filings] = ids.length
    ? await Promise.all([
        db.select({ testerId: testKits.testerId, serial: testKits.serial, lastVerifiedOn: testKits.lastVerifiedOn }).from(testKits).where(and(inArray(testKits.testerId, ids), isNull(testKits.retiredAt))),
        db
          .select({ testerId: testReports.testerId, n: count() })
          .from(testReports)
          .where(and(eq(testReports.programId, context.id), inArray(testReports.testerId, ids), gte(testReports.testedOn, yearAgo)))
          .groupBy(testReports.testerId),
      ])
    : [[], []];
  const filed = new Map(filings.map((f) => [f.testerId, Number(f.n)]));
  const kitLimit = addMonths(context.today, -context.ruleSet.kit.verificationMaxMonths);
  return {
    today: context.today,
    rows: matching.map((r) => ({
      ...r,
      isCertificationValid: Boolean(r.certification && r.certification.expiresOn >= context.today),
      kits: kits.filter((k) => k.testerId === r.testerId).map((k) => ({ serial: k.serial, lastVerifiedOn: k.lastVerifiedOn, isCurrent: k.lastVerifiedOn >= kitLimit })),
      reportsLast12Months: filed.get(r.testerId) ?? 0,
    })),
  };
}

export interface TesterDetail {
  approvalId: number;
  testerId: number;
  name: string;
  email: string;
  phone: string;
  company: string | null;
  accountStatus: string;
  status: TesterApprovalRow["status"];
  reason: string | null;
  requestedAt: string;
  decidedAt: string | null;
  decidedBy: string | null;
  certifications: { body: string; number: string; issuedOn: string | null; expiresOn: string; attachmentId: number | null; isValid: boolean }[];
  kits: { make: string; model: string; serial: string; lastVerifiedOn: string; result: string; attachmentId: number | null; isCurrent: boolean; isRetired: boolean }[];
  otherPrograms: { name: string; status: string }[];
  recentReports: { id: number; reportNumber: string; testedOn: string; status: string; finalOutcome: string; siteName: string }[];
  history: { action: string; at: string; actorName: string | null; reason: string | null }[];
  today: string;
}

/** One registration of the program with everything an inspector checks before deciding. */
export async function getTesterForStaff(actor: Actor, approvalId: number): Promise<TesterDetail> {
  assertCan(actor, "testers.review");
  const context = await getProgramContext(staffProgramId(actor));
  const db = getDb();
  const decider = alias(users, "decider");
  const [row] = await db
    .select({ approval: testerApprovals, name: users.name, email: users.email, phone: users.phone, accountStatus: users.status, company: companies.name, decidedBy: decider.name })
    .from(testerApprovals)
    .innerJoin(users, eq(users.id, testerApprovals.testerId))
    .leftJoin(companies, eq(companies.id, users.companyId))
    .leftJoin(decider, eq(decider.id, testerApprovals.decidedBy))
    .where(and(eq(testerApprovals.id, approvalId), eq(testerApprovals.programId, context.id)))
    .limit(1);
  if (!row) throw new NotFoundError("No such tester registration in your program.");
  const testerId = row.approval.testerId;
  const kitLimit = addMonths(context.today, -context.ruleSet.kit.verificationMaxMonths);
  const [certs, kits, others, recent, history] = await Promise.all([
    db.select().from(certifications).where(eq(certifications.testerId, testerId)).orderBy(desc(certifications.expiresOn)),
    db.select().from(testKits).where(eq(testKits.testerId, testerId)).orderBy(asc(testKits.serial)),
    db
      .select({ name: programs.name, status: testerApprovals.status })
      .from(testerApprovals)
      .innerJoin(programs, eq(programs.id, testerApprovals.programId))
      .where(and(eq(testerApprovals.testerId, testerId), ne(testerApprovals.programId, context.id))),
    db
      .select({ id: testReports.id, reportNumber: testReports.reportNumber, testedOn: testReports.testedOn, status: testReports.status, finalOutcome: testReports.finalOutcome, snapshot: testReports.assemblySnapshot })
      .from(testReports)
      .where(and(eq(testReports.programId, context.id), eq(testReports.testerId, testerId)))
      .orderBy(desc(testReports.submittedAt))
      .limit(15),
    db
      .select({ action: auditLog.action, at: auditLog.at, actorName: users.name, after: auditLog.after })
      .from(auditLog)
      .leftJoin(users, eq(users.id, auditLog.actorId))
      .where(and(eq(auditLog.entityType, "tester_approval"), eq(auditLog.entityId, String(row.approval.id))))
      .orderBy(desc(auditLog.at))
      .limit(30),
  ]);
  return {
    approvalId: row.approval.id,
    testerId,
    name: row.name,
    email: row.email,
    phone: row.phone,
    company: row.company,
    accountStatus: row.accountStatus,
    status: row.approval.status,
    reason: row.approval.reason,
    requestedAt: row.approval.createdAt.toISOString(),
    decidedAt: row.approval.decidedAt?.toISOString() ?? null,
    decidedBy: row.decidedBy,
    certifications: certs.map((c) => ({ body: c.certifyingBody, number: c.number, issuedOn: c.issuedOn, expiresOn: c.expiresOn, attachmentId: c.attachmentId, isValid: c.expiresOn >= context.today && (!c.issuedOn || c.issuedOn <= context.today) })),
    kits: kits.map((k) => ({ make: k.make, model: k.model, serial: k.serial, lastVerifiedOn: k.lastVerifiedOn, result: k.verificationResult, attachmentId: k.attachmentId, isCurrent: !k.retiredAt && k.lastVerifiedOn >= kitLimit && k.verificationResult !== "failed", isRetired: Boolean(k.retiredAt) })),
    otherPrograms: others,
    recentReports: recent.map((r) => ({ id: r.id, reportNumber: r.reportNumber, testedOn: r.testedOn, status: r.status, finalOutcome: r.finalOutcome, siteName: (r.snapshot as { siteName?: string }).siteName ?? "" })),
    history: history.map((h) => ({ action: h.action, at: h.at.toISOString(), actorName: h.actorName, reason: (h.after as { reason?: string | null } | null)?.reason ?? null })),
    today: context.today,
  };
}

export interface PublicTester {
  name: string;
  company: string | null;
  phone: string;
  programs: string[];
}

/**
 * The public roster owners use to find a tester: approved by at least one program, account
 * active, and a certification valid today. Name, company, phone and programs only — never an
 * e-mail address or anything else from the account.
 */
export async function listPublicTesters(filter: { programId?: number; q?: string } = {}): Promise<PublicTester[]> {
  const today = todayInZone("UTC");
  const db = getDb();
  const rows = await db
    .select({ testerId: users.id, name: users.name, phone: users.phone, company: companies.name, companyPhone: companies.phone, programName: programs.name, programId: programs.id })
    .from(testerApprovals)
    .innerJoin(users, eq(users.id, testerApprovals.testerId))
    .innerJoin(programs, eq(programs.id, testerApprovals.programId))
    .leftJoin(companies, eq(companies.id, users.companyId))
    .where(
      and(
        eq(testerApprovals.status, "approved"),
        eq(users.role, "tester"),
        eq(users.status, "active"),
        filter.programId ? eq(testerApprovals.programId, filter.programId) : undefined,
        exists(db.select({ one: sql`1` }).from(certifications).where(and(eq(certifications.testerId, users.id), gte(certifications.expiresOn, today), or(isNull(certifications.issuedOn), lte(certifications.issuedOn, today))))),
      ),
    )
    .orderBy(asc(users.name));
  const byTester = new Map<number, PublicTester>();
  for (const r of rows) {
    const entry = byTester.get(r.testerId) ?? { name: r.name, company: r.company, phone: r.phone || r.companyPhone || "", programs: [] };
    entry.programs.push(r.programName);
    byTester.set(r.testerId, entry);
  }
  const q = filter.q?.trim().toLowerCase();
  const all = [...byTester.values()].map((t) => ({ ...t, programs: [...new Set(t.programs)].sort() }));
  return q ? all.filter((t) => t.name.toLowerCase().includes(q) || (t.company ?? "").toLowerCase().includes(q)) : all;
}
