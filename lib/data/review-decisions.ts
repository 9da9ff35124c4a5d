import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { createElement } from "react";
import { z } from "zod";
import { getDb } from "@/db/client";
import { returnReasons, reviews, testReports, users } from "@/db/schema";
import ReportDecisionEmail, { subjectOfReportDecision, type DecidedReportLine } from "@/emails/report-decision";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";
import { ConflictError, InputError, isDuplicateKey, NotFoundError } from "@/lib/errors";
import { sendEmailQuietly } from "@/lib/mail/send";
import { recomputeAssemblyFacts } from "./assembly-facts";
import { recordAudit } from "./audit";
import { issueCertificate } from "./certificates";
import type { AssemblySnapshot } from "./report-detail";
import { getProgramContext, type ProgramContext } from "./settings";

export const decisionSchema = z
  .object({
    decision: z.enum(["accept", "return"], { message: "Choose accept or return." }),
    /** Reasons from the program's list (return only). */
    reasonIds: z.array(z.coerce.number().int().positive()).max(20).optional().default([]),
    /** A reason in the inspector's own words (return only). */
    customReason: z.string().trim().max(500, "Keep the reason under 500 characters.").optional().default(""),
    /** A note for the tester, either way. */
    note: z.string().trim().max(2000, "Keep the note under 2,000 characters.").optional().default(""),
  })
  .refine((d) => d.decision === "accept" || d.reasonIds.length > 0 || d.customReason.length > 0, { message: "Pick at least one reason or write one: the tester needs to know what to correct.", path: ["reasonIds"] });
export type DecisionInput = z.infer<typeof decisionSchema>;

/** Raised when the report was decided by someone else first (or is not waiting). */
export class ReportNotWaitingError extends ConflictError {
  constructor(message: string) {
    super(message, "already_decided");
  }
}

function formatWhen(date: Date, timezone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone: timezone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hour12: false }).format(date);
}

interface DecidedReport {
  id: number;
  reportNumber: string;
  revision: number;
  testerId: number;
  testedOn: string;
  assembly: AssemblySnapshot;
  certificateCode: string | null;
}

interface DecideOptions {
  /** Batch acceptance: only a queued clean pass may be taken. */
  requireCleanPass?: boolean;
}

/**
 * One decision, one transaction: lock the report, move it out of 'queued' with a conditional
 * update, write its review (unique per report), the audit entry, recompute the assembly's facts
 * (a returned report stops counting) and, for an accepted pass, issue the certificate. A second
 * inspector on the same report waits for the first's lock and is then told who decided it.
 */
async function decideInTransaction(actor: Actor, context: ProgramContext, reportId: number, input: { decision: "accepted" | "returned"; reasons: string[]; note: string | null }, options: DecideOptions = {}): Promise<DecidedReport> {
  return getDb().transaction(async (tx) => {
    const [report] = await tx
      .select({
        id: testReports.id,
        programId: testReports.programId,
        status: testReports.status,
        reportNumber: testReports.reportNumber,
        revision: testReports.revision,
        assemblyId: testReports.assemblyId,
        testerId: testReports.testerId,
        testedOn: testReports.testedOn,
        finalOutcome: testReports.finalOutcome,
        isClean: testReports.isClean,
        assemblySnapshot: testReports.assemblySnapshot,
      })
      .from(testReports)
      .where(eq(testReports.id, reportId))
      .for("update");
    if (!report || report.programId !== context.id) throw new NotFoundError("No such report in your program.");
    if (report.status !== "queued") {
      const [earlier] = await tx.select({ decision: reviews.decision, decidedAt: reviews.decidedAt, name: users.name }).from(reviews).innerJoin(users, eq(users.id, reviews.inspectorId)).where(eq(reviews.reportId, report.id)).limit(1);
      if (earlier) throw new ReportNotWaitingError(`Report ${report.reportNumber} was already ${earlier.decision} by ${earlier.name} on ${formatWhen(earlier.decidedAt, context.timezone)}. Nothing was changed.`);
      const why = report.status === "awaiting_fee" ? "is waiting for its filing fee" : report.status === "superseded" ? "was replaced by a corrected revision" : `is ${report.status}`;
      throw new ReportNotWaitingError(`Report ${report.reportNumber} ${why}, so it cannot be decided now. Nothing was changed.`);
    }
    if (options.requireCleanPass && !(report.isClean && report.finalOutcome === "pass")) {
      throw new ReportNotWaitingError(`Report ${report.reportNumber} is not a clean pass; open it to decide.`);
    }
    const now = new Date();
    const [moved] = await tx
      .update(testReports)
      .set({ status: input.decision, decidedAt: now, decidedBy: actor.id, updatedAt: now })
      .where(and(eq(testReports.id, report.id), eq(testReports.status, "queued")));
    if (moved.affectedRows !== 1) throw new ReportNotWaitingError(`Report ${report.reportNumber} was decided by someone else a moment ago. Nothing was changed.`);
    try {
      await tx.insert(reviews).values({ reportId: report.id, inspectorId: actor.id, decision: input.decision, reasons: input.reasons, note: input.note, decidedAt: now });
    } catch (error) {
      if (isDuplicateKey(error)) throw new ReportNotWaitingError(`Report ${report.reportNumber} was decided by someone else a moment ago. Nothing was changed.`);
      throw error;
    }
    await recomputeAssemblyFacts(tx, report.assemblyId);
    const certificate = input.decision === "accepted" && report.finalOutcome === "pass" ? await issueCertificate(tx, { reportId: report.id, issuedBy: actor.id }) : null;
    await recordAudit(tx, {
      programId: context.id,
      actorId: actor.id,
      action: input.decision === "accepted" ? "report.accepted" : "report.returned",
      entityType: "test_report",
      entityId: report.id,
      before: { status: "queued" },
      after: { status: input.decision, reportNumber: report.reportNumber, reasons: input.reasons, note: input.note, certificateCode: certificate?.code ?? null, batch: options.requireCleanPass ? true : undefined },
    });
    return { id: report.id, reportNumber: report.reportNumber, revision: report.revision, testerId: report.testerId, testedOn: report.testedOn, assembly: report.assemblySnapshot as AssemblySnapshot, certificateCode: certificate?.code ?? null };
  });
}

