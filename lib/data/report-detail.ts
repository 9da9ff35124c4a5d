import "server-only";
import { and, asc, desc, eq } from "drizzle-orm";
import { getDb, type Executor } from "@/db/client";
import { assemblies, certificates, localRuleSets, owners, programs, reportReadings, reportRepairs, reviews, siteOwners, testReports, users } from "@/db/schema";
import type { ReportStatus } from "@/db/schema/reports";
import type { Actor } from "@/lib/auth/permissions";
import { NotFoundError } from "@/lib/errors";
import { ruleSetForEdition } from "@/lib/programs/settings";
import { expandGrade, type DisplayPhase, type StoredGrade } from "@/lib/reports/grade-storage";
import { inputFromReadingsRow } from "@/lib/reports/readings-row";
import type { AssemblyKind, FieldTestInput, SuspiciousSignal, ValidityIssue } from "@/lib/rules";

export interface AssemblySnapshot {
  kind: AssemblyKind;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  hazard: string;
  siteName: string;
  address: string;
  accountNumber: string;
  /** Kept by reports filed through the field-test form (older snapshots lack them). */
  contactName?: string;
  contactPhone?: string;
  installedOn?: string | null;
  status?: string;
}

export interface TesterSnapshot {
  name: string;
  company: string | null;
  certifyingBody: string;
  certificationNumber: string;
  certificationExpiresOn: string;
}

export interface KitSnapshot {
  make: string;
  model: string;
  serial: string;
  lastVerifiedOn: string;
}

/** Everything one report says, for its page and its PDF. No internal ids of other people. */
export interface ReportDetail {
  id: number;
  programId: number;
  programName: string;
  reportNumber: string;
  revision: number;
  supersedesId: number | null;
  amendsId: number | null;
  status: ReportStatus;
  assemblyId: number;
  siteId: number;
  testerId: number;
  testedAt: string;
  testedOn: string;
  reason: string;
  reasonNote: string;
  installation: string;
  previousSerial: string;
  orientationApproved: boolean | null;
  reliefPortAirGapOk: boolean | null;
  linePressurePsi: number | null;
  unit: "psid" | "kPa";
  ruleSetEdition: string;
  ruleSetLabel: string;
  remarks: string | null;
  assembly: AssemblySnapshot;
  tester: TesterSnapshot;
  kit: KitSnapshot | null;
  initial: FieldTestInput;
  retest: FieldTestInput | null;
  grade: { outcome: string; passedAfterRepair: boolean; initial: DisplayPhase; retest?: DisplayPhase };
  initialOutcome: "pass" | "fail" | "incomplete";
  finalOutcome: "pass" | "fail";
  wasRepaired: boolean;
  repairs: { component: string; part: string; action: string; note: string }[];
  validity: ValidityIssue[];
  signals: SuspiciousSignal[];
  attestedName: string;
  attestedAt: string;
  submittedAt: string;
  verificationCode: string;
  feeCents: number;
  feeCurrency: string;
  feeStatus: string;
  decision: { decision: "accepted" | "returned"; reasons: string[]; note: string | null; decidedAt: string; inspectorName: string } | null;
  certificate: { code: string; issuedAt: string } | null;
}

/**
 * Whether this actor may see this report: the tester who filed it, the staff of its program,
 * or an owner of its site. Everyone else is told "not found".
 */
export async function canActorSeeReport(executor: Executor, actor: Actor, report: { testerId: number; programId: number; assemblyId: number }): Promise<boolean> {
  switch (actor.role) {
    case "tester":
      return report.testerId === actor.id;
    case "inspector":
    case "admin":
      return actor.programId === report.programId;
    case "owner": {
      const [link] = await executor
        .select({ siteId: siteOwners.siteId })
        .from(assemblies)
        .innerJoin(siteOwners, eq(siteOwners.siteId, assemblies.siteId))
        .innerJoin(owners, eq(owners.id, siteOwners.ownerId))
        .where(and(eq(assemblies.id, report.assemblyId), eq(owners.userId, actor.id)))
        .limit(1);
      return Boolean(link);
    }
  }
}

