import { date, datetime, index, int, mysqlEnum, mysqlTable, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { attachments } from "./files";
import { users } from "./users";

/** A tester's certification; one account may hold a history of them (renewals). */
export const certifications = mysqlTable(
  "certifications",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    testerId: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    certifyingBody: varchar({ length: 160 }).notNull(),
    number: varchar({ length: 60 }).notNull(),
    issuedOn: date({ mode: "string" }),
    expiresOn: date({ mode: "string" }).notNull(),
    attachmentId: int({ unsigned: true }).references(() => attachments.id),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [index("certifications_tester_idx").on(t.testerId, t.expiresOn)],
);

/** A differential pressure gauge ("test kit") and its last accuracy verification. */
export const testKits = mysqlTable(
  "test_kits",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    testerId: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    make: varchar({ length: 80 }).notNull(),
    model: varchar({ length: 80 }).notNull(),
    serial: varchar({ length: 60 }).notNull(),
    lastVerifiedOn: date({ mode: "string" }).notNull(),
    verificationResult: mysqlEnum(["passed", "adjusted", "failed"]).notNull().default("passed"),
    verifiedBy: varchar({ length: 160 }).notNull().default(""),
    attachmentId: int({ unsigned: true }).references(() => attachments.id),
    retiredAt: datetime({ fsp: 3 }),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("test_kits_serial_uq").on(t.testerId, t.serial)],
);
