import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { assemblies, certificates, programs, programSettings, sites, testReports } from "@/db/schema";
import { assertNotThrottled, recordAttempt, throttleRules } from "@/lib/auth/throttle";
import { assertCan, type Actor } from "@/lib/auth/permissions";
import { getEnv } from "@/lib/env";
import { ConflictError, NotFoundError } from "@/lib/errors";
import { programRulesFromSettings, todayInZone } from "@/lib/programs/settings";
import { dueDateAfterPass } from "@/lib/rules";
import { recordAudit } from "./audit";
import { issueCertificate } from "./certificates";
import { canActorSeeReport, type AssemblySnapshot, type TesterSnapshot } from "./report-detail";
import { describeAssembly, formatCertificateCode, formatLongDate, kindWithCode, normalizeReadableCode, serialTail } from "./notices-format";

/** Certificate codes: 12 characters of the readable alphabet (lib/data/certificates.ts). */
export const CERTIFICATE_CODE_LENGTH = 12;

export function verifyUrlFor(code: string): string {
  return new URL(`/verify/${code}`, getEnv().APP_URL).toString();
}

async function loadCertificate(code: string) {
  const [row] = await getDb()
    .select({
      certificate: certificates,
      report: {
        id: testReports.id,
        programId: testReports.programId,
        assemblyId: testReports.assemblyId,
        testerId: testReports.testerId,
        reportNumber: testReports.reportNumber,
        status: testReports.status,
        testedOn: testReports.testedOn,
        initialOutcome: testReports.initialOutcome,
        finalOutcome: testReports.finalOutcome,
        wasRepaired: testReports.wasRepaired,
        decidedAt: testReports.decidedAt,
        assemblySnapshot: testReports.assemblySnapshot,
        testerSnapshot: testReports.testerSnapshot,
      },
      program: { name: programs.name, phone: programs.phone, mailingAddress: programs.mailingAddress, replyTo: programs.replyToEmail, timezone: programs.timezone },
      settings: programSettings,
      assembly: { status: assemblies.status, removedOn: assemblies.removedOn, lastTestedOn: assemblies.lastTestedOn, lastOutcome: assemblies.lastOutcome, nextDueOn: assemblies.nextDueOn, baseState: assemblies.baseState },
      site: { name: sites.name, addressLine1: sites.addressLine1, city: sites.city, accountNumber: sites.accountNumber },
    })
    .from(certificates)
    .innerJoin(testReports, eq(testReports.id, certificates.reportId))
    .innerJoin(programs, eq(programs.id, testReports.programId))
    .innerJoin(programSettings, eq(programSettings.programId, programs.id))
    .innerJoin(assemblies, eq(assemblies.id, testReports.assemblyId))
    .innerJoin(sites, eq(sites.id, assemblies.siteId))
    .where(eq(certificates.code, code))
    .limit(1);
  return row ?? null;
}

type CertificateRow = NonNullable<Awaited<ReturnType<typeof loadCertificate>>>;

/** The program's calendar day of a moment (an issue or decision time), as the program's staff would date it. */
function dayOf(row: CertificateRow, at: Date): string {
  return formatLongDate(todayInZone(row.program.timezone, at));
}

function dueAfterThisTest(row: CertificateRow): string {
  return dueDateAfterPass(row.report.testedOn, programRulesFromSettings(row.settings));
}

export type VerificationStatus = "current" | "lapsed" | "superseded" | "not_found";

/** What the public page shows: nothing private (no owner, no contact, no street address). */
export interface CertificateVerification {
  status: VerificationStatus;
  /** Why a genuine certificate no longer proves compliance, in plain words. */
  reason?: string;
  programName?: string;
  assemblyKind?: string;
  serialTail?: string;
  town?: string;
  testedOnWords?: string;
  nextDueOnWords?: string;
  issuedOnWords?: string;
  replacedOnWords?: string;
}

// Misses are what guessing looks like: each counts against the client (60 per 10 minutes, as
// for other look-ups). Without a trusted client address all clients share one, looser, count.
const sharedLookupRule = { limit: 600, windowMinutes: 10, lockMinutes: 10 };

