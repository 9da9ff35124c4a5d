import "server-only";
import { and, desc, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { assemblies, certifications, sites, testKits } from "@/db/schema";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { ConflictError, NotFoundError } from "@/lib/errors";
import { newDraft, type FieldTestDraft } from "@/lib/forms/field-test-draft";
import { phaseFromInput } from "@/lib/forms/readings";
import { repairDraftsFromRows } from "@/lib/forms/repairs";
import type { TestReason } from "@/lib/forms/report-submission";
import { psidToKpa, type AssemblyKind, type Hazard, type RuleSet } from "@/lib/rules";
import { formatTagNumber } from "./assemblies-search";
import { getReportDetail } from "./report-detail";
import { requireApprovedProgram } from "./tester-programs";

/** Everything the field-test form needs, as plain data for the browser. */
export interface FieldTestContext {
  assembly: {
    id: number;
    tagNumber: string;
    kind: AssemblyKind;
    make: string;
    model: string;
    size: string;
    serial: string;
    location: string;
    hazard: Hazard;
    status: "active" | "awaiting_confirmation" | "removed" | "replaced";
    installedOn: string | null;
    removedOn: string | null;
    lastTestedOn: string | null;
    lastOutcome: "pass" | "fail" | null;
    nextDueOn: string | null;
    repairDueOn: string | null;
    site: { name: string; addressLine1: string; city: string; accountNumber: string; contactName: string; contactPhone: string };
  };
  program: {
    id: number;
    name: string;
    shortName: string;
    timezone: string;
    today: string;
    units: "psid" | "kPa";
    kitPolicy: "refuse" | "flag";
    ruleSet: RuleSet;
    repairDays: number;
    filingFeeCents: number;
    currency: string;
  };
  tester: { id: number; name: string; certification: { certifyingBody: string; number: string; issuedOn: string | null; expiresOn: string } | null };
  kits: { id: number; make: string; model: string; serial: string; lastVerifiedOn: string; verificationResult: "passed" | "adjusted" | "failed" }[];
  /** A returned report being corrected, or an accepted one being amended. */
  basis: {
    kind: "correction" | "amendment";
    reportId: number;
    reportNumber: string;
    revision: number;
    reasons: string[];
    note: string | null;
    prefill: FieldTestDraft;
  } | null;
  /** The reason a new test is most likely for. */
  suggestedReason: TestReason;
}

/**
 * The form's context for a new test of an assembly, or for correcting a returned report or
 * amending an accepted one. The tester must be approved in the assembly's program.
 */
export async function getFieldTestContext(actor: Actor, target: { assemblyId?: number; correctsReportId?: number; amendsReportId?: number }): Promise<FieldTestContext> {
  assertCan(actor, "reports.file");
  const basisId = target.correctsReportId ?? target.amendsReportId;
  const report = basisId ? await getReportDetail(actor, basisId) : null;
  if (report && report.testerId !== actor.id) throw new NotFoundError("No such report.");
  if (report && target.correctsReportId) {
    if (report.status === "superseded") throw new ConflictError("This report has already been corrected: open its newest revision.", "superseded");
    if (report.status !== "returned") throw new ConflictError(report.status === "accepted" ? "This report was accepted: file an amendment instead." : "This report is waiting for review: it can be corrected only if the inspector returns it.", "not_returned");
  }
  if (report && target.amendsReportId && report.status !== "accepted") throw new ConflictError("Only an accepted report is amended.", "not_accepted");
  const assemblyId = report?.assemblyId ?? target.assemblyId;
  if (!assemblyId) throw new NotFoundError("No such assembly.");
  const db = getDb();
  const [row] = await db.select({ assembly: assemblies, site: sites }).from(assemblies).innerJoin(sites, eq(sites.id, assemblies.siteId)).where(eq(assemblies.id, assemblyId)).limit(1);
  if (!row) throw new NotFoundError("No such assembly in the programs you test for.");
  const program = await requireApprovedProgram(actor, row.assembly.programId);
  const [[cert], kits] = await Promise.all([
    db.select().from(certifications).where(eq(certifications.testerId, actor.id)).orderBy(desc(certifications.expiresOn)).limit(1),
    db
      .select({ id: testKits.id, make: testKits.make, model: testKits.model, serial: testKits.serial, lastVerifiedOn: testKits.lastVerifiedOn, verificationResult: testKits.verificationResult })
      .from(testKits)
      .where(and(eq(testKits.testerId, actor.id), isNull(testKits.retiredAt)))
      .orderBy(desc(testKits.lastVerifiedOn)),
  ]);
  const a = row.assembly;
  const s = row.site;
  const unit = program.units;
  let basis: FieldTestContext["basis"] = null;
  if (report) {
    const time = report.testedAt.slice(11, 16);
    // Both start from what was filed: a correction fixes it, an amendment records what changed.
    const prefill = newDraft({
      assemblyId: a.id,
      kind: a.kind,
      unit,
      testedOn: report.testedOn,
      testedTime: time,
      kitId: report.kit ? (kits.find((k) => k.serial === report.kit!.serial)?.id ?? null) : null,
      reason: report.reason as TestReason,
      correctsReportId: target.correctsReportId ?? null,
      amendsReportId: target.amendsReportId ?? null,
    });
    prefill.reasonNote = report.reasonNote;
    prefill.installation = report.installation as FieldTestDraft["installation"];
    prefill.previousSerial = report.previousSerial;
    prefill.orientationApproved = report.orientationApproved;
    prefill.reliefPortAirGapOk = report.reliefPortAirGapOk;
    prefill.linePressure = report.linePressurePsi === null ? "" : unit === "kPa" ? String(Math.round(psidToKpa(report.linePressurePsi))) : String(report.linePressurePsi);
    prefill.initial = phaseFromInput(report.initial);
    if (report.retest) {
      prefill.repairChoice = "repaired";
      prefill.retest = phaseFromInput(report.retest);
      prefill.repairs = repairDraftsFromRows(report.repairs);
    } else if (report.initialOutcome === "fail") prefill.repairChoice = "not_repaired";
    prefill.remarks = report.remarks ?? "";
    basis = {
      kind: target.correctsReportId ? "correction" : "amendment",
      reportId: report.id,
      reportNumber: report.reportNumber,
      revision: report.revision,
      reasons: report.decision?.reasons ?? [],
      note: report.decision?.note ?? null,
      prefill,
    };
  }
  const settings = program.settings;
  return {
    assembly: {
      id: a.id,
      tagNumber: formatTagNumber(program.reportPrefix, a.id),
      kind: a.kind,
      make: a.make,
      model: a.model,
      size: a.size,
      serial: a.serial,
      location: a.location,
      hazard: a.hazard,
      status: a.status,
      installedOn: a.installedOn,
      removedOn: a.removedOn,
      lastTestedOn: a.lastTestedOn,
      lastOutcome: a.lastOutcome,
      nextDueOn: a.nextDueOn,
      repairDueOn: a.repairDueOn,
      site: { name: s.name, addressLine1: s.addressLine1, city: s.city, accountNumber: s.accountNumber, contactName: s.contactName, contactPhone: s.contactPhone },
    },
    program: {
      id: program.id,
      name: program.name,
      shortName: program.shortName,
      timezone: program.timezone,
      today: program.today,
      units: unit,
      kitPolicy: program.kitPolicy,
      ruleSet: program.ruleSet,
      repairDays: { severe: settings.repairDaysSevere, high: settings.repairDaysHigh, low: settings.repairDaysLow }[a.hazard],
      filingFeeCents: settings.filingFeeCents,
      currency: settings.currency,
    },
    tester: { id: actor.id, name: actor.name, certification: cert ? { certifyingBody: cert.certifyingBody, number: cert.number, issuedOn: cert.issuedOn, expiresOn: cert.expiresOn } : null },
    kits,
    basis,
    suggestedReason: a.lastTestedOn === null ? "installation" : a.lastOutcome === "fail" ? "repair" : "annual",
  };
}
