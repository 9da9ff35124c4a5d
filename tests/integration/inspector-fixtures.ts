// Rows the inspector- and admin-area tests create for themselves: a scratch program with its own
// staff (so counts and settings changes touch nobody else), sites, assemblies, testers and filed
// reports shaped like the submission code's. Unique names everywhere; no test needs another's rows.
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import { assemblies, certifications, owners, programSettings, programs, reportReadings, returnReasons, siteOwners, sites, testerApprovals, testKits, testReports, users } from "@/db/schema";
import { todayInZone } from "@/lib/programs/settings";
import { storeGrade } from "@/lib/reports/grade-storage";
import { readingsRowFromInput } from "@/lib/reports/readings-row";
import { addDays, addMonths, deriveAssemblyFacts, gradeReport, readingFingerprint, type FieldTestInput, type SuspiciousSignal, type ValidityIssue } from "@/lib/rules";
import { testDb } from "../helpers/db";
import { unique } from "../helpers/http";

export const ZONE = "Etc/GMT+6";
export const today = () => todayInZone(ZONE);

const letters = (n: number) => Array.from(randomBytes(n), (b) => String.fromCharCode(65 + (b % 26))).join("");

export async function userIdOf(email: string): Promise<number> {
  const [row] = await testDb().select({ id: users.id }).from(users).where(eq(users.email, email)).limit(1);
  if (!row) throw new Error(`no user ${email}`);
  return row.id;
}

export interface ScratchProgram {
  programId: number;
  name: string;
  adminEmail: string;
  inspectorEmail: string;
  inspector2Email: string;
}

/** A program of its own with an admin, two inspectors and the usual return reasons. */
export async function createScratchProgram(settings: Partial<typeof programSettings.$inferInsert> = {}): Promise<ScratchProgram> {
  const db = testDb();
  const now = new Date();
  const slug = unique("wren").toLowerCase();
  const name = `Wrenfield Water Board ${slug.slice(-6)}`;
  const [program] = await db
    .insert(programs)
    .values({ slug, name, shortName: "Wrenfield", reportPrefix: `W${letters(4)}`, timezone: ZONE, contactEmail: `office@${slug}.example`, replyToEmail: `backflow@${slug}.example`, phone: "(555) 016-0101", createdAt: now })
    .$returningId();
  const programId = program!.id;
  await db.insert(programSettings).values({ programId, ruleSetEdition: "published-current", updatedAt: now, ...settings });
  await db.insert(returnReasons).values([
    { programId, label: "Readings are missing or incomplete", guidance: "Record every reading.", sortOrder: 0 },
    { programId, label: "Test date is implausible", guidance: "Correct the test date.", sortOrder: 1 },
  ]);
  const email = (who: string) => `${who}.${slug}@wrenfield.example`;
  for (const [who, role, label] of [
    ["admin", "admin", "Tamsin Wrenfield"],
    ["inspector", "inspector", "Odile Brackwater"],
    ["inspector2", "inspector", "Lucan Hebbleworth"],
  ] as const) {
    await db.insert(users).values({ email: email(who), name: `${label} ${slug.slice(-4)}`, role, programId, status: "active", createdAt: now, updatedAt: now });
  }
  return { programId, name, adminEmail: email("admin"), inspectorEmail: email("inspector"), inspector2Email: email("inspector2") };
}

export async function createSite(programId: number, overrides: Partial<typeof sites.$inferInsert> = {}): Promise<{ id: number; accountNumber: string }> {
  const now = new Date();
  const accountNumber = overrides.accountNumber ?? `ZI${letters(3)}${randomBytes(3).toString("hex")}`;
  const [row] = await testDb()
    .insert(sites)
    .values({ programId, accountNumber, name: "Ottersedge Dairy", addressLine1: `${Math.floor(Math.random() * 900) + 10} Kestrel Rise`, city: "Quillmere", hazard: "high", facilityType: "Dairy", createdAt: now, updatedAt: now, ...overrides })
    .$returningId();
  return { id: row!.id, accountNumber };
}

export async function createOwner(programId: number, siteId: number, overrides: Partial<typeof owners.$inferInsert> = {}): Promise<number> {
  const now = new Date();
  const id = unique("own");
  const [row] = await testDb().insert(owners).values({ programId, name: `Marigold Ashby ${id.slice(-4)}`, email: `${id}@owners.example`, createdAt: now, updatedAt: now, ...overrides }).$returningId();
  await testDb().insert(siteOwners).values({ siteId, ownerId: row!.id });
  return row!.id;
}

/** An assembly with facts derived for the history given (no reports: the facts are set directly). */
export async function createAssembly(programId: number, siteId: number, overrides: Partial<typeof assemblies.$inferInsert> = {}): Promise<{ id: number; serial: string }> {
  const now = new Date();
  const serial = overrides.serial ?? `ZA${letters(3)}${randomBytes(3).toString("hex").toUpperCase()}`;
  const installedOn = overrides.installedOn === undefined ? addMonths(today(), -36) : overrides.installedOn;
  const facts = deriveAssemblyFacts({ status: overrides.status ?? "active", installedOn: installedOn ?? null, hazard: overrides.hazard ?? "high", tests: [] });
  const [row] = await testDb()
    .insert(assemblies)
    .values({ programId, siteId, kind: "RP", make: "Tallowmere", model: "TR-4", size: "1 in", location: "meter vault at the street", hazard: "high", status: "active", ...facts, createdAt: now, updatedAt: now, ...overrides, serial, installedOn })
    .$returningId();
  return { id: row!.id, serial };
}