async function resolveReasons(programId: number, input: DecisionInput): Promise<string[]> {
  if (input.decision === "accept") return [];
  const ids = [...new Set(input.reasonIds)];
  const rows = ids.length ? await getDb().select({ id: returnReasons.id, label: returnReasons.label }).from(returnReasons).where(and(eq(returnReasons.programId, programId), inArray(returnReasons.id, ids), eq(returnReasons.isActive, true))) : [];
  if (rows.length !== ids.length) throw new InputError("Pick reasons from the program's list.", { reasonIds: ["One of the reasons is not on the program's list."] });
  const byId = new Map(rows.map((r) => [r.id, r.label]));
  const labels = ids.map((id) => byId.get(id)!);
  if (input.customReason) labels.push(input.customReason);
  return labels;
}

function lineOf(report: DecidedReport): DecidedReportLine {
  const a = report.assembly;
  return {
    reportNumber: report.reportNumber,
    revision: report.revision,
    assembly: [a.kind, a.serial ? `serial ${a.serial}` : "", a.location].filter(Boolean).join(", "),
    site: [a.siteName, a.address].filter(Boolean).join(", "),
    testedOn: report.testedOn,
    url: new URL(`/tester/reports/${report.id}`, getEnv().APP_URL).toString(),
    certificateCode: report.certificateCode,
  };
}

/** E-mails each tester once about their decided reports; never blocks or undoes the decision. */
async function notifyTesters(actor: Actor, context: ProgramContext, decision: "accepted" | "returned", decided: DecidedReport[], reasons: string[], note: string | null): Promise<void> {
  const byTester = new Map<number, DecidedReport[]>();
  for (const report of decided) byTester.set(report.testerId, [...(byTester.get(report.testerId) ?? []), report]);
  if (byTester.size === 0) return;
  const testers = await getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, [...byTester.keys()]));
  for (const tester of testers) {
    const lines = byTester.get(tester.id)!.map(lineOf);
    await sendEmailQuietly({
      to: tester.email,
      subject: subjectOfReportDecision({ programName: context.name, decision, reports: lines }),
      fromName: context.name,
      replyTo: context.replyToEmail,
      tags: [{ name: "kind", value: `report_${decision}` }],
      react: createElement(ReportDecisionEmail, { testerName: tester.name, programName: context.name, programPhone: context.phone, replyTo: context.replyToEmail, decision, reports: lines, reasons, note, inspectorName: actor.name }),
    });
  }
}

export interface DecisionResult {
  id: number;
  reportNumber: string;
  status: "accepted" | "returned";
  certificateCode: string | null;
}

/** Accept or return one report (see decideInTransaction); the tester is e-mailed afterwards. */
export async function decideReport(actor: Actor, reportId: number, input: DecisionInput): Promise<DecisionResult> {
  assertCan(actor, "reports.review");
  const context = await getProgramContext(staffProgramId(actor));
  const reasons = await resolveReasons(context.id, input);
  const decision = input.decision === "accept" ? "accepted" : "returned";
  const decided = await decideInTransaction(actor, context, reportId, { decision, reasons, note: input.note || null });
  await notifyTesters(actor, context, decision, [decided], reasons, input.note || null);
  return { id: decided.id, reportNumber: decided.reportNumber, status: decision, certificateCode: decided.certificateCode };
}

export const batchAcceptSchema = z.object({
  ids: z.array(z.number().int().positive()).min(1, "Nothing to accept.").max(200, "Send at most 200 reports per batch."),
});

export interface BatchAcceptResult {
  accepted: { id: number; reportNumber: string }[];
  skipped: { id: number; reason: string }[];
}

/**
 * "Accept all clean passes": exactly the reports the inspector confirmed, each in its own
 * transaction with its own review, audit entry and certificate. A report someone else decided
 * meanwhile, or that is no longer a clean pass, is skipped and said so; the rest go on.
 */
export async function acceptCleanPasses(actor: Actor, ids: readonly number[]): Promise<BatchAcceptResult> {
  assertCan(actor, "reports.review");
  const context = await getProgramContext(staffProgramId(actor));
  const accepted: DecidedReport[] = [];
  const skipped: BatchAcceptResult["skipped"] = [];
  try {
    for (const id of new Set(ids)) {
      try {
        accepted.push(await decideInTransaction(actor, context, id, { decision: "accepted", reasons: [], note: null }, { requireCleanPass: true }));
      } catch (error) {
        if (error instanceof ConflictError || error instanceof NotFoundError) skipped.push({ id, reason: error.message });
        else throw error;
      }
    }
  } finally {
    // Whatever was committed before an outage is still told to its tester.
    await notifyTesters(actor, context, "accepted", accepted, [], null);
  }
  return { accepted: accepted.map((r) => ({ id: r.id, reportNumber: r.reportNumber })), skipped };
}