export async function getReportDetail(actor: Actor, reportId: number): Promise<ReportDetail> {
  const db = getDb();
  const [row] = await db
    .select({ report: testReports, programName: programs.name, siteId: assemblies.siteId })
    .from(testReports)
    .innerJoin(programs, eq(programs.id, testReports.programId))
    .innerJoin(assemblies, eq(assemblies.id, testReports.assemblyId))
    .where(eq(testReports.id, reportId))
    .limit(1);
  if (!row || !(await canActorSeeReport(db, actor, row.report))) throw new NotFoundError("No such report.");
  const r = row.report;
  const [phases, repairs, [decision], [certificate], locals] = await Promise.all([
    db.select().from(reportReadings).where(eq(reportReadings.reportId, r.id)),
    db.select({ component: reportRepairs.component, part: reportRepairs.part, action: reportRepairs.action, note: reportRepairs.note }).from(reportRepairs).where(eq(reportRepairs.reportId, r.id)).orderBy(asc(reportRepairs.id)),
    db
      .select({ decision: reviews.decision, reasons: reviews.reasons, note: reviews.note, decidedAt: reviews.decidedAt, inspectorName: users.name })
      .from(reviews)
      .innerJoin(users, eq(users.id, reviews.inspectorId))
      .where(eq(reviews.reportId, r.id))
      .limit(1),
    db.select({ code: certificates.code, issuedAt: certificates.issuedAt, supersededAt: certificates.supersededAt }).from(certificates).where(eq(certificates.reportId, r.id)).orderBy(desc(certificates.issuedAt)).limit(1),
    db.select({ edition: localRuleSets.edition, data: localRuleSets.data }).from(localRuleSets).where(eq(localRuleSets.programId, r.programId)),
  ]);
  const assembly = r.assemblySnapshot as AssemblySnapshot;
  const ruleSet = ruleSetForEdition(r.ruleSetEdition, locals);
  const initialRow = phases.find((p) => p.phase === "initial");
  const retestRow = phases.find((p) => p.phase === "retest");
  return {
    id: r.id,
    programId: r.programId,
    programName: row.programName,
    reportNumber: r.reportNumber,
    revision: r.revision,
    supersedesId: r.supersedesId,
    amendsId: r.amendsId,
    status: r.status,
    assemblyId: r.assemblyId,
    siteId: row.siteId,
    testerId: r.testerId,
    testedAt: r.testedAt.toISOString().slice(0, 16).replace("T", " "),
    testedOn: r.testedOn,
    reason: r.reason,
    reasonNote: r.reasonNote,
    installation: r.installation,
    previousSerial: r.previousSerial,
    orientationApproved: r.orientationApproved,
    reliefPortAirGapOk: r.reliefPortAirGapOk,
    linePressurePsi: r.linePressurePsi,
    unit: r.unit,
    ruleSetEdition: r.ruleSetEdition,
    ruleSetLabel: ruleSet.edition === r.ruleSetEdition ? ruleSet.label : r.ruleSetEdition,
    remarks: r.remarks,
    assembly,
    tester: r.testerSnapshot as TesterSnapshot,
    kit: (r.kitSnapshot as KitSnapshot | null) ?? null,
    initial: inputFromReadingsRow(assembly.kind, r.unit, initialRow ?? {}),
    retest: retestRow ? inputFromReadingsRow(assembly.kind, r.unit, retestRow) : null,
    grade: expandGrade(r.grade as StoredGrade, ruleSet),
    initialOutcome: r.initialOutcome,
    finalOutcome: r.finalOutcome,
    wasRepaired: r.wasRepaired,
    repairs,
    validity: (r.validity as ValidityIssue[]) ?? [],
    signals: (r.signals as SuspiciousSignal[]) ?? [],
    attestedName: r.attestedName,
    attestedAt: r.attestedAt.toISOString(),
    submittedAt: r.submittedAt.toISOString(),
    verificationCode: r.verificationCode,
    feeCents: r.feeCents,
    feeCurrency: r.feeCurrency,
    feeStatus: r.feeStatus,
    decision: decision ? { decision: decision.decision, reasons: (decision.reasons as string[]) ?? [], note: decision.note, decidedAt: decision.decidedAt.toISOString(), inspectorName: decision.inspectorName } : null,
    certificate: certificate && !certificate.supersededAt ? { code: certificate.code, issuedAt: certificate.issuedAt.toISOString() } : null,
  };
}
