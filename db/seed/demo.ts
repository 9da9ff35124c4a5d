// The demo scenario: two invented neighbouring water districts, their staff, testers, sites,
// owners and assemblies, and four years of test history graded by lib/rules. Deterministic:
// the same seed and anchor date give the same rows. Demo data only.
import { hash } from "@node-rs/argon2";
import type { Database } from "@/db/client";
import * as t from "@/db/schema";
import { programRulesFromSettings, ruleSetForEdition } from "@/lib/programs/settings";
import { storeGrade } from "@/lib/reports/grade-storage";
import { readingsRowFromInput } from "@/lib/reports/readings-row";
import {
  addDays,
  addMonths,
  checkReportValidity,
  deriveAssemblyFacts,
  detectSuspiciousSignalsInBatch,
  dueDateAfterPass,
  gradeReport,
  readingFingerprint,
  type AssemblyKind,
  type BatchSignalReport,
  type FieldTestInput,
  type Hazard,
  type ProgramRules,
  type RuleSet,
} from "@/lib/rules";
import { DEMO_PASSWORD, demoAccounts } from "./demo-accounts";
import { seedDemoOwner } from "./demo-owner";
import { businessWords, companyNames, facilityTypes, firstNames, kitMakers, lastNames, locations, makers, streetNames } from "./names";
import { createRandom } from "./random";
import { failureModeFor, generateReadings, inKilopascals } from "./readings";

export interface DemoOptions {
  /** "Today" of the scenario; the history ends here. */
  anchor: string;
  seed?: number;
  log?: (line: string) => void;
}

type Insertable<T extends { $inferInsert: unknown }> = T["$inferInsert"];

const PROGRAM_TZ = "Etc/GMT+6";
const PROGRAM_OFFSET = "-06:00";

interface ProgramPlan {
  id: number;
  slug: string;
  name: string;
  shortName: string;
  prefix: string;
  town: string;
  domain: string;
  siteCount: number;
  units: "psid" | "kPa";
  dueModel: "anniversary" | "window";
  rules: ProgramRules;
  ruleSet: RuleSet;
  inspectors: number[];
}

interface TesterPlan {
  id: number;
  name: string;
  email: string;
  company: string | null;
  companyId: number | null;
  programIds: number[];
  certBody: string;
  certNumber: string;
  certIssuedOn: string;
  certExpiresOn: string;
  certificationId: number;
  kits: { id: number; make: string; model: string; serial: string; lastVerifiedOn: string }[];
  /** No tests after this date (expired certificate or overdue kit). */
  activeUntil: string;
}

const now = () => new Date();

async function insertChunked<T>(rows: T[], insert: (chunk: T[]) => Promise<unknown>, size = 500): Promise<void> {
  for (let i = 0; i < rows.length; i += size) await insert(rows.slice(i, i + size));
}

function localDateTime(date: string, minutes: number): Date {
  // Wall-clock time in the program's zone, stored as the naive local datetime the tester typed.
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return new Date(`${date}T${String(h).padStart(2, "0")}:${String(m).padStart(2, "0")}:00Z`);
}

function isoWithOffset(date: string, minutes: number): string {
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return `${date}T${String(h).padStart(2, "0")}:${String(m).padStart(2, "0")}:00${PROGRAM_OFFSET}`;
}

function utcInstant(date: string, minutes: number): Date {
  return new Date(isoWithOffset(date, minutes));
}