export interface TesterFixture {
  id: number;
  email: string;
  name: string;
  phone: string;
}

export async function createTester(options: { programIds: number[]; approval?: "approved" | "pending" | "suspended"; certExpiresOn?: string; phone?: string; status?: "active" | "disabled" }): Promise<TesterFixture> {
  const db = testDb();
  const now = new Date();
  const id = unique("tst");
  const email = `${id}@testers.example`;
  const name = `Perrin Hazelrigg ${id.slice(-6)}`;
  const phone = options.phone ?? `(555) 03${Math.floor(Math.random() * 9)}-${String(Math.floor(Math.random() * 9000) + 1000)}`;
  const [user] = await db.insert(users).values({ email, name, phone, role: "tester", status: options.status ?? "active", createdAt: now, updatedAt: now }).$returningId();
  await db.insert(certifications).values({ testerId: user!.id, certifyingBody: "Tri-County Cross-Connection Certification Council", number: `BT-${id.slice(-6)}`, issuedOn: addMonths(today(), -24), expiresOn: options.certExpiresOn ?? addMonths(today(), 12), createdAt: now, updatedAt: now });
  await db.insert(testKits).values({ testerId: user!.id, make: "Gaugewright", model: "DG-5", serial: `DG5-${id.slice(-6)}`, lastVerifiedOn: addDays(today(), -60), createdAt: now, updatedAt: now });
  for (const programId of options.programIds) await db.insert(testerApprovals).values({ programId, testerId: user!.id, status: options.approval ?? "approved", decidedAt: now, createdAt: now });
  return { id: user!.id, email, name, phone };
}

export const passingRp: FieldTestInput = { kind: "RP", unit: "psid", reliefValveOpeningPoint: 2.6, check1Differential: 6.1, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };
export const failingRp: FieldTestInput = { kind: "RP", unit: "psid", reliefValveOpeningPoint: 1.8, check1Differential: 6.5, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };

let sequence = 0;

/** A filed report, shaped as the submission code stores one (grade, validity, signals, snapshots). */
export async function createReport(options: {
  programId: number;
  assemblyId: number;
  tester: TesterFixture;
  testedOn?: string;
  status?: "queued" | "accepted" | "returned" | "superseded" | "awaiting_fee";
  initial?: FieldTestInput;
  retest?: FieldTestInput | null;
  validity?: ValidityIssue[];
  signals?: SuspiciousSignal[];
  submittedAt?: Date;
}): Promise<{ id: number; reportNumber: string }> {
  const db = testDb();
  const initial = options.initial ?? passingRp;
  const retest = options.retest ?? null;
  const grade = gradeReport({ initial, retest });
  const finalOutcome = grade.outcome === "pass" ? "pass" : "fail";
  const validity = options.validity ?? [];
  const signals = options.signals ?? [];
  const testedOn = options.testedOn ?? addDays(today(), -2);
  const submittedAt = options.submittedAt ?? new Date();
  sequence += 1;
  const reportNumber = `ZT-${unique("").slice(-10)}-${sequence}`.slice(0, 24);
  const [row] = await db
    .insert(testReports)
    .values({
      programId: options.programId,
      reportNumber,
      assemblyId: options.assemblyId,
      testerId: options.tester.id,
      status: options.status ?? "queued",
      assemblyKind: initial.kind,
      testedAt: new Date(`${testedOn}T10:30:00Z`),
      testedOn,
      reason: "annual",
      linePressurePsi: 72.5,
      unit: "psid",
      ruleSetEdition: "published-current",
      assemblySnapshot: { kind: initial.kind, make: "Tallowmere", model: "TR-4", size: "1 in", serial: "SNAP", location: "meter vault", hazard: "high", siteName: "Ottersedge Dairy", address: "1 Kestrel Rise, Quillmere", accountNumber: "ZI" },
      testerSnapshot: { name: options.tester.name, company: "Fernhollow Test & Repair", certifyingBody: "Tri-County Cross-Connection Certification Council", certificationNumber: "BT-1", certificationExpiresOn: addMonths(today(), 12) },
      kitSnapshot: { make: "Gaugewright", model: "DG-5", serial: "DG5-1", lastVerifiedOn: addDays(today(), -60) },
      initialOutcome: grade.initial.outcome,
      finalOutcome,
      wasRepaired: Boolean(retest),
      grade: storeGrade(grade),
      validity,
      signals,
      warningCount: validity.length + signals.length,
      isClean: finalOutcome === "pass" && validity.length === 0 && signals.length === 0,
      fingerprint: readingFingerprint(retest ?? initial),
      attestedName: options.tester.name,
      attestedAt: submittedAt,
      submittedAt,
      idempotencyKey: unique("idem"),
      verificationCode: randomBytes(8).toString("hex"),
      createdAt: submittedAt,
      updatedAt: submittedAt,
    })
    .$returningId();
  await db.insert(reportReadings).values({ reportId: row!.id, phase: "initial", outcome: grade.initial.outcome, ...readingsRowFromInput(initial) });
  if (retest && grade.retest) await db.insert(reportReadings).values({ reportId: row!.id, phase: "retest", outcome: grade.retest.outcome, ...readingsRowFromInput(retest) });
  return { id: row!.id, reportNumber };
}
