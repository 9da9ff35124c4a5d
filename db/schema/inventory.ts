import { boolean, date, datetime, index, int, mysqlEnum, mysqlTable, primaryKey, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { programs } from "./programs";
import { users } from "./users";

export const assemblyKinds = ["RP", "RPDA", "DC", "DCDA", "PVB", "SVB", "AG"] as const;
export const hazards = ["severe", "high", "low"] as const;
export const assemblyStatuses = ["active", "awaiting_confirmation", "removed", "replaced"] as const;

export const sites = mysqlTable(
  "sites",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    accountNumber: varchar({ length: 40 }).notNull(),
    name: varchar({ length: 160 }).notNull(),
    addressLine1: varchar({ length: 200 }).notNull(),
    addressLine2: varchar({ length: 200 }).notNull().default(""),
    city: varchar({ length: 100 }).notNull(),
    postalCode: varchar({ length: 20 }).notNull().default(""),
    /** Degree of hazard of the premises (containment at the service connection). */
    hazard: mysqlEnum(hazards).notNull().default("low"),
    facilityType: varchar({ length: 60 }).notNull().default(""),
    contactName: varchar({ length: 120 }).notNull().default(""),
    contactPhone: varchar({ length: 40 }).notNull().default(""),
    notes: text(),
    isActive: boolean().notNull().default(true),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [
    uniqueIndex("sites_account_uq").on(t.programId, t.accountNumber),
    index("sites_address_idx").on(t.programId, t.addressLine1),
    index("sites_name_idx").on(t.programId, t.name),
  ],
);

/** An owner or manager contact within one program; may be linked to a sign-in account. */
export const owners = mysqlTable(
  "owners",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    name: varchar({ length: 160 }).notNull(),
    email: varchar({ length: 254 }),
    phone: varchar({ length: 40 }).notNull().default(""),
    mailingAddress: varchar({ length: 300 }).notNull().default(""),
    userId: int({ unsigned: true }).references(() => users.id),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [index("owners_program_email_idx").on(t.programId, t.email), index("owners_user_idx").on(t.userId)],
);

export const siteOwners = mysqlTable(
  "site_owners",
  {
    siteId: int({ unsigned: true })
      .notNull()
      .references(() => sites.id),
    ownerId: int({ unsigned: true })
      .notNull()
      .references(() => owners.id),
    relation: mysqlEnum(["owner", "manager"]).notNull().default("owner"),
    /** The contact that receives the program's notices for this site. */
    receivesNotices: boolean().notNull().default(true),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.ownerId] }), index("site_owners_owner_idx").on(t.ownerId)],
);

export const assemblies = mysqlTable(
  "assemblies",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    siteId: int({ unsigned: true })
      .notNull()
      .references(() => sites.id),
    kind: mysqlEnum(assemblyKinds).notNull(),
    make: varchar({ length: 80 }).notNull().default(""),
    model: varchar({ length: 80 }).notNull().default(""),
    /** Nominal size as the trade writes it, e.g. "3/4 in", "2 in". */
    size: varchar({ length: 20 }).notNull().default(""),
    serial: varchar({ length: 60 }).notNull().default(""),
    /** Where on the site, e.g. "meter vault at the street", "kitchen branch line". */
    location: varchar({ length: 200 }).notNull().default(""),
    hazard: mysqlEnum(hazards).notNull().default("low"),
    backpressurePossible: boolean().notNull().default(false),
    installedOn: date({ mode: "string" }),
    status: mysqlEnum(assemblyStatuses).notNull().default("active"),
    removedOn: date({ mode: "string" }),
    replacedById: int({ unsigned: true }),
    /** A field registration merged into an existing assembly: its reports moved there; it counts nowhere. */
    mergedIntoId: int({ unsigned: true }),
    /** The tester who registered it from the field, when not yet confirmed. */
    registeredBy: int({ unsigned: true }).references(() => users.id),
    notes: text(),
    // Derived facts, recomputed by lib/rules in the transaction that changes the history.
    /** lib/rules' base state: "failed" while awaiting repair, "inactive" out of service or unconfirmed. */
    baseState: mysqlEnum(["active", "failed", "inactive"]).notNull().default("active"),
    lastTestedOn: date({ mode: "string" }),
    lastOutcome: mysqlEnum(["pass", "fail"]),
    lastPassedOn: date({ mode: "string" }),
    nextDueOn: date({ mode: "string" }),
    repairDueOn: date({ mode: "string" }),
    /** Furthest notice sent for the current due cycle. */
    noticeStage: mysqlEnum(["reminder", "overdue", "final"]),
    noticeCycle: date({ mode: "string" }),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [
    index("assemblies_site_idx").on(t.siteId),
    index("assemblies_serial_idx").on(t.programId, t.serial),
    index("assemblies_make_serial_idx").on(t.programId, t.make, t.serial),
    // Every compliance count is one range scan on one of these two (see lib/rules compliance states).
    index("assemblies_due_idx").on(t.programId, t.baseState, t.nextDueOn),
    index("assemblies_repair_idx").on(t.programId, t.baseState, t.repairDueOn),
    index("assemblies_kind_idx").on(t.programId, t.kind, t.hazard),
  ],
);


export type Site = typeof sites.$inferSelect;
export type Assembly = typeof assemblies.$inferSelect;
export type Owner = typeof owners.$inferSelect;
