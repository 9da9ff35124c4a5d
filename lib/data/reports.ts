import "server-only";
import { and, desc, eq, gte, inArray, lt, lte, ne, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { assemblies, certifications, companies, reportDrafts, reportNumberSequences, reportReadings, reportRepairs, sites, testKits, testReports } from "@/db/schema";
import { generateReadableCode } from "@/lib/auth/tokens";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { ConflictError, InputError, isDuplicateKey, NotFoundError, type FieldErrors } from "@/lib/errors";
import { inputFromSubmission, isSameName } from "@/lib/forms/field-test-draft";
import { readingFieldsFor } from "@/lib/forms/readings";
import { componentLabels, componentsFor, partLabels, partsByComponent } from "@/lib/forms/repairs";
import type { ReportSubmission, SubmittedReadings } from "@/lib/forms/report-submission";
import { storeGrade } from "@/lib/reports/grade-storage";
import { readingsRowFromInput } from "@/lib/reports/readings-row";
import {
  checkReportValidity,
  defaultSignalOptions,
  detectSuspiciousSignals,
  familyOf,
  fieldLabels,
  gradeFieldTest,
  gradeReport,
  isReportValid,
  kpaToPsid,
  readingFingerprint,
  ReadingValidationError,
  type AssemblyKind,
  type FieldTestField,
  type FieldTestInput,
  type Grade,
  type ValidityIssue,
} from "@/lib/rules";
import { recordAudit } from "./audit";
import { recomputeAssemblyFacts } from "./assembly-facts";
import type { AssemblySnapshot, KitSnapshot, TesterSnapshot } from "./report-detail";
import { prefixPattern } from "./assemblies-search";
import { requireApprovedProgram, type TesterProgram } from "./tester-programs";

export interface SubmittedReport {
  id: number;
  reportNumber: string;
  revision: number;
  status: (typeof testReports.$inferSelect)["status"];
  finalOutcome: "pass" | "fail";
  /** true when this idempotency key had already filed the report: nothing new was written. */
  isReplay: boolean;
}

/** Statuses whose test stands in the record (a returned or superseded revision does not). */
const standingStatuses = ["awaiting_fee", "queued", "accepted"] as const;

async function findByIdempotencyKey(testerId: number, key: string): Promise<SubmittedReport | null> {
  const [row] = await getDb()
    .select({ id: testReports.id, reportNumber: testReports.reportNumber, revision: testReports.revision, status: testReports.status, finalOutcome: testReports.finalOutcome })
    .from(testReports)
    .where(and(eq(testReports.testerId, testerId), eq(testReports.idempotencyKey, key)))
    .limit(1);
  return row ? { ...row, isReplay: true } : null;
}

function isDeadlock(error: unknown): boolean {
  let current: unknown = error;
  for (let depth = 0; depth < 5 && current; depth++) {
    if ((current as { code?: unknown }).code === "ER_LOCK_DEADLOCK") return true;
    current = (current as { cause?: unknown }).cause;
  }
  return false;
}

/**
 * Files a field-test report in one transaction: the server grades it again with lib/rules and
 * keeps its own grade, checks the tester's certification and kit on the test date, looks for
 * suspicious signals, numbers it, snapshots the assembly, tester and kit, and recomputes the
 * assembly's facts. Idempotent: the same key (per tester) files one report, and a retry
 * answers with it.
 */
export async function submitReport(actor: Actor, input: ReportSubmission): Promise<SubmittedReport> {
  assertCan(actor, "reports.file");
  const earlier = await findByIdempotencyKey(actor.id, input.idempotencyKey);
  if (earlier) return earlier;
  for (let attempt = 1; ; attempt++) {
    try {
      return await getDb().transaction((tx) => fileReport(tx, actor, input));
    } catch (error) {
      if (isDuplicateKey(error)) {
        // A double tap: the other request filed it first with the same key.
        const filed = await findByIdempotencyKey(actor.id, input.idempotencyKey);
        if (filed) return filed;
        throw new ConflictError("Another filing for this report went first (a correction from another screen?): open My reports.", "already_filed");
      }
      // Two first reports of a year can deadlock creating the year's number row; the loser retries.
      if (isDeadlock(error) && attempt < 5) continue;
      throw error;
    }
  }
}

function fieldErrorPath(issue: ValidityIssue): string {
  switch (issue.field) {
    case "testDate":
      return "testedOn";
    case "certificationExpiresOn":
    case "certificationIssuedOn":
      return "certification";
    case "kitVerifiedOn":
      return "kitId";
    case "linePressurePsi":
      return "linePressure";
    case "submittedOn":
      return "testedOn";
    case undefined:
      return "_";
    default:
      return issue.field.startsWith("retest.") ? issue.field : `initial.${issue.field}`;
  }
}

/** Grades one phase; a reading no gauge could give becomes a field message. */
function gradePhaseOrThrow(phase: "initial" | "retest", input: FieldTestInput, ruleSet: TesterProgram["ruleSet"]): Grade {
  try {
    return gradeFieldTest(input, ruleSet);
  } catch (error) {
    if (error instanceof ReadingValidationError) {
      const label = fieldLabels[error.field as FieldTestField] ?? error.field;
      throw new InputError(`${label}: ${error.message}`, { [`${phase}.${error.field}`]: [error.message] });
    }
    throw error;
  }
}

function checkPhaseFieldsOrThrow(phase: "initial" | "retest", kind: AssemblyKind, readings: SubmittedReadings, ruleSet: TesterProgram["ruleSet"]): void {
  const allowed = new Set<string>(readingFieldsFor(kind, ruleSet).map((spec) => spec.field));
  const errors: FieldErrors = {};
  for (const [field, value] of Object.entries(readings)) {
    if (value === undefined) continue;
    if (!allowed.has(field)) errors[`${phase}.${field}`] = [`A ${kind} test does not record "${fieldLabels[field as FieldTestField] ?? field}".`];
    else if (value === "did_not_open" && field !== "reliefValveOpeningPoint" && field !== "airInletOpeningPoint") errors[`${phase}.${field}`] = ["Only an opening point can be recorded as not opening."];
  }
  const first = Object.values(errors)[0];
  if (first) throw new InputError(first[0]!, errors);
}

function missingOrThrow(phase: "initial" | "retest", grade: Grade): void {
  if (grade.missing.length === 0) return;
  const errors: FieldErrors = {};
  for (const field of grade.missing) errors[`${phase}.${field}`] = [field === "reliefValveOpeningPoint" || field === "airInletOpeningPoint" ? 'Enter the opening point, or record that it did not open.' : "This reading is missing."];
  const names = grade.missing.map((field) => fieldLabels[field as FieldTestField] ?? field).join(", ");
  throw new InputError(`The ${phase === "initial" ? "initial test" : "retest"} is missing: ${names}.`, errors);
}

function checkRepairsOrThrow(kind: AssemblyKind, repairs: ReportSubmission["repairs"]): void {
  const allowed = new Set(componentsFor(kind));
  const errors: FieldErrors = {};
  const seen = new Set<string>();
  repairs.forEach((repair, index) => {
    const path = `repairs.${index}`;
    if (!allowed.has(repair.component)) errors[path] = [`A ${kind} has no ${componentLabels[repair.component]}.`];
    else if (!partsByComponent[repair.component].includes(repair.part)) errors[path] = [`${partLabels[repair.part]} is not a part of the ${componentLabels[repair.component].toLowerCase()}.`];
    else if (repair.part === "other" && repair.note === "" && !repairs.some((r) => r.component === repair.component && r.note !== "")) errors[path] = ["Say which part in the note."];
    else if (seen.has(`${repair.component}/${repair.part}`)) errors[path] = [`${componentLabels[repair.component]}: ${partLabels[repair.part]} is listed twice.`];
    seen.add(`${repair.component}/${repair.part}`);
  });
  const first = Object.values(errors)[0];
  if (first) throw new InputError(first[0]!, errors);
}

/**
 * The next number of the program's year. The year's row is locked for the rest of the
 * transaction, so concurrent submissions queue for it and each gets its own number (call it as
 * late in the transaction as possible: the lock is the one every submission shares); the first
 * number of a year starts above any already used (history loaded before this table existed).
 */
async function allocateReportNumber(tx: Transaction, program: TesterProgram, year: number): Promise<string> {
  const prefix = `${program.reportPrefix}-${year}-`;
  const where = and(eq(reportNumberSequences.programId, program.id), eq(reportNumberSequences.year, year));
  // One statement takes the next number and locks the row: LAST_INSERT_ID(expr) hands the new
  // value back in the statement's answer, so the locked stretch is a statement shorter.
  const takeNext = async () => {
    const [result] = await tx.update(reportNumberSequences).set({ lastNumber: sql`LAST_INSERT_ID(${reportNumberSequences.lastNumber} + 1)` }).where(where);
    return result.affectedRows === 1 ? Number(result.insertId) : null;
  };
  let next = await takeNext();
  if (next === null) {
    const [highest] = await tx
      .select({ reportNumber: testReports.reportNumber })
      .from(testReports)
      .where(sql`${testReports.reportNumber} LIKE ${prefixPattern(prefix)}`)
      .orderBy(desc(testReports.reportNumber))
      .limit(1);
    const floor = highest ? Number.parseInt(highest.reportNumber.slice(prefix.length), 10) || 0 : 0;
    await tx.insert(reportNumberSequences).ignore().values({ programId: program.id, year, lastNumber: floor });
    next = await takeNext();
    if (next === null) throw new Error(`The report number row for ${prefix} could not be created.`);
  }
  return `${prefix}${String(next).padStart(6, "0")}`;
}

async function fileReport(tx: Transaction, actor: Actor, input: ReportSubmission): Promise<SubmittedReport> {
  // The assembly is locked first: two reports for one assembly file one after the other.
  const [assembly] = await tx
    .select({ assembly: assemblies, site: sites })
    .from(assemblies)
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .where(eq(assemblies.id, input.assemblyId))
    .for("update");
  if (!assembly) throw new NotFoundError("No such assembly in the programs you test for.");
  const program = await requireApprovedProgram(actor, assembly.assembly.programId, tx);
  const { assembly: a, site } = assembly;
  const kind = a.kind;
  const isAirGap = familyOf(kind) === "ag";
  const unit = isAirGap ? "psid" : program.units;
  if (!isAirGap && input.unit !== program.units) {
    throw new InputError(`${program.name} records readings in ${program.units}; the form sent ${input.unit}. Reload the form and enter the readings again.`, { unit: [`Readings must be in ${program.units}.`] });
  }
  if ((a.status === "removed" || a.status === "replaced") && (a.removedOn === null || input.testedOn > a.removedOn)) {
    throw new InputError(`This assembly was taken out of service${a.removedOn ? ` on ${a.removedOn}` : ""}: a test after that cannot be filed.`, { testedOn: ["The assembly was out of service on this date."] });
  }

  // A correction replaces a returned revision; an amendment follows an accepted report.
  let basis: { id: number; reportNumber: string; revision: number } | null = null;
  const basisId = input.correctsReportId ?? input.amendsReportId;
  if (basisId !== null) {
    const [row] = await tx
      .select({ id: testReports.id, reportNumber: testReports.reportNumber, revision: testReports.revision, status: testReports.status, assemblyId: testReports.assemblyId })
      .from(testReports)
      .where(and(eq(testReports.id, basisId), eq(testReports.testerId, actor.id)))
      .for("update");
    if (!row) throw new NotFoundError("No such report.");
    if (row.assemblyId !== a.id) throw new InputError("The report being corrected is for another assembly.", { assemblyId: ["The corrected report must be for the same assembly."] });
    if (input.correctsReportId !== null && row.status !== "returned") throw new ConflictError(row.status === "superseded" ? "This report has already been corrected: open the newest revision." : `Only a returned report can be corrected; this one is ${row.status.replace("_", " ")}.`, "not_returned");
    if (input.amendsReportId !== null && row.status !== "accepted") throw new ConflictError("Only an accepted report is amended; a returned one is corrected instead.", "not_accepted");
    basis = row;
  }

  const [kit] = await tx.select().from(testKits).where(and(eq(testKits.id, input.kitId), eq(testKits.testerId, actor.id))).limit(1);
  if (!kit) throw new InputError("Pick one of your own test kits.", { kitId: ["Pick one of your own test kits."] });
  if (kit.retiredAt) throw new InputError("That kit is retired: pick the kit you used, or add it again.", { kitId: ["That kit is retired."] });
  if (kit.verificationResult === "failed") throw new InputError("That kit failed its last accuracy check: it cannot be used until it passes one.", { kitId: ["The kit failed its last accuracy check."] });

  // The certification that covers the test date, else the latest one (so the message names it).
  const certs = await tx.select().from(certifications).where(eq(certifications.testerId, actor.id)).orderBy(desc(certifications.expiresOn));
  const cert = certs.find((c) => (c.issuedOn === null || c.issuedOn <= input.testedOn) && c.expiresOn >= input.testedOn) ?? certs[0] ?? null;

  checkPhaseFieldsOrThrow("initial", kind, input.initial, program.ruleSet);
  if (input.retest) checkPhaseFieldsOrThrow("retest", kind, input.retest, program.ruleSet);
  const initial = inputFromSubmission(kind, unit, input.initial);
  const retest = input.retest ? inputFromSubmission(kind, unit, input.retest) : null;
  const initialGrade = gradePhaseOrThrow("initial", initial, program.ruleSet);
  missingOrThrow("initial", initialGrade);
  if (initialGrade.outcome === "pass" && (retest || input.repairs.length)) {
    throw new InputError("The initial test passed: repairs and a retest are recorded only after a failed test.", { repairs: ["Repairs follow a failed initial test only."] });
  }
  if (retest) {
    missingOrThrow("retest", gradePhaseOrThrow("retest", retest, program.ruleSet));
    checkRepairsOrThrow(kind, input.repairs);
  }
  const grade = gradeReport({ initial, retest, ruleSet: program.ruleSet });

  if (!isAirGap && input.linePressure === null) throw new InputError("Enter the line pressure.", { linePressure: ["Enter the line pressure."] });
  const linePressurePsi = input.linePressure === null ? null : Math.round((unit === "kPa" ? kpaToPsid(input.linePressure) : input.linePressure) * 10) / 10;
  if (!isSameName(input.attestation.name, actor.name)) {
    throw new InputError(`Sign with your name as it is on your account: ${actor.name}.`, { "attestation.name": [`Type your name as it is on your account: ${actor.name}.`] });
  }

  const validity = checkReportValidity({
    testDate: input.testedOn,
    today: program.today,
    certificationExpiresOn: cert?.expiresOn ?? null,
    certificationIssuedOn: cert?.issuedOn ?? null,
    kitVerifiedOn: kit.lastVerifiedOn,
    installedOn: a.installedOn,
    removedOn: a.removedOn,
    submittedOn: program.today,
    reportDeadlineDays: program.settings.reportDeadlineDays,
    input: initial,
    retest,
    linePressurePsi: isAirGap ? undefined : linePressurePsi,
    ruleSet: program.ruleSet,
    kitPolicy: program.kitPolicy,
  });
  if (!isReportValid(validity)) {
    const errors: FieldErrors = {};
    for (const issue of validity.filter((i) => i.severity === "error")) (errors[fieldErrorPath(issue)] ??= []).push(issue.message);
    throw new InputError(validity.find((i) => i.severity === "error")!.message, errors);
  }

  // Signal context, each list by one indexed look-up. testedAt is the local wall-clock time the
  // tester typed, kept naive; it is compared only with the same tester's other naive times.
  const final = retest ?? initial;
  const fingerprint = readingFingerprint(final);
  const testedAt = new Date(`${input.testedOn}T${input.testedTime}:00Z`);
  const windowMs = defaultSignalOptions.burstWindowMinutes * 60_000;
  const excluded = basis ? ne(testReports.id, basis.id) : undefined;
  // The tester's other tests near this one and on the same day come from one range: the span
  // covering both the burst window around the test and its whole day.
  const burstFrom = testedAt.getTime() - windowMs;
  const burstTo = testedAt.getTime() + windowMs;
  const dayFrom = new Date(`${input.testedOn}T00:00:00Z`).getTime();
  const dayTo = dayFrom + 86_400_000;
  const [[previous], testerTests] = await Promise.all([
    tx
      .select({ testedOn: testReports.testedOn, fingerprint: testReports.fingerprint })
      .from(testReports)
      .where(and(eq(testReports.assemblyId, a.id), lte(testReports.testedOn, input.testedOn), inArray(testReports.status, standingStatuses), excluded))
      .orderBy(desc(testReports.testedOn), desc(testReports.submittedAt))
      .limit(1),
    tx
      .select({ reportId: testReports.id, assemblyId: testReports.assemblyId, fingerprint: testReports.fingerprint, testedAt: testReports.testedAt })
      .from(testReports)
      .where(and(eq(testReports.testerId, actor.id), gte(testReports.testedAt, new Date(Math.min(burstFrom, dayFrom))), lt(testReports.testedAt, new Date(Math.max(burstTo + 1, dayTo))), inArray(testReports.status, standingStatuses), excluded))
      .limit(700),
  ]);
  const nearby = testerTests.filter((t) => t.testedAt.getTime() >= burstFrom && t.testedAt.getTime() <= burstTo).slice(0, 200);
  const sameDay = testerTests.filter((t) => t.testedAt.getTime() >= dayFrom && t.testedAt.getTime() < dayTo).slice(0, 500);
  // Certification and kit validity are already in the validity findings: not repeated as signals.
  const signals = detectSuspiciousSignals(
    { assemblyId: a.id, testedOn: input.testedOn, testedAt: testedAt.toISOString(), input: final },
    {
      previousTest: previous ?? null,
      testerNearbyTests: nearby.map((n) => ({ reportId: n.reportId, testedAt: n.testedAt.toISOString() })),
      testerSameDayReports: sameDay.map((t) => ({ reportId: t.reportId, assemblyId: t.assemblyId, fingerprint: t.fingerprint })),
      options: { kitVerificationMaxMonths: program.ruleSet.kit.verificationMaxMonths },
    },
  );

  const [company] = actor.companyId ? await tx.select({ name: companies.name }).from(companies).where(eq(companies.id, actor.companyId)).limit(1) : [];
  const assemblySnapshot: AssemblySnapshot = {
    kind,
    make: a.make,
    model: a.model,
    size: a.size,
    serial: a.serial,
    location: a.location,
    hazard: a.hazard,
    siteName: site.name,
    address: `${site.addressLine1}${site.addressLine2 ? `, ${site.addressLine2}` : ""}, ${site.city}`,
    accountNumber: site.accountNumber,
    contactName: site.contactName,
    contactPhone: site.contactPhone,
    installedOn: a.installedOn,
    status: a.status,
  };
  const testerSnapshot: TesterSnapshot = { name: actor.name, company: company?.name ?? null, certifyingBody: cert?.certifyingBody ?? "", certificationNumber: cert?.number ?? "", certificationExpiresOn: cert?.expiresOn ?? "" };
  const kitSnapshot: KitSnapshot = { make: kit.make, model: kit.model, serial: kit.serial, lastVerifiedOn: kit.lastVerifiedOn };

  const feeCents = program.settings.filingFeeCents;
  const status = feeCents > 0 ? "awaiting_fee" : "queued";
  const finalOutcome = grade.outcome === "pass" ? "pass" : "fail";
  const warningCount = validity.length + signals.length;
  // A correction keeps the returned report's number, with the next revision.
  const corrected = input.correctsReportId !== null ? basis : null;
  const revision = corrected ? corrected.revision + 1 : 1;
  // Unguessable, printed on the report so the program can confirm a paper copy is genuine.
  const verificationCode = generateReadableCode(16);
  // A new report's number is taken last, just before commit (see below): until then the row
  // carries a stand-in unique to it, seen by no other transaction.
  const provisionalNumber = corrected ? corrected.reportNumber : `~${verificationCode}`;
  const now = new Date();
  const [inserted] = await tx
    .insert(testReports)
    .values({
      programId: program.id,
      reportNumber: provisionalNumber,
      revision,
      supersedesId: input.correctsReportId,
      amendsId: input.amendsReportId,
      assemblyId: a.id,
      testerId: actor.id,
      kitId: kit.id,
      certificationId: cert?.id ?? null,
      status,
      assemblyKind: a.kind,
      testedAt,
      testedOn: input.testedOn,
      reason: input.reason,
      reasonNote: input.reasonNote,
      installation: input.installation,
      previousSerial: input.previousSerial,
      orientationApproved: input.orientationApproved,
      reliefPortAirGapOk: familyOf(kind) === "rp" ? input.reliefPortAirGapOk : null,
      linePressurePsi,
      unit,
      ruleSetEdition: program.ruleSet.edition,
      remarks: input.remarks || null,
      assemblySnapshot,
      testerSnapshot,
      kitSnapshot,
      initialOutcome: grade.initial.outcome,
      finalOutcome,
      wasRepaired: input.repairs.length > 0,
      grade: storeGrade(grade),
      validity,
      signals,
      warningCount,
      isClean: finalOutcome === "pass" && warningCount === 0,
      fingerprint,
      attestedName: input.attestation.name,
      attestedAt: now,
      submittedAt: now,
      idempotencyKey: input.idempotencyKey,
      feeCents,
      feeCurrency: program.settings.currency,
      feeStatus: feeCents > 0 ? "owed" : "none",
      verificationCode,
      createdAt: now,
      updatedAt: now,
    })
    .$returningId();
  const reportId = inserted!.id;
  await tx.insert(reportReadings).values({ reportId, phase: "initial", outcome: grade.initial.outcome, ...readingsRowFromInput(initial) });
  if (retest && grade.retest) await tx.insert(reportReadings).values({ reportId, phase: "retest", outcome: grade.retest.outcome, ...readingsRowFromInput(retest) });
  if (input.repairs.length) await tx.insert(reportRepairs).values(input.repairs.map((r) => ({ reportId, component: r.component, part: r.part, action: r.action, note: r.note })));
  if (basis && input.correctsReportId !== null) {
    await tx.update(testReports).set({ status: "superseded", updatedAt: now }).where(and(eq(testReports.id, basis.id), eq(testReports.status, "returned")));
    await recordAudit(tx, { programId: program.id, actorId: actor.id, action: "report.superseded", entityType: "test_report", entityId: basis.id, before: { status: "returned" }, after: { status: "superseded", supersededBy: reportId } });
  }
  if (input.draftKey) await tx.delete(reportDrafts).where(and(eq(reportDrafts.testerId, actor.id), eq(reportDrafts.clientKey, input.draftKey)));
  // The assembly's row was locked at the start of this transaction and the settings read with the program.
  await recomputeAssemblyFacts(tx, a.id, { assembly: a, settings: program.settings });
  // The year's number row stays locked from here to commit, so concurrent submissions queue for
  // it: taking it last keeps that queue short (numbers stay consecutive, with no gaps).
  const reportNumber = corrected ? corrected.reportNumber : await allocateReportNumber(tx, program, Number(input.testedOn.slice(0, 4)));
  if (!corrected) await tx.update(testReports).set({ reportNumber }).where(eq(testReports.id, reportId));
  await recordAudit(tx, {
    programId: program.id,
    actorId: actor.id,
    action: "report.submitted",
    entityType: "test_report",
    entityId: reportId,
    after: { reportNumber, revision, status, finalOutcome, warningCount, supersedesId: input.correctsReportId, amendsId: input.amendsReportId, assemblyId: a.id },
  });
  return { id: reportId, reportNumber, revision, status, finalOutcome, isReplay: false };
}
