// The demo owner's situation, so the owner's portal has something to show on any anchor date:
// at their restaurant, an RP on the kitchen branch line that failed ten days ago (repair due
// soon: the notice batch sends a repair reminder) and a DC on the ice machine supply whose
// yearly test is overdue, with a newer test returned to the tester for correction. Their other
// assemblies keep the history the main demo gave them (accepted passes with certificates).
// Deterministic; demo data only.
import { and, asc, eq, like, sql } from "drizzle-orm";
import type { Database } from "@/db/client";
import * as t from "@/db/schema";
import { programRulesFromSettings, ruleSetForEdition } from "@/lib/programs/settings";
import { storeGrade } from "@/lib/reports/grade-storage";
import { readingsRowFromInput } from "@/lib/reports/readings-row";
import { addDays, addMonths, checkReportValidity, deriveAssemblyFacts, gradeReport, readingFingerprint, type AssemblyKind, type FieldTestInput, type Hazard } from "@/lib/rules";
import { demoAccounts } from "./demo-accounts";
import { createRandom } from "./random";
import { generateReadings } from "./readings";

interface Context {
  anchor: string;
}

export async function seedDemoOwner(db: Database, { anchor }: Context): Promise<{ assemblies: number; reports: number }> {
  const rng = createRandom(20261207);
  const [owner] = await db.select({ id: t.users.id }).from(t.users).where(eq(t.users.email, demoAccounts.owner)).limit(1);
  const [tester] = await db.select({ id: t.users.id, name: t.users.name, companyId: t.users.companyId }).from(t.users).where(eq(t.users.email, demoAccounts.tester)).limit(1);
  const [inspector] = await db.select({ id: t.users.id }).from(t.users).where(eq(t.users.email, demoAccounts.inspector)).limit(1);
  if (!owner || !tester || !inspector) return { assemblies: 0, reports: 0 };
  const [site] = await db
    .select({ site: t.sites })
    .from(t.owners)
    .innerJoin(t.siteOwners, eq(t.siteOwners.ownerId, t.owners.id))
    .innerJoin(t.sites, eq(t.sites.id, t.siteOwners.siteId))
    .where(and(eq(t.owners.userId, owner.id), eq(t.sites.programId, 1), eq(t.sites.facilityType, "Restaurant")))
    .orderBy(asc(t.sites.id))
    .limit(1);
  if (!site) return { assemblies: 0, reports: 0 };
  const [program] = await db.select({ program: t.programs, settings: t.programSettings }).from(t.programs).innerJoin(t.programSettings, eq(t.programSettings.programId, t.programs.id)).where(eq(t.programs.id, 1));
  const [certification] = await db.select().from(t.certifications).where(eq(t.certifications.testerId, tester.id)).limit(1);
  const [kit] = await db.select().from(t.testKits).where(eq(t.testKits.testerId, tester.id)).orderBy(asc(t.testKits.id)).limit(1);
  const [company] = tester.companyId ? await db.select({ name: t.companies.name }).from(t.companies).where(eq(t.companies.id, tester.companyId)) : [];
  if (!program || !certification || !kit) return { assemblies: 0, reports: 0 };
  const rules = programRulesFromSettings(program.settings);
  const ruleSet = ruleSetForEdition(program.settings.ruleSetEdition);
  const now = new Date();
  const s = site.site;
  const hazard: Hazard = s.hazard;

  const plans: { kind: AssemblyKind; make: string; model: string; size: string; serial: string; location: string; tests: { on: string; mode: "none" | "check1_low" | "check2_leak"; status: "accepted" | "returned"; reason?: string }[] }[] = [
    {
      kind: "RP",
      make: "Wrexfield",
      model: "W-R5",
      size: "1 in",
      serial: `WR${rng.int(100000, 999999)}`,
      location: "kitchen branch line",
      tests: [
        { on: addDays(addMonths(anchor, -12), 20), mode: "none", status: "accepted" },
        { on: addDays(anchor, -10), mode: "check1_low", status: "accepted" },
      ],
    },
    {
      kind: "DC",
      make: "Halvorne",
      model: "HV-DC2",
      size: "3/4 in",
      serial: `HV${rng.int(100000, 999999)}`,
      location: "ice machine supply",
      tests: [
        { on: addDays(addMonths(anchor, -24), -5), mode: "none", status: "accepted" },
        { on: addDays(addMonths(anchor, -12), -12), mode: "none", status: "accepted" },
        { on: addDays(anchor, -4), mode: "none", status: "returned", reason: "Readings are missing or incomplete" },
      ],
    },
  ];

  let reports = 0;
  for (const plan of plans) {
    const installedOn = addMonths(anchor, -60);
    const [created] = await db
      .insert(t.assemblies)
      .values({ programId: 1, siteId: s.id, kind: plan.kind, make: plan.make, model: plan.model, size: plan.size, serial: plan.serial, location: plan.location, hazard, installedOn, status: "active", createdAt: now, updatedAt: now })
      .$returningId();
    const assemblyId = created!.id;
    const history: { testedOn: string; outcome: "pass" | "fail"; accepted: boolean }[] = [];
    for (const test of plan.tests) {
      const initial: FieldTestInput = generateReadings(plan.kind, test.mode, rng);
      const grade = gradeReport({ initial, retest: null, ruleSet });
      const finalOutcome = grade.outcome === "pass" ? "pass" : "fail";
      const year = test.on.slice(0, 4);
      const prefix = `${program.program.reportPrefix}-${year}-`;
      const [highest] = await db
        .select({ n: sql<string>`MAX(${t.testReports.reportNumber})` })
        .from(t.testReports)
        .where(like(t.testReports.reportNumber, `${prefix}%`));
      const sequence = (highest?.n ? Number.parseInt(highest.n.slice(prefix.length), 10) : 0) + 1;
      const testedAt = new Date(`${test.on}T10:15:00Z`);
      const submittedAt = new Date(`${test.on}T20:40:00Z`);
      const decidedAt = new Date(submittedAt.getTime() + 26 * 3_600_000);
      const kitVerifiedOn = addDays(test.on, -90);
      const validity = checkReportValidity({ testDate: test.on, today: test.on, certificationExpiresOn: certification.expiresOn, kitVerifiedOn, installedOn, input: initial, linePressurePsi: 72, ruleSet });
      const [report] = await db
        .insert(t.testReports)
        .values({
          programId: 1,
          reportNumber: `${prefix}${String(sequence).padStart(6, "0")}`,
          revision: 1,
          assemblyId,
          testerId: tester.id,
          kitId: kit.id,
          certificationId: certification.id,
          status: test.status,
          assemblyKind: plan.kind,
          testedAt,
          testedOn: test.on,
          reason: "annual",
          installation: "existing",
          orientationApproved: true,
          reliefPortAirGapOk: plan.kind === "RP" ? true : null,
          linePressurePsi: 72,
          unit: "psid",
          ruleSetEdition: ruleSet.edition,
          remarks: finalOutcome === "fail" ? "Check #1 did not hold the minimum; owner told the assembly needs a rebuild." : null,
          assemblySnapshot: { kind: plan.kind, make: plan.make, model: plan.model, size: plan.size, serial: plan.serial, location: plan.location, hazard, siteName: s.name, address: `${s.addressLine1}, ${s.city}`, accountNumber: s.accountNumber },
          testerSnapshot: { name: tester.name, company: company?.name ?? null, certifyingBody: certification.certifyingBody, certificationNumber: certification.number, certificationExpiresOn: certification.expiresOn },
          kitSnapshot: { make: kit.make, model: kit.model, serial: kit.serial, lastVerifiedOn: kitVerifiedOn },
          initialOutcome: grade.initial.outcome,
          finalOutcome,
          wasRepaired: false,
          grade: storeGrade(grade),
          validity,
          signals: [],
          warningCount: validity.length,
          isClean: finalOutcome === "pass" && validity.length === 0,
          fingerprint: readingFingerprint(initial),
          attestedName: tester.name,
          attestedAt: submittedAt,
          submittedAt,
          idempotencyKey: `seed-owner-${assemblyId}-${test.on}`,
          decidedAt,
          decidedBy: inspector.id,
          verificationCode: rng.code(16),
          createdAt: submittedAt,
          updatedAt: decidedAt,
        })
        .$returningId();
      const reportId = report!.id;
      reports += 1;
      await db.insert(t.reportReadings).values({ reportId, phase: "initial", outcome: grade.initial.outcome, ...readingsRowFromInput(initial) });
      await db.insert(t.reviews).values({ reportId, inspectorId: inspector.id, decision: test.status, reasons: test.reason ? [test.reason] : [], note: test.status === "returned" ? "Check #2's reading is missing. Please add it and resubmit." : null, decidedAt });
      if (test.status === "accepted" && finalOutcome === "pass") await db.insert(t.certificates).values({ reportId, code: rng.code(12), issuedAt: decidedAt, issuedBy: inspector.id });
      history.push({ testedOn: test.on, outcome: finalOutcome, accepted: test.status === "accepted" });
    }
    const facts = deriveAssemblyFacts({ status: "active", installedOn, hazard, tests: history }, rules);
    await db
      .update(t.assemblies)
      .set({ baseState: facts.baseState, lastTestedOn: facts.lastTestedOn, lastOutcome: facts.lastOutcome, lastPassedOn: facts.lastPassedOn, nextDueOn: facts.nextDueOn, repairDueOn: facts.repairDueOn })
      .where(eq(t.assemblies.id, assemblyId));
  }
  return { assemblies: plans.length, reports };
}
