import { boolean, date, datetime, decimal, index, int, json, mysqlEnum, mysqlTable, primaryKey, smallint, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { certifications, testKits } from "./credentials";
import { assemblies, assemblyKinds } from "./inventory";
import { programs } from "./programs";
import { users } from "./users";

export const reportStatuses = ["awaiting_fee", "queued", "accepted", "returned", "superseded"] as const;
export type ReportStatus = (typeof reportStatuses)[number];
export const testReasons = ["annual", "installation", "repair", "relocation", "incident", "other"] as const;
export const repairComponents = ["check1", "check2", "relief_valve", "air_inlet", "check", "shutoff1", "shutoff2", "other"] as const;
export const repairParts = ["disc_rubber", "spring", "seat", "seat_o_ring", "cover_o_ring", "diaphragm", "relief_disc", "guide", "other"] as const;

/** Readings are DECIMAL with one decimal place in the unit the tester entered. */
const reading = () => decimal({ precision: 6, scale: 1, mode: "number" });
const inches = () => decimal({ precision: 6, scale: 2, mode: "number" });

/**
 * A filed field-test report. Snapshots of the assembly, tester and kit are kept on the row so a
 * report reads the same years later, whatever happens to the inventory or the tester's records.
 */
export const testReports = mysqlTable(
  "test_reports",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    /** Shared by every revision of one report, e.g. "LV-2026-004213". */
    reportNumber: varchar({ length: 24 }).notNull(),
    revision: smallint({ unsigned: true }).notNull().default(1),
    /** The returned revision this one corrects. */
    supersedesId: int({ unsigned: true }),
    /** The accepted report this one amends. */
    amendsId: int({ unsigned: true }),
    assemblyId: int({ unsigned: true })
      .notNull()
      .references(() => assemblies.id),
    testerId: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    kitId: int({ unsigned: true }).references(() => testKits.id),
    certificationId: int({ unsigned: true }).references(() => certifications.id),
    status: mysqlEnum(reportStatuses).notNull(),
    /** The kind of assembly tested (as in the snapshot), so the queue filters by kind from an index. */
    assemblyKind: mysqlEnum(assemblyKinds).notNull(),
    /** Local wall-clock time of the test as the tester entered it. */
    testedAt: datetime().notNull(),
    testedOn: date({ mode: "string" }).notNull(),
    reason: mysqlEnum(testReasons).notNull(),
    reasonNote: varchar({ length: 300 }).notNull().default(""),
    installation: mysqlEnum(["existing", "new", "replacement"]).notNull().default("existing"),
    previousSerial: varchar({ length: 60 }).notNull().default(""),
    orientationApproved: boolean(),
    reliefPortAirGapOk: boolean(),
    linePressurePsi: decimal({ precision: 5, scale: 1, mode: "number" }),
    unit: mysqlEnum(["psid", "kPa"]).notNull().default("psid"),
    ruleSetEdition: varchar({ length: 60 }).notNull(),
    remarks: text(),
    assemblySnapshot: json().notNull(),
    testerSnapshot: json().notNull(),
    kitSnapshot: json(),
    initialOutcome: mysqlEnum(["pass", "fail", "incomplete"]).notNull(),
    finalOutcome: mysqlEnum(["pass", "fail"]).notNull(),
    wasRepaired: boolean().notNull().default(false),
    /** The server's own grade (lib/rules), initial and retest, with a finding per rule. */
    grade: json().notNull(),
    /** Validity issues and suspicious-report signals found at submission. */
    validity: json().notNull(),
    signals: json().notNull(),
    warningCount: smallint({ unsigned: true }).notNull().default(0),
    /** A pass with no warning and no signal: eligible for "accept all clean passes". */
    isClean: boolean().notNull().default(false),
    /** Readings to the tenth, canonical, for spotting copied readings with an index. */
    fingerprint: varchar({ length: 120 }).notNull(),
    attestedName: varchar({ length: 120 }).notNull(),
    attestedAt: datetime({ fsp: 3 }).notNull(),
    submittedAt: datetime({ fsp: 3 }).notNull(),
    idempotencyKey: varchar({ length: 64 }).notNull(),
    feeCents: int({ unsigned: true }).notNull().default(0),
    feeCurrency: varchar({ length: 3 }).notNull().default("USD"),
    feeStatus: mysqlEnum(["none", "owed", "paid", "waived", "refunded"]).notNull().default("none"),
    decidedAt: datetime({ fsp: 3 }),
    decidedBy: int({ unsigned: true }).references(() => users.id),
    verificationCode: varchar({ length: 32 }).notNull(),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [
    uniqueIndex("test_reports_number_uq").on(t.reportNumber, t.revision),
    uniqueIndex("test_reports_idempotency_uq").on(t.testerId, t.idempotencyKey),
    uniqueIndex("test_reports_verification_uq").on(t.verificationCode),
    index("test_reports_queue_idx").on(t.programId, t.status, t.submittedAt),
    index("test_reports_queue_kind_idx").on(t.programId, t.status, t.assemblyKind, t.submittedAt),
    index("test_reports_tester_idx").on(t.testerId, t.submittedAt),
    index("test_reports_tester_time_idx").on(t.testerId, t.testedAt),
    index("test_reports_assembly_idx").on(t.assemblyId, t.testedOn),
    index("test_reports_program_date_idx").on(t.programId, t.testedOn),
    // Covers the monthly tally and the yearly summary's read (date range → assembly, status and
    // outcomes) so both are index-only scans instead of a row lookup per report.
    index("test_reports_tally_idx").on(t.programId, t.testedOn, t.status, t.assemblyId, t.initialOutcome, t.finalOutcome),
    index("test_reports_fingerprint_idx").on(t.programId, t.testedOn, t.fingerprint),
  ],
);

/** One row per phase: the initial test and, after a repair, the retest. */
export const reportReadings = mysqlTable(
  "report_readings",
  {
    reportId: int({ unsigned: true })
      .notNull()
      .references(() => testReports.id),
    phase: mysqlEnum(["initial", "retest"]).notNull(),
    reliefOpening: reading(),
    reliefDidNotOpen: boolean(),
    check1: reading(),
    check1Tight: boolean(),
    check2: reading(),
    check2Tight: boolean(),
    shutoff2Tight: boolean(),
    airInletOpening: reading(),
    airInletDidNotOpen: boolean(),
    airInletFullyOpen: boolean(),
    checkDifferential: reading(),
    checkTight: boolean(),
    airGapInches: inches(),
    pipeDiameterInches: inches(),
    nearSideWall: boolean(),
    outcome: mysqlEnum(["pass", "fail", "incomplete"]).notNull(),
  },
  (t) => [primaryKey({ columns: [t.reportId, t.phase] })],
);

export const reportRepairs = mysqlTable(
  "report_repairs",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    reportId: int({ unsigned: true })
      .notNull()
      .references(() => testReports.id),
    component: mysqlEnum(repairComponents).notNull(),
    part: mysqlEnum(repairParts).notNull(),
    action: mysqlEnum(["cleaned", "replaced"]).notNull(),
    note: varchar({ length: 300 }).notNull().default(""),
  },
  (t) => [index("report_repairs_report_idx").on(t.reportId)],
);