/**
 * The public check of a certificate code. A wrong or malformed code is "not found" and nothing
 * else; a genuine one says whether it still proves compliance today. Throttled per client.
 */
export async function verifyCertificate(input: { code: string; address: string }): Promise<CertificateVerification> {
  const throttleKey = input.address === "direct" ? "verify:shared" : `verify-ip:${input.address}`;
  await assertNotThrottled([throttleKey]);
  const code = normalizeReadableCode(input.code, CERTIFICATE_CODE_LENGTH);
  const row = code ? await loadCertificate(code) : null;
  if (!row) {
    await recordAttempt(throttleKey, input.address === "direct" ? sharedLookupRule : throttleRules.lookup);
    return { status: "not_found" };
  }
  const snapshot = row.report.assemblySnapshot as AssemblySnapshot;
  const base = {
    programName: row.program.name,
    assemblyKind: kindWithCode(snapshot.kind),
    serialTail: serialTail(snapshot.serial ?? ""),
    town: row.site.city,
    testedOnWords: formatLongDate(row.report.testedOn),
    nextDueOnWords: formatLongDate(dueAfterThisTest(row)),
    issuedOnWords: dayOf(row, row.certificate.issuedAt),
  };
  if (row.certificate.supersededAt) return { status: "superseded", ...base, replacedOnWords: dayOf(row, row.certificate.supersededAt) };
  if (row.report.status !== "accepted" || row.report.finalOutcome !== "pass") {
    return { status: "lapsed", ...base, reason: "The report behind this certificate was replaced by a corrected report, so this certificate no longer stands on its own. Ask the owner for a current certificate." };
  }
  const today = todayInZone(row.program.timezone);
  const a = row.assembly;
  if (a.status !== "active") return { status: "lapsed", ...base, reason: `The assembly was taken out of service${a.removedOn ? ` on ${formatLongDate(a.removedOn)}` : ""}.` };
  if (a.lastTestedOn && a.lastTestedOn > row.report.testedOn) {
    return a.lastOutcome === "fail"
      ? { status: "lapsed", ...base, reason: `A later test, on ${formatLongDate(a.lastTestedOn)}, found the assembly failing. It must be repaired and pass a retest before it is in compliance again.` }
      : { status: "lapsed", ...base, reason: `A newer test, on ${formatLongDate(a.lastTestedOn)}, replaced this one. Ask the owner for the newer certificate.` };
  }
  const due = dueAfterThisTest(row);
  if (due < today) return { status: "lapsed", ...base, reason: `The next yearly test was due by ${formatLongDate(due)}, and no later passing test is on file.` };
  return { status: "current", ...base };
}

/** Everything the certificate PDF prints. */
export interface CertificateDocumentData {
  code: string;
  codeGrouped: string;
  verifyUrl: string;
  isSuperseded: boolean;
  programName: string;
  programPhone: string;
  programAddress: string;
  programEmail: string;
  site: { name: string; address: string; accountNumber: string };
  assembly: { description: string; kindLabel: string; make: string; model: string; size: string; serial: string; location: string };
  test: { reportNumber: string; testedOnWords: string; resultWords: string; acceptedOnWords: string | null; testerName: string; testerCompany: string | null; certifyingBody: string; certificationNumber: string };
  nextDueOnWords: string;
  issuedOnWords: string;
  fileName: string;
}

/**
 * A certificate for whoever may see its report (the site's owners, the program's staff, the
 * filing tester): anyone else, and any unknown code, is "not found". Replaced certificates
 * are for the program's staff only, and print as replaced.
 */
