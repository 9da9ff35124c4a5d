import { boolean, char, date, datetime, index, int, json, mysqlEnum, mysqlTable, smallint, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";

/** A purveyor's cross-connection control program. Every program-scoped row points here. */
export const programs = mysqlTable(
  "programs",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    slug: varchar({ length: 40 }).notNull(),
    name: varchar({ length: 160 }).notNull(),
    shortName: varchar({ length: 40 }).notNull(),
    /** Two or three letters that prefix report numbers, e.g. "LV". */
    reportPrefix: varchar({ length: 6 }).notNull(),
    timezone: varchar({ length: 64 }).notNull().default("UTC"),
    contactEmail: varchar({ length: 254 }).notNull(),
    replyToEmail: varchar({ length: 254 }).notNull(),
    phone: varchar({ length: 40 }).notNull().default(""),
    mailingAddress: varchar({ length: 300 }).notNull().default(""),
    createdAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("programs_slug_uq").on(t.slug), uniqueIndex("programs_prefix_uq").on(t.reportPrefix)],
);

/** One row per program; every value is a program decision (defaults follow common practice). */
export const programSettings = mysqlTable("program_settings", {
  programId: int({ unsigned: true })
    .primaryKey()
    .references(() => programs.id),
  testIntervalMonths: smallint().notNull().default(12),
  dueModel: mysqlEnum(["anniversary", "window"]).notNull().default("anniversary"),
  /** MM-DD, used when dueModel is "window". */
  windowStart: char({ length: 5 }).notNull().default("01-01"),
  windowEnd: char({ length: 5 }).notNull().default("05-31"),
  dueSoonDays: smallint().notNull().default(30),
  repairDaysSevere: smallint().notNull().default(14),
  repairDaysHigh: smallint().notNull().default(14),
  repairDaysLow: smallint().notNull().default(30),
  reportDeadlineDays: smallint().notNull().default(10),
  reminderDaysBefore: smallint().notNull().default(30),
  overdueDaysAfter: smallint().notNull().default(1),
  finalDaysAfter: smallint().notNull().default(30),
  repairReminderDaysBefore: smallint().notNull().default(7),
  /** The final notice names the date after which service may be discontinued, this many days after it goes out (local sequences such as 45 / 30 / 15 days [S]). */
  discontinueDaysAfterFinal: smallint().notNull().default(15),
  filingFeeCents: int({ unsigned: true }).notNull().default(0),
  currency: char({ length: 3 }).notNull().default("USD"),
  units: mysqlEnum(["psid", "kPa"]).notNull().default("psid"),
  ruleSetEdition: varchar({ length: 60 }).notNull(),
  /** What happens when the kit's accuracy check is older than the rule set allows. */
  kitPolicy: mysqlEnum(["refuse", "flag"]).notNull().default("refuse"),
  updatedAt: datetime({ fsp: 3 }).notNull(),
  updatedBy: int({ unsigned: true }),
  /** Set with a change that moves due dates, cleared once every assembly has been recomputed: a recompute cut short is finished by the next one (the notice run starts with it). */
  factsPendingSince: datetime({ fsp: 3 }),
  /** The recompute under way: assemblies done of the program's total, and when it last moved on (a stale time means it was cut short). */
  factsRecomputeDone: int({ unsigned: true }),
  factsRecomputeTotal: int({ unsigned: true }),
  factsRecomputeAt: datetime({ fsp: 3 }),
});

/** A program's own rule-set edition (stricter local minimums, or a documented variance). */
export const localRuleSets = mysqlTable(
  "local_rule_sets",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    edition: varchar({ length: 60 }).notNull(),
    label: varchar({ length: 160 }).notNull(),
    data: json().notNull(),
    adoptedOn: date({ mode: "string" }).notNull(),
    createdAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("local_rule_sets_edition_uq").on(t.programId, t.edition)],
);

/** The reasons an inspector can pick when returning a report; kept by the admin. */
export const returnReasons = mysqlTable(
  "return_reasons",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    label: varchar({ length: 200 }).notNull(),
    guidance: text(),
    isActive: boolean().notNull().default(true),
    sortOrder: smallint().notNull().default(0),
  },
  (t) => [index("return_reasons_program_idx").on(t.programId, t.isActive, t.sortOrder)],
);