/** A tester's unfinished report, saved as they type; keyed by the device's own id for it. */
export const reportDrafts = mysqlTable(
  "report_drafts",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    testerId: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    clientKey: varchar({ length: 64 }).notNull(),
    programId: int({ unsigned: true }).references(() => programs.id),
    assemblyId: int({ unsigned: true }).references(() => assemblies.id),
    /** The report this draft corrects or amends, if any. */
    basedOnReportId: int({ unsigned: true }),
    data: json().notNull(),
    /** Client-side change counter: an older save never overwrites a newer one. */
    clientRevision: int({ unsigned: true }).notNull().default(0),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("report_drafts_key_uq").on(t.testerId, t.clientKey), index("report_drafts_tester_idx").on(t.testerId, t.updatedAt)],
);

/** An inspector's decision. One per report revision: the unique key makes a double decision impossible. */
export const reviews = mysqlTable(
  "reviews",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    reportId: int({ unsigned: true })
      .notNull()
      .references(() => testReports.id),
    inspectorId: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    decision: mysqlEnum(["accepted", "returned"]).notNull(),
    reasons: json().notNull(),
    note: text(),
    decidedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("reviews_report_uq").on(t.reportId), index("reviews_inspector_idx").on(t.inspectorId, t.decidedAt)],
);

/** A compliance certificate for an accepted passing test; re-issuing supersedes the old code. */
export const certificates = mysqlTable(
  "certificates",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    reportId: int({ unsigned: true })
      .notNull()
      .references(() => testReports.id),
    code: varchar({ length: 32 }).notNull(),
    issuedAt: datetime({ fsp: 3 }).notNull(),
    issuedBy: int({ unsigned: true }).references(() => users.id),
    supersededAt: datetime({ fsp: 3 }),
  },
  (t) => [uniqueIndex("certificates_code_uq").on(t.code), index("certificates_report_idx").on(t.reportId)],
);

/**
 * The last report number handed out per program and year ("QV-2026-000123" → 123). Allocation
 * locks this one row, so concurrent submissions get consecutive numbers and never the same one.
 */
export const reportNumberSequences = mysqlTable(
  "report_number_sequences",
  {
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    year: smallint({ unsigned: true }).notNull(),
    lastNumber: int({ unsigned: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.programId, t.year] })],
);

export type TestReport = typeof testReports.$inferSelect;
export type TestReportInsert = typeof testReports.$inferInsert;
export type ReportReadingsRow = typeof reportReadings.$inferSelect;
export type ReportRepairInsert = typeof reportRepairs.$inferInsert;
