// Rows the tester-area tests create for themselves (unique names, never the demo's own
// testers), so no test depends on another's leftovers or on the order they run in.
import { randomBytes } from "node:crypto";
import { and, asc, eq, isNotNull, lt } from "drizzle-orm";
import { assemblies, certifications, programSettings, programs, sites, testerApprovals, testKits, users } from "@/db/schema";
import { todayInZone } from "@/lib/programs/settings";
import { addDays, addMonths } from "@/lib/rules";
import { testDb } from "../helpers/db";
import { unique } from "../helpers/http";

export const DEMO_ZONE = "Etc/GMT+6";
export const today = () => todayInZone(DEMO_ZONE);

const letters = (n: number) =>
  Array.from(randomBytes(n), (b) => String.fromCharCode(65 + (b % 26))).join("");

export async function createProgram(options: { units?: "psid" | "kPa"; feeCents?: number; kitPolicy?: "refuse" | "flag" } = {}): Promise<{ programId: number; prefix: string; siteId: number }> {
  const db = testDb();
  const now = new Date();
  const prefix = `Z${letters(4)}`;
  const slug = unique("prog").toLowerCase();
  const [program] = await db
    .insert(programs)
    .values({ slug, name: `Fernwick Hollow Water Board ${slug}`, shortName: `Fernwick ${prefix}`, reportPrefix: prefix, timezone: DEMO_ZONE, contactEmail: `ccc@${slug}.example`, replyToEmail: `ccc@${slug}.example`, createdAt: now })
    .$returningId();
  await db.insert(programSettings).values({ programId: program!.id, ruleSetEdition: "published-current", units: options.units ?? "psid", filingFeeCents: options.feeCents ?? 0, kitPolicy: options.kitPolicy ?? "refuse", updatedAt: now });
  const [site] = await db
    .insert(sites)
    .values({ programId: program!.id, accountNumber: `${prefix}${letters(4)}`, name: "Brindlecombe Bakery", addressLine1: `${Math.floor(Math.random() * 900) + 10} Ottersedge Lane`, city: "Quillmere", hazard: "high", contactName: "Orla Threadgill", contactPhone: "(555) 017-4410", createdAt: now, updatedAt: now })
    .$returningId();
  return { programId: program!.id, prefix, siteId: site!.id };
}

export interface TesterFixture {
  id: number;
  email: string;
  name: string;
  kitId: number;
  certificationId: number;
}

/** A tester approved in the given programs, with a certification and one kit (valid unless told otherwise). */
export async function createTester(options: { programIds?: number[]; certExpiresOn?: string; kitVerifiedOn?: string; kitResult?: "passed" | "failed"; approval?: "approved" | "pending" | "suspended"; name?: string } = {}): Promise<TesterFixture> {
  const db = testDb();
  const now = new Date();
  const id = unique("tst");
  const email = `${id}@testers.example`;
  const name = options.name ?? `Perrin Hazelrigg ${id.slice(-5)}`;
  const [user] = await db.insert(users).values({ email, name, role: "tester", status: "active", createdAt: now, updatedAt: now }).$returningId();
  const [cert] = await db
    .insert(certifications)
    .values({ testerId: user!.id, certifyingBody: "Tri-County Cross-Connection Certification Council", number: `BT-${id.slice(-6)}`, issuedOn: addMonths(today(), -24), expiresOn: options.certExpiresOn ?? addMonths(today(), 12), createdAt: now, updatedAt: now })
    .$returningId();
  const [kit] = await db
    .insert(testKits)
    .values({ testerId: user!.id, make: "Gaugewright", model: "DG-5", serial: `DG5-${id.slice(-6)}`, lastVerifiedOn: options.kitVerifiedOn ?? addDays(today(), -60), verificationResult: options.kitResult ?? "passed", verifiedBy: "Calibration bench", createdAt: now, updatedAt: now })
    .$returningId();
  for (const programId of options.programIds ?? [1]) {
    await db.insert(testerApprovals).values({ programId, testerId: user!.id, status: options.approval ?? "approved", decidedAt: now, createdAt: now });
  }
  return { id: user!.id, email, name, kitId: kit!.id, certificationId: cert!.id };
}

