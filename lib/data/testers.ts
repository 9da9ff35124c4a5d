import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { createElement } from "react";
import { z } from "zod";
import { getDb } from "@/db/client";
import { certifications, companies, programs, testerApprovals, users } from "@/db/schema";
import TesterRegistrationDecisionEmail, { subjectOfTesterRegistrationDecision, type RegistrationDecision } from "@/emails/tester-registration-decision";
import { assertCan, staffProgramId, type Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";
import { ConflictError, NotFoundError } from "@/lib/errors";
import { sendEmailQuietly } from "@/lib/mail/send";
import { recordAudit } from "./audit";

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
      .select({ id: testerApprovals.id, status: testerApprovals.status, testerId: testerApprovals.testerId, email: users.email, name: users.name, programName: programs.name })
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