export async function seedDemo(db: Database, options: DemoOptions): Promise<Record<string, number>> {
  const rng = createRandom(options.seed ?? 20261201);
  const log = options.log ?? (() => {});
  const anchor = options.anchor;
  const historyStart = addMonths(anchor, -48);
  const createdAt = now();
  const passwordHash = await hash(DEMO_PASSWORD);

  // ---------------------------------------------------------------- programs
  const baseSettings = {
    testIntervalMonths: 12,
    windowStart: "01-01",
    windowEnd: "05-31",
    dueSoonDays: 30,
    repairDaysSevere: 14,
    repairDaysHigh: 14,
    repairDaysLow: 30,
    reportDeadlineDays: 10,
    reminderDaysBefore: 30,
    overdueDaysAfter: 1,
    finalDaysAfter: 30,
    repairReminderDaysBefore: 7,
    ruleSetEdition: "published-current",
  };
  const plans: ProgramPlan[] = [
    { id: 1, slug: "quillmere", name: "Quillmere Valley Water District", shortName: "Quillmere Valley", prefix: "QV", town: "Quillmere", domain: "quillmere-water.example", siteCount: 1500, units: "psid", dueModel: "anniversary", rules: programRulesFromSettings({ ...baseSettings, dueModel: "anniversary" }), ruleSet: ruleSetForEdition("published-current"), inspectors: [] },
    { id: 2, slug: "tansy-ridge", name: "Tansy Ridge Public Water System", shortName: "Tansy Ridge", prefix: "TR", town: "Tansy Ridge", domain: "tansyridge-water.example", siteCount: 220, units: "kPa", dueModel: "window", rules: programRulesFromSettings({ ...baseSettings, dueModel: "window" }), ruleSet: ruleSetForEdition("published-current"), inspectors: [] },
  ];
  await db.insert(t.programs).values(
    plans.map((p) => ({
      id: p.id,
      slug: p.slug,
      name: p.name,
      shortName: p.shortName,
      reportPrefix: p.prefix,
      timezone: PROGRAM_TZ,
      contactEmail: `ccc@${p.domain}`,
      replyToEmail: `backflow@${p.domain}`,
      phone: p.id === 1 ? "(555) 014-2200" : "(555) 019-7310",
      mailingAddress: p.id === 1 ? "Cross-Connection Control, 40 Reservoir Row, Quillmere" : "Water Office, 2 Pumphouse Lane, Tansy Ridge",
      createdAt,
    })),
  );
  await db.insert(t.programSettings).values(
    plans.map((p) => ({ programId: p.id, ...baseSettings, dueModel: p.dueModel, units: p.units, currency: "USD", filingFeeCents: p.id === 1 ? 1500 : 0, kitPolicy: "refuse" as const, updatedAt: createdAt })),
  );
  const reasons = [
    ["Readings are missing or incomplete", "Record every reading the assembly's procedure calls for."],
    ["Test kit accuracy check is out of date or not on file", "Upload the kit's current accuracy verification."],
    ["Assembly details do not match the inventory (serial, make, size)", "Check the data plate and correct the report."],
    ["Readings are not consistent with each other", "Re-check the readings; retest if needed."],
    ["Repair recorded without a passing retest", "Retest after the repair and record the readings."],
    ["Test date is implausible", "Correct the test date."],
  ] as const;
  await db.insert(t.returnReasons).values(plans.flatMap((p) => reasons.map(([label, guidance], i) => ({ programId: p.id, label, guidance, sortOrder: i, isActive: true }))));

  // ---------------------------------------------------------------- staff
  let userId = 0;
  const userRows: Insertable<typeof t.users>[] = [];
  const addUser = (row: Omit<Insertable<typeof t.users>, "id" | "createdAt" | "updatedAt" | "passwordHash">) => {
    userId += 1;
    userRows.push({ id: userId, passwordHash, createdAt, updatedAt: createdAt, passwordChangedAt: createdAt, ...row });
    return userId;
  };
  addUser({ email: demoAccounts.admin, name: "Imogen Varga-Lind", role: "admin", programId: 1 });
  plans[0]!.inspectors.push(addUser({ email: demoAccounts.inspector, name: "Rafael Okonjo-Brandt", role: "inspector", programId: 1, phone: "(555) 014-2231" }));
  plans[0]!.inspectors.push(addUser({ email: demoAccounts.inspector2, name: "Maelis Rookwood", role: "inspector", programId: 1 }));
  plans[0]!.inspectors.push(addUser({ email: demoAccounts.inspector3, name: "Sunniva Emberly", role: "inspector", programId: 1 }));
  addUser({ email: demoAccounts.neighbourAdmin, name: "Teodor Quenby-Ash", role: "admin", programId: 2 });
  plans[1]!.inspectors.push(addUser({ email: demoAccounts.neighbourInspector, name: "Halima Foxholme", role: "inspector", programId: 2 }));

  // ---------------------------------------------------------------- testers
  const companyRows = companyNames.map((name, i) => ({ id: i + 1, name, phone: `(555) 02${i}-${String(4100 + i * 37).padStart(4, "0")}`, email: `office@${name.toLowerCase().replace(/[^a-z]+/g, "-").replace(/-+$/, "")}.example`, address: `${10 + i * 7} ${streetNames[i % streetNames.length]}, Quillmere`, createdAt }));
  await db.insert(t.companies).values(companyRows);

  const testers: TesterPlan[] = [];
  const certRows: Insertable<typeof t.certifications>[] = [];
  const kitRows: Insertable<typeof t.testKits>[] = [];
  const approvalRows: Insertable<typeof t.testerApprovals>[] = [];
  const certBodies = ["Quillmere Valley Backflow Tester Board", "Tri-County Cross-Connection Certification Council", "Western Basin Water Works Training Board"];
  let kitId = 0;
  for (let i = 0; i < 32; i++) {
    const special = i === 0 ? "demo" : i === 1 ? "expired" : i === 2 ? "pending" : i === 3 ? "kit_overdue" : i === 4 ? "expiring" : i === 5 ? "expired2" : "normal";
    const first = firstNames[(i * 7) % firstNames.length]!;
    const last = lastNames[(i * 11 + 3) % lastNames.length]!;
    const name = i === 0 ? "Dana Whitlock-Ray" : `${first} ${last}`;
    const email =
      special === "demo" ? demoAccounts.tester : special === "expired" ? demoAccounts.testerExpired : special === "pending" ? demoAccounts.testerPending : `${first.toLowerCase()}.${last.toLowerCase().replace(/[^a-z]/g, "")}@testers.example`;
    const companyIndex = special === "demo" ? 0 : special === "expired" ? 2 : special === "pending" ? 5 : i % companyRows.length;
    const company = companyRows[companyIndex]!;
    const isBillingManager = special === "demo";
    const id = addUser({ email, name, role: "tester", phone: `(555) 03${String(i).padStart(2, "0")}-${String(1000 + i * 53).slice(-4)}`, companyId: company.id, isBillingManager });
    const certExpiresOn =
      special === "expired" ? addDays(anchor, -40) : special === "expired2" ? addDays(anchor, -95) : special === "expiring" ? addDays(anchor, 18) : addDays(anchor, rng.int(120, 900));
    const certIssuedOn = addMonths(certExpiresOn, -36);
    const certNumber = `BT-${String(10400 + i * 137).padStart(6, "0")}`;
    certRows.push({ id: i + 1, testerId: id, certifyingBody: certBodies[i % certBodies.length]!, number: certNumber, issuedOn: certIssuedOn, expiresOn: certExpiresOn, createdAt, updatedAt: createdAt });
    const kits: TesterPlan["kits"] = [];
    const kitCount = special === "demo" ? 2 : rng.chance(0.3) ? 2 : 1;
    for (let k = 0; k < kitCount; k++) {
      kitId += 1;
      const maker = kitMakers[(i + k) % kitMakers.length]!;
      const lastVerifiedOn = special === "kit_overdue" && k === 0 ? addDays(anchor, -400) : addDays(anchor, -rng.int(15, 320));
      const kit = { id: kitId, make: maker.make, model: maker.model, serial: `${maker.model.replace(/[^A-Z0-9]/g, "")}-${String(2000 + kitId * 29)}`, lastVerifiedOn };
      kits.push(kit);
      kitRows.push({ id: kit.id, testerId: id, make: kit.make, model: kit.model, serial: kit.serial, lastVerifiedOn, verificationResult: "passed", verifiedBy: "Calibration bench, Quillmere Instrument Lab", createdAt, updatedAt: createdAt });
    }
    const programIds = special === "demo" || i % 5 === 0 ? [1, 2] : i % 7 === 3 ? [2] : [1];
    for (const programId of programIds) {
      const status = special === "pending" ? "pending" : special === "expired2" && programId === 1 ? "suspended" : "approved";
      approvalRows.push({ programId, testerId: id, status, reason: status === "suspended" ? "Certificate expired; reinstated on proof of renewal." : null, decidedBy: status === "pending" ? null : plans[programId - 1]!.inspectors[0], decidedAt: status === "pending" ? null : createdAt, createdAt });
    }
    const activeUntil = special === "expired" || special === "expired2" ? addDays(certExpiresOn, -1) : special === "kit_overdue" ? addDays(anchor, -40) : special === "pending" ? addDays(anchor, -4000) : anchor;
    testers.push({ id, name, email, company: company.name, companyId: company.id, programIds: special === "pending" ? [] : programIds, certBody: certBodies[i % certBodies.length]!, certNumber, certIssuedOn, certExpiresOn, certificationId: i + 1, kits, activeUntil });
  }

  // ---------------------------------------------------------------- owners, sites, assemblies
  const siteRows: Insertable<typeof t.sites>[] = [];
  const ownerRows: Insertable<typeof t.owners>[] = [];
  const siteOwnerRows: Insertable<typeof t.siteOwners>[] = [];
  const assemblyRows: (Insertable<typeof t.assemblies> & { id: number; programId: number; siteId: number; kind: AssemblyKind; hazard: Hazard })[] = [];
  const demoOwnerSites: number[] = [];
  let siteId = 0;
  let ownerId = 0;
  let assemblyId = 0;
  const sizes: Record<AssemblyKind, string[]> = { RP: ["3/4 in", "1 in", "1 1/2 in", "2 in"], RPDA: ["4 in", "6 in"], DC: ["3/4 in", "1 in", "2 in"], DCDA: ["4 in", "6 in", "8 in"], PVB: ["3/4 in", "1 in"], SVB: ["1/2 in", "3/4 in"], AG: ["1 in", "2 in"] };

  const kindFor = (facility: (typeof facilityTypes)[number]): AssemblyKind => {
    switch (facility.type) {
      case "Lawn irrigation":
        return rng.weighted([["PVB", 7], ["SVB", 2], ["RP", 2]] as const);
      case "Fire sprinkler service":
        return rng.weighted([["DCDA", 6], ["RPDA", 2]] as const);
      case "Single-family residence":
        return rng.weighted([["DC", 5], ["PVB", 3], ["RP", 1]] as const);
      case "Medical clinic":
      case "Laboratory":
      case "Metal finishing plant":
        return rng.weighted([["RP", 8], ["AG", 2]] as const);
      default:
        // A few doubles where the hazard calls for an RP: the inventory should flag them.
        return facility.hazard === "high" ? rng.weighted([["RP", 9], ["DC", 1]] as const) : rng.weighted([["DC", 5], ["RP", 3]] as const);
    }
  };

  let demoOwnerId = 0;
  for (const plan of plans) {
    let ownerForNext: number | null = null;
    for (let s = 0; s < plan.siteCount; s++) {
      siteId += 1;
      const facility = rng.weighted(facilityTypes.map((f) => [f, f.weight] as const));
      const ownerLast = rng.pick(lastNames);
      const ownerFirst = rng.pick(firstNames);
      const street = rng.pick(streetNames);
      const number = rng.int(2, 980);
      const business = facility.name(ownerLast) || `${rng.pick(businessWords)} ${facility.type}`;
      siteRows.push({
        id: siteId,
        programId: plan.id,
        accountNumber: `${plan.prefix}${String(100000 + siteId * 7).slice(-6)}`,
        name: business,
        addressLine1: `${number} ${street}`,
        city: plan.town,
        postalCode: "",
        hazard: facility.hazard,
        facilityType: facility.type,
        contactName: `${ownerFirst} ${ownerLast}`,
        contactPhone: `(555) 0${rng.int(40, 99)}-${String(rng.int(0, 9999)).padStart(4, "0")}`,
        createdAt,
        updatedAt: createdAt,
      });
      // Property managers hold several sites; most owners one.
      let thisOwner: number | null = ownerForNext;
      if (thisOwner === null || rng.chance(0.85)) {
        ownerId += 1;
        const hasEmail = rng.chance(0.9);
        ownerRows.push({
          id: ownerId,
          programId: plan.id,
          name: facility.type === "Single-family residence" || facility.type === "Lawn irrigation" ? `${ownerFirst} ${ownerLast}` : `${business} (${ownerFirst} ${ownerLast})`,
          email: hasEmail ? `${ownerFirst.toLowerCase()}.${ownerLast.toLowerCase().replace(/[^a-z]/g, "")}${ownerId}@owners.example` : null,
          phone: `(555) 0${rng.int(40, 99)}-${String(rng.int(0, 9999)).padStart(4, "0")}`,
          mailingAddress: `${number} ${street}, ${plan.town}`,
          createdAt,
          updatedAt: createdAt,
        });
        thisOwner = ownerId;
      }
      ownerForNext = rng.chance(0.1) ? thisOwner : null;
      siteOwnerRows.push({ siteId, ownerId: thisOwner, relation: "owner", receivesNotices: true });

      const assemblyCount = plan.id === 1 ? rng.weighted([[1, 72], [2, 20], [3, 8]] as const) : rng.weighted([[1, 85], [2, 15]] as const);
      for (let a = 0; a < assemblyCount; a++) {
        assemblyId += 1;
        const kind = a === 0 ? kindFor(facility) : rng.weighted([["RP", 4], ["DC", 3], ["PVB", 2], ["AG", 1]] as const);
        const maker = rng.pick(Object.values(makers));
        const model = kind === "AG" ? "" : rng.pick(maker.models[kind] ?? ["—"]);
        const installedOn = rng.chance(0.03) ? addDays(anchor, -rng.int(3, 50)) : addDays(anchor, -rng.int(400, 4800));
        assemblyRows.push({
          id: assemblyId,
          programId: plan.id,
          siteId,
          kind,
          make: kind === "AG" ? "" : maker.make,
          model,
          size: rng.pick(sizes[kind]),
          serial: kind === "AG" ? "" : `${maker.make.slice(0, 2).toUpperCase()}${rng.int(100000, 999999)}`,
          location: rng.pick(locations[kind] ?? ["service line"]),
          hazard: facility.hazard,
          backpressurePossible: facility.type === "Car wash" || facility.type === "Metal finishing plant",
          installedOn,
          status: "active",
          createdAt,
          updatedAt: createdAt,
        });
      }
    }
  }

  // The demo owner's own account speaks for four sites in both programs.
  const demoSitePicks = [siteRows.find((s) => s.programId === 1 && s.facilityType === "Restaurant"), siteRows.find((s) => s.programId === 1 && s.facilityType === "Lawn irrigation"), siteRows.find((s) => s.programId === 1 && s.facilityType === "Office building"), siteRows.find((s) => s.programId === 2)].filter(Boolean) as typeof siteRows;
  const demoOwnerUser = addUser({ email: demoAccounts.owner, name: "Wendeline Ashgrove", role: "owner", phone: "(555) 041-7788" });
  for (const site of demoSitePicks) {
    ownerId += 1;
    ownerRows.push({ id: ownerId, programId: site.programId, name: "Wendeline Ashgrove (Ashgrove Property Care)", email: demoAccounts.owner, phone: "(555) 041-7788", mailingAddress: "18 Marigold Row, Quillmere", userId: demoOwnerUser, createdAt, updatedAt: createdAt });
    // The demo owner replaces whoever owned the site before.
    for (const link of siteOwnerRows) if (link.siteId === site.id) link.ownerId = ownerId;
    demoOwnerSites.push(site.id!);
    demoOwnerId = ownerId;
  }
  void demoOwnerId;

  // ---------------------------------------------------------------- history
  const reportRows: Insertable<typeof t.testReports>[] = [];
  const readingRows: Insertable<typeof t.reportReadings>[] = [];
  const repairRows: Insertable<typeof t.reportRepairs>[] = [];
  const reviewRows: Insertable<typeof t.reviews>[] = [];
  const certificateRows: Insertable<typeof t.certificates>[] = [];
  const signalCandidates: (BatchSignalReport & { row: Insertable<typeof t.testReports> })[] = [];
  const sequences = new Map<string, number>();
  let reportId = 0;
  let certificateId = 0;
  const siteById = new Map(siteRows.map((s) => [s.id!, s]));
  const testersByProgram = new Map(plans.map((p) => [p.id, testers.filter((x) => x.programIds.includes(p.id))]));
  const demoTester = testers[0]!;
  const usualTester = new Map<number, TesterPlan>();
  const pickTester = (programId: number, assembly: number, on: string): TesterPlan | null => {
    const pool = (testersByProgram.get(programId) ?? []).filter((x) => x.activeUntil >= on);
    if (pool.length === 0) return null;
    const usual = usualTester.get(assembly);
    if (usual && usual.activeUntil >= on && usual.programIds.includes(programId) && rng.chance(0.8)) return usual;
    // The demo tester has a steady book of customers.
    const chosen = rng.chance(0.12) && demoTester.activeUntil >= on && demoTester.programIds.includes(programId) ? demoTester : rng.pick(pool);
    usualTester.set(assembly, chosen);
    return chosen;
  };
  const repairPlans: Record<string, [t.ReportRepairInsert["component"], t.ReportRepairInsert["part"]][]> = {
    relief_low: [["relief_valve", "diaphragm"], ["relief_valve", "relief_disc"], ["relief_valve", "spring"]],
    relief_stuck: [["relief_valve", "relief_disc"], ["relief_valve", "guide"]],
    check1_low: [["check1", "disc_rubber"], ["check1", "spring"], ["check1", "seat"]],
    check2_leak: [["check2", "disc_rubber"], ["check2", "seat_o_ring"]],
    check_low: [["check1", "disc_rubber"], ["check2", "disc_rubber"], ["check", "disc_rubber"]],
    air_inlet_low: [["air_inlet", "disc_rubber"], ["air_inlet", "spring"]],
    air_inlet_partial: [["air_inlet", "guide"], ["air_inlet", "cover_o_ring"]],
  };

  const addReport = (args: {
    plan: ProgramPlan;
    assembly: (typeof assemblyRows)[number];
    tester: TesterPlan;
    testedOn: string;
    minutes: number;
    reason: Insertable<typeof t.testReports>["reason"];
    initial: FieldTestInput;
    retest: FieldTestInput | null;
    repairs: [t.ReportRepairInsert["component"], t.ReportRepairInsert["part"]][];
    forceStatus?: "queued" | "returned";
  }): { id: number; finalOutcome: "pass" | "fail"; status: string } => {
    const { plan, assembly, tester } = args;
    const toUnit = (input: FieldTestInput) => (plan.units === "kPa" && input.kind !== "AG" ? inKilopascals(input) : input);
    const initial = toUnit(args.initial);
    const retest = args.retest ? toUnit(args.retest) : null;
    const grade = gradeReport({ initial, retest, ruleSet: plan.ruleSet });
    const finalOutcome = grade.outcome === "pass" ? "pass" : "fail";
    const kit = tester.kits[0]!;
    const kitVerifiedOn = addDays(args.testedOn, -rng.int(20, 300));
    const site = siteById.get(assembly.siteId)!;
    const year = args.testedOn.slice(0, 4);
    const seqKey = `${plan.prefix}-${year}`;
    const seq = (sequences.get(seqKey) ?? 0) + 1;
    sequences.set(seqKey, seq);
    reportId += 1;
    const submittedAt = utcInstant(addDays(args.testedOn, rng.weighted([[0, 6], [1, 3], [2, 1], [4, 1]] as const)), args.minutes + rng.int(30, 300));
    const isRecent = submittedAt.getTime() > utcInstant(addDays(anchor, -9), 0).getTime();
    const status = args.forceStatus ?? (isRecent ? "queued" : "accepted");
    const linePressurePsi = rng.decimal(48, 105);
    const validity = checkReportValidity({
      testDate: args.testedOn,
      today: args.testedOn,
      certificationExpiresOn: tester.certExpiresOn,
      kitVerifiedOn,
      installedOn: assembly.installedOn ?? null,
      input: initial,
      linePressurePsi,
      ruleSet: plan.ruleSet,
    });
    const row: Insertable<typeof t.testReports> = {
      id: reportId,
      programId: plan.id,
      reportNumber: `${seqKey}-${String(seq).padStart(6, "0")}`,
      revision: 1,
      assemblyId: assembly.id,
      testerId: tester.id,
      kitId: kit.id,
      certificationId: tester.certificationId,
      status,
      assemblyKind: assembly.kind,
      testedAt: localDateTime(args.testedOn, args.minutes),
      testedOn: args.testedOn,
      reason: args.reason,
      installation: args.reason === "installation" ? "new" : "existing",
      orientationApproved: true,
      reliefPortAirGapOk: assembly.kind === "RP" || assembly.kind === "RPDA" ? true : null,
      linePressurePsi,
      unit: plan.units,
      ruleSetEdition: plan.ruleSet.edition,
      remarks: finalOutcome === "fail" ? "Owner notified of the failure; repair to be scheduled." : null,
      assemblySnapshot: { kind: assembly.kind, make: assembly.make, model: assembly.model, size: assembly.size, serial: assembly.serial, location: assembly.location, hazard: assembly.hazard, siteName: site.name, address: `${site.addressLine1}, ${site.city}`, accountNumber: site.accountNumber },
      testerSnapshot: { name: tester.name, company: tester.company, certifyingBody: tester.certBody, certificationNumber: tester.certNumber, certificationExpiresOn: tester.certExpiresOn },
      kitSnapshot: { make: kit.make, model: kit.model, serial: kit.serial, lastVerifiedOn: kitVerifiedOn },
      initialOutcome: grade.initial.outcome,
      finalOutcome,
      wasRepaired: args.repairs.length > 0,
      grade: storeGrade(grade),
      validity,
      signals: [],
      warningCount: validity.length,
      isClean: finalOutcome === "pass" && validity.length === 0,
      fingerprint: readingFingerprint(retest ?? initial),
      attestedName: tester.name,
      attestedAt: submittedAt,
      submittedAt,
      idempotencyKey: `seed-${reportId}`,
      feeCents: 0,
      feeStatus: "none",
      verificationCode: rng.code(16),
      createdAt: submittedAt,
      updatedAt: submittedAt,
    };
    reportRows.push(row);
    readingRows.push({ reportId, phase: "initial", outcome: grade.initial.outcome, ...readingsRowFromInput(initial) });
    if (retest && grade.retest) readingRows.push({ reportId, phase: "retest", outcome: grade.retest.outcome, ...readingsRowFromInput(retest) });
    for (const [component, part] of args.repairs) repairRows.push({ reportId, component, part, action: "replaced", note: "" });
    if (status === "accepted" || status === "returned") {
      const decidedAt = new Date(submittedAt.getTime() + rng.int(3, 72) * 3_600_000);
      const inspectorId = rng.pick(plan.inspectors);
      row.decidedAt = decidedAt;
      row.decidedBy = inspectorId;
      reviewRows.push({ reportId, inspectorId, decision: status, reasons: status === "returned" ? [reasons[0][0]] : [], note: status === "returned" ? "Check #2 reading is missing from the report." : null, decidedAt });
      if (status === "accepted" && finalOutcome === "pass") {
        certificateId += 1;
        certificateRows.push({ id: certificateId, reportId, code: rng.code(12), issuedAt: decidedAt, issuedBy: inspectorId });
      }
    }
    if (status === "queued") {
      signalCandidates.push({
        reportId,
        testerId: tester.id,
        assemblyId: assembly.id,
        testedOn: args.testedOn,
        testedAt: isoWithOffset(args.testedOn, args.minutes),
        input: retest ?? initial,
        certificationExpiresOn: tester.certExpiresOn,
        kitVerifiedOn,
        installedOn: assembly.installedOn ?? null,
        row,
      });
    }
    return { id: reportId, finalOutcome, status };
  };

  const history = new Map<number, { testedOn: string; outcome: "pass" | "fail"; accepted?: boolean }[]>();
  const lastReadings = new Map<number, FieldTestInput>();
  for (const assembly of assemblyRows) {
    const plan = plans[assembly.programId - 1]!;
    const tests: { testedOn: string; outcome: "pass" | "fail"; accepted?: boolean }[] = [];
    history.set(assembly.id, tests);
    const isNeglected = rng.chance(0.05);
    let due = assembly.installedOn!;
    let guard = 0;
    while (guard++ < 30) {
      const early = rng.chance(0.12) ? -rng.int(1, 45) : rng.int(0, 40);
      let testedOn = addDays(due, -early);
      if (testedOn < assembly.installedOn!) testedOn = assembly.installedOn!;
      if (testedOn > anchor) break;
      if (isNeglected && addMonths(testedOn, 13) > anchor) break;
      const tester = pickTester(plan.id, assembly.id, testedOn);
      const reason = tests.length === 0 && due === assembly.installedOn ? "installation" : "annual";
      const fails = rng.chance(assembly.kind === "AG" ? 0.03 : 0.085);
      const mode = fails ? failureModeFor(assembly.kind, rng) : "none";
      const initial = generateReadings(assembly.kind, mode, rng);
      const repairedOnSite = fails && assembly.kind !== "AG" && rng.chance(0.6);
      const retest = repairedOnSite ? generateReadings(assembly.kind, "none", rng) : null;
      const repairs: [t.ReportRepairInsert["component"], t.ReportRepairInsert["part"]][] = repairedOnSite ? [rng.pick(repairPlans[mode] ?? [["other", "other"]])] : [];
      const minutes = rng.int(7 * 60 + 30, 16 * 60 + 30);
      if (testedOn >= historyStart && tester) {
        const result = addReport({ plan, assembly, tester, testedOn, minutes, reason, initial, retest, repairs });
        tests.push({ testedOn, outcome: result.finalOutcome, accepted: result.status !== "returned" });
        lastReadings.set(assembly.id, retest ?? initial);
      } else {
        tests.push({ testedOn, outcome: fails && !repairedOnSite ? "fail" : "pass" });
      }
      let passedOn = testedOn;
      if (fails && !repairedOnSite) {
        // Repaired and retested on a later visit, unless that visit is still to come.
        const repairOn = addDays(testedOn, rng.int(4, plan.rules.repairDays[assembly.hazard] + 12));
        if (repairOn > anchor) break;
        const repairer = pickTester(plan.id, assembly.id, repairOn);
        const repairReadings = generateReadings(assembly.kind, "none", rng);
        if (repairOn >= historyStart && repairer) {
          const result = addReport({ plan, assembly, tester: repairer, testedOn: repairOn, minutes: rng.int(8 * 60, 15 * 60), reason: "repair", initial: repairReadings, retest: null, repairs: [] });
          tests.push({ testedOn: repairOn, outcome: result.finalOutcome });
          lastReadings.set(assembly.id, repairReadings);
        } else tests.push({ testedOn: repairOn, outcome: "pass" });
        passedOn = repairOn;
      }
      due = dueDateAfterPass(passedOn, plan.rules);
    }
  }

  // A few assemblies a tester registered from the field, awaiting the inspector's confirmation.
  for (let i = 0; i < 6; i++) {
    const plan = plans[0]!;
    const site = siteRows[40 + i * 97]!;
    assemblyId += 1;
    const kind: AssemblyKind = i % 2 === 0 ? "RP" : "DC";
    const installedOn = addDays(anchor, -rng.int(2, 6));
    const assembly = { id: assemblyId, programId: plan.id, siteId: site.id!, kind, make: "Corvane", model: kind === "RP" ? "CV-24" : "CV-12", size: "1 in", serial: `CO${rng.int(100000, 999999)}`, location: "new tenant fit-out, utility closet", hazard: site.hazard as Hazard, backpressurePossible: false, installedOn, status: "awaiting_confirmation" as const, registeredBy: demoTester.id, createdAt, updatedAt: createdAt };
    assemblyRows.push(assembly);
    const tests: { testedOn: string; outcome: "pass" | "fail" }[] = [];
    history.set(assembly.id, tests);
    const r = addReport({ plan, assembly, tester: demoTester, testedOn: installedOn, minutes: 10 * 60 + i * 25, reason: "installation", initial: generateReadings(kind, "none", rng), retest: null, repairs: [], forceStatus: "queued" });
    tests.push({ testedOn: installedOn, outcome: r.finalOutcome });
  }

  // Copied readings for the inspector to spot: one tester files last year's numbers again,
  // and one files the same set on several assemblies in a morning.
  const copier = testers.find((x) => x.programIds.includes(1) && x.activeUntil >= anchor && x.id !== demoTester.id)!;
  const copyDay = addDays(anchor, -3);
  const candidates = assemblyRows.filter((a) => a.programId === 1 && a.status === "active" && (a.kind === "RP" || a.kind === "DC") && lastReadings.has(a.id) && (history.get(a.id)?.at(-1)?.testedOn ?? "") < addDays(anchor, -200)).slice(0, 9);
  const sharedSet = generateReadings("DC", "none", rng);
  candidates.forEach((assembly, i) => {
    const plan = plans[0]!;
    const readings = i < 3 ? lastReadings.get(assembly.id)! : { ...sharedSet, kind: assembly.kind === "RP" ? "DC" : assembly.kind };
    if (i >= 3 && assembly.kind !== "DC") return;
    const r = addReport({ plan, assembly, tester: copier, testedOn: copyDay, minutes: 8 * 60 + i * 6, reason: "annual", initial: readings, retest: null, repairs: [], forceStatus: "queued" });
    history.get(assembly.id)!.push({ testedOn: copyDay, outcome: r.finalOutcome });
  });

  // A report the demo tester must correct: returned with a reason.
  const returnedFor = assemblyRows.find((a) => a.programId === 1 && a.kind === "RP" && a.status === "active" && (history.get(a.id)?.at(-1)?.testedOn ?? "") < addDays(anchor, -330));
  if (returnedFor) {
    const day = addDays(anchor, -6);
    const r = addReport({ plan: plans[0]!, assembly: returnedFor, tester: demoTester, testedOn: day, minutes: 9 * 60 + 40, reason: "annual", initial: generateReadings("RP", "none", rng), retest: null, repairs: [], forceStatus: "returned" });
    const review = reviewRows.at(-1)!;
    review.reasons = ["Assembly details do not match the inventory (serial, make, size)"];
    review.note = "The serial on the report does not match the data plate photo on file. Please check and resubmit.";
    history.get(returnedFor.id)!.push({ testedOn: day, outcome: r.finalOutcome, accepted: false });
  }

  // Signals for what waits in the queue, by the same rules the server applies at submission.
  const signals = detectSuspiciousSignalsInBatch(signalCandidates);
  for (const candidate of signalCandidates) {
    const found = signals.get(candidate.reportId) ?? [];
    if (found.length) {
      candidate.row.signals = found;
      candidate.row.warningCount = (candidate.row.warningCount ?? 0) + found.length;
      candidate.row.isClean = false;
    }
  }

  // Derived facts on each assembly row, by lib/rules.
  for (const assembly of assemblyRows) {
    const plan = plans[assembly.programId - 1]!;
    const facts = deriveAssemblyFacts({ status: assembly.status ?? "active", installedOn: assembly.installedOn ?? null, hazard: assembly.hazard, tests: history.get(assembly.id) ?? [] }, plan.rules);
    Object.assign(assembly, { baseState: facts.baseState, lastTestedOn: facts.lastTestedOn, lastOutcome: facts.lastOutcome, lastPassedOn: facts.lastPassedOn, nextDueOn: facts.nextDueOn, repairDueOn: facts.repairDueOn });
  }

  // A handful of assemblies taken out of service: their history stays.
  for (const assembly of assemblyRows.filter((a) => a.status === "active").filter((_, i) => i % 150 === 149)) {
    assembly.status = "removed";
    assembly.removedOn = addDays(anchor, -rng.int(30, 400));
    assembly.baseState = "inactive";
    assembly.nextDueOn = null;
    assembly.repairDueOn = null;
  }

  // ---------------------------------------------------------------- write
  log(`writing ${userRows.length} users, ${siteRows.length} sites, ${assemblyRows.length} assemblies, ${reportRows.length} reports`);
  await insertChunked(userRows, (c) => db.insert(t.users).values(c));
  await insertChunked(certRows, (c) => db.insert(t.certifications).values(c));
  await insertChunked(kitRows, (c) => db.insert(t.testKits).values(c));
  await insertChunked(approvalRows, (c) => db.insert(t.testerApprovals).values(c));
  await insertChunked(siteRows, (c) => db.insert(t.sites).values(c));
  await insertChunked(ownerRows, (c) => db.insert(t.owners).values(c));
  await insertChunked(siteOwnerRows, (c) => db.insert(t.siteOwners).values(c));
  await insertChunked(assemblyRows, (c) => db.insert(t.assemblies).values(c));
  await insertChunked(reportRows, (c) => db.insert(t.testReports).values(c), 300);
  await insertChunked(readingRows, (c) => db.insert(t.reportReadings).values(c));
  await insertChunked(repairRows, (c) => db.insert(t.reportRepairs).values(c));
  await insertChunked(reviewRows, (c) => db.insert(t.reviews).values(c));
  await insertChunked(certificateRows, (c) => db.insert(t.certificates).values(c));
  await seedDemoOwner(db, { anchor });

  return {
    programs: plans.length,
    users: userRows.length,
    testers: testers.length,
    sites: siteRows.length,
    owners: ownerRows.length,
    assemblies: assemblyRows.length,
    reports: reportRows.length,
    queued: reportRows.filter((r) => r.status === "queued").length,
    certificates: certificateRows.length,
    demoOwnerSites: demoOwnerSites.length,
  };
}