/** A new assembly at an existing site of the program (its first in the history). */
export async function createAssembly(options: { programId?: number; siteId?: number; kind?: "RP" | "DC" | "PVB" | "SVB" | "AG" | "RPDA" | "DCDA"; installedOn?: string | null; status?: "active" | "awaiting_confirmation" | "removed" } = {}): Promise<{ id: number; serial: string; siteId: number }> {
  const db = testDb();
  const programId = options.programId ?? 1;
  let siteId = options.siteId;
  const now = new Date();
  if (!siteId) {
    // A site of its own: no owner account speaks for it, and no other test's assembly is there.
    const [site] = await db
      .insert(sites)
      .values({ programId, accountNumber: `ZS${letters(3)}${randomBytes(3).toString("hex")}`, name: "Quenby Row Laundry", addressLine1: `${Math.floor(Math.random() * 900) + 10} Harrowgate Lane`, city: "Quillmere", hazard: "high", contactName: "Tobiah Marlowe", contactPhone: "(555) 013-2207", createdAt: now, updatedAt: now })
      .$returningId();
    siteId = site!.id;
  }
  const serial = `ZW${letters(3)}${randomBytes(3).toString("hex").toUpperCase()}`;
  const [row] = await db
    .insert(assemblies)
    .values({ programId, siteId, kind: options.kind ?? "RP", make: "Tallowmere", model: "TR-4", size: "1 in", serial, location: "utility room, east wall", hazard: "high", installedOn: options.installedOn === undefined ? addMonths(today(), -30) : options.installedOn, status: options.status ?? "active", createdAt: now, updatedAt: now })
    .$returningId();
  return { id: row!.id, serial, siteId };
}

/** A complete RP submission (initial test passing unless readings are overridden). */
export function rpSubmission(args: { assemblyId: number; kitId: number; testerName: string; testedOn?: string; initial?: Record<string, unknown>; retest?: Record<string, unknown> | null; repairs?: unknown[]; unit?: "psid" | "kPa"; linePressure?: number | null } & Record<string, unknown>) {
  const { assemblyId, kitId, testerName, testedOn, initial, retest, repairs, unit, linePressure, ...rest } = args;
  return {
    idempotencyKey: randomBytes(16).toString("hex"),
    assemblyId,
    kitId,
    testedOn: testedOn ?? today(),
    testedTime: `${String(7 + Math.floor(Math.random() * 10)).padStart(2, "0")}:${String(Math.floor(Math.random() * 60)).padStart(2, "0")}`,
    reason: "annual",
    installation: "existing",
    orientationApproved: true,
    reliefPortAirGapOk: true,
    unit: unit ?? "psid",
    linePressure: linePressure === undefined ? 64 : linePressure,
    initial: initial ?? { reliefValveOpeningPoint: 2.6, check1Differential: 6.1, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true },
    repairs: repairs ?? [],
    retest: retest ?? null,
    remarks: "",
    attestation: { name: testerName, confirmed: true },
    ...rest,
  };
}

/** A seeded RP in the first program, in service and not tested for 200 days: the offset picks the next one along. */
export async function pickUntestedRp(offset = 0): Promise<{ id: number; serial: string }> {
  const [row] = await testDb()
    .select({ id: assemblies.id, serial: assemblies.serial })
    .from(assemblies)
    .where(and(eq(assemblies.programId, 1), eq(assemblies.kind, "RP"), eq(assemblies.status, "active"), eq(assemblies.baseState, "active"), isNotNull(assemblies.lastTestedOn), lt(assemblies.lastTestedOn, addDays(today(), -200))))
    .orderBy(asc(assemblies.id))
    .limit(1)
    .offset(offset);
  if (!row) throw new Error("No untested RP left in the seeded program");
  return row;
}