export async function getCertificateDocument(actor: Actor, rawCode: string): Promise<CertificateDocumentData> {
  const code = normalizeReadableCode(rawCode, CERTIFICATE_CODE_LENGTH);
  const row = code ? await loadCertificate(code) : null;
  if (!row || !code || !(await canActorSeeReport(getDb(), actor, row.report))) throw new NotFoundError("No such certificate.");
  const isStaff = actor.role === "inspector" || actor.role === "admin";
  if (row.certificate.supersededAt && !isStaff) throw new NotFoundError("This certificate was replaced by a newer one: download the current certificate from the assembly's page.");
  if (row.report.status !== "accepted" || row.report.finalOutcome !== "pass") throw new NotFoundError("No such certificate.");
  const snapshot = row.report.assemblySnapshot as AssemblySnapshot;
  const tester = (row.report.testerSnapshot ?? {}) as Partial<TesterSnapshot>;
  const resultWords = row.report.initialOutcome === "pass" ? "Passed" : row.report.wasRepaired ? "Passed after a repair on site (retest)" : "Passed on retest";
  return {
    code,
    codeGrouped: formatCertificateCode(code),
    verifyUrl: verifyUrlFor(code),
    isSuperseded: Boolean(row.certificate.supersededAt),
    programName: row.program.name,
    programPhone: row.program.phone,
    programAddress: row.program.mailingAddress,
    programEmail: row.program.replyTo,
    site: { name: row.site.name, address: `${row.site.addressLine1}, ${row.site.city}`, accountNumber: row.site.accountNumber },
    assembly: { description: describeAssembly(snapshot), kindLabel: kindWithCode(snapshot.kind), make: snapshot.make ?? "", model: snapshot.model ?? "", size: snapshot.size ?? "", serial: snapshot.serial ?? "", location: snapshot.location ?? "" },
    test: {
      reportNumber: row.report.reportNumber,
      testedOnWords: formatLongDate(row.report.testedOn),
      resultWords,
      acceptedOnWords: row.report.decidedAt ? dayOf(row, row.report.decidedAt) : null,
      testerName: tester.name ?? "",
      testerCompany: tester.company ?? null,
      certifyingBody: tester.certifyingBody ?? "",
      certificationNumber: tester.certificationNumber ?? "",
    },
    nextDueOnWords: formatLongDate(dueAfterThisTest(row)),
    issuedOnWords: dayOf(row, row.certificate.issuedAt),
    fileName: `certificate-${row.report.reportNumber}-${code}.pdf`,
  };
}

/**
 * The inspector re-issues a certificate (a new code; the old one then verifies as replaced),
 * e.g. after a copy was lost or misused. Only the current certificate of an accepted passing
 * report of the inspector's own program.
 */
export async function reissueCertificate(actor: Actor, rawCode: string): Promise<{ code: string }> {
  assertCan(actor, "certificates.reissue");
  const code = normalizeReadableCode(rawCode, CERTIFICATE_CODE_LENGTH);
  const row = code ? await loadCertificate(code) : null;
  if (!row || row.report.programId !== actor.programId) throw new NotFoundError("No such certificate in your program.");
  if (row.certificate.supersededAt) throw new ConflictError("This certificate was already replaced. Re-issue the current one instead.", "already_replaced");
  if (row.report.status !== "accepted" || row.report.finalOutcome !== "pass") throw new ConflictError("Only the certificate of an accepted passing test can be re-issued.", "not_reissuable");
  return getDb().transaction(async (tx) => {
    // Lock the certificate row: two inspectors pressing at once re-issue it once.
    const [locked] = await tx.select({ supersededAt: certificates.supersededAt }).from(certificates).where(eq(certificates.id, row.certificate.id)).for("update");
    if (!locked || locked.supersededAt) throw new ConflictError("This certificate was replaced a moment ago by someone else. Nothing was changed.", "already_replaced");
    const issued = await issueCertificate(tx, { reportId: row.report.id, issuedBy: actor.id });
    await recordAudit(tx, { programId: row.report.programId, actorId: actor.id, action: "certificate.reissued", entityType: "certificate", entityId: row.certificate.id, before: { code: row.certificate.code }, after: { code: issued.code } });
    return issued;
  });
}

/** For a signed-in inspector or admin on the public page: may they re-issue this one? */
export async function canReissue(actor: Actor | null, rawCode: string): Promise<boolean> {
  if (!actor || (actor.role !== "inspector" && actor.role !== "admin")) return false;
  const code = normalizeReadableCode(rawCode, CERTIFICATE_CODE_LENGTH);
  if (!code) return false;
  const [row] = await getDb()
    .select({ programId: testReports.programId })
    .from(certificates)
    .innerJoin(testReports, eq(testReports.id, certificates.reportId))
    .where(eq(certificates.code, code))
    .limit(1);
  return row?.programId === actor.programId;
}


