import { boolean, datetime, index, int, mysqlEnum, mysqlTable, smallint, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { programs } from "./programs";

export const roles = ["tester", "inspector", "admin", "owner"] as const;
export type Role = (typeof roles)[number];

/** A testing company; testers of one company may share one billing account. */
export const companies = mysqlTable("companies", {
  id: int({ unsigned: true }).autoincrement().primaryKey(),
  name: varchar({ length: 160 }).notNull(),
  phone: varchar({ length: 40 }).notNull().default(""),
  email: varchar({ length: 254 }).notNull().default(""),
  address: varchar({ length: 300 }).notNull().default(""),
  createdAt: datetime({ fsp: 3 }).notNull(),
});

export const users = mysqlTable(
  "users",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    /** Stored lower-cased; sign-in compares lower-cased. */
    email: varchar({ length: 254 }).notNull(),
    name: varchar({ length: 120 }).notNull(),
    phone: varchar({ length: 40 }).notNull().default(""),
    /** Null until an invited user sets a password. */
    passwordHash: varchar({ length: 255 }),
    role: mysqlEnum(roles).notNull(),
    /** Inspectors and admins belong to exactly one program; testers and owners to none. */
    programId: int({ unsigned: true }).references(() => programs.id),
    status: mysqlEnum(["active", "invited", "suspended", "disabled"]).notNull().default("active"),
    companyId: int({ unsigned: true }).references(() => companies.id),
    /** A tester who pays the company's filing fees. */
    isBillingManager: boolean().notNull().default(false),
    passwordChangedAt: datetime({ fsp: 3 }),
    lastSignInAt: datetime({ fsp: 3 }),
    createdAt: datetime({ fsp: 3 }).notNull(),
    updatedAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("users_email_uq").on(t.email), index("users_program_role_idx").on(t.programId, t.role), index("users_company_idx").on(t.companyId)],
);

/** Sessions: the id is the SHA-256 of the cookie's token, so a leaked table signs nobody in. */
export const sessions = mysqlTable(
  "sessions",
  {
    id: varchar({ length: 64 }).primaryKey(),
    userId: int({ unsigned: true })
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    expiresAt: datetime().notNull(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

/** Single-use e-mailed links and printed codes; only a hash of the secret is kept. */
export const authTokens = mysqlTable(
  "auth_tokens",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    tokenHash: varchar({ length: 64 }).notNull(),
    userId: int({ unsigned: true })
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    purpose: mysqlEnum(["password_reset", "invitation", "owner_link", "owner_code"]).notNull(),
    expiresAt: datetime({ fsp: 3 }).notNull(),
    usedAt: datetime({ fsp: 3 }),
    createdAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("auth_tokens_hash_uq").on(t.tokenHash), index("auth_tokens_user_idx").on(t.userId, t.purpose)],
);

/** Failed sign-in counting per key (an e-mail address or a client address), for throttling. */
export const signInThrottle = mysqlTable("sign_in_throttle", {
  key: varchar({ length: 300 }).primaryKey(),
  failures: smallint({ unsigned: true }).notNull().default(0),
  windowStartedAt: datetime({ fsp: 3 }).notNull(),
  lockedUntil: datetime({ fsp: 3 }),
});

/** A tester is approved by each program separately. */
export const testerApprovals = mysqlTable(
  "tester_approvals",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    testerId: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    status: mysqlEnum(["pending", "approved", "rejected", "suspended"]).notNull().default("pending"),
    reason: text(),
    decidedBy: int({ unsigned: true }).references(() => users.id),
    decidedAt: datetime({ fsp: 3 }),
    createdAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("tester_approvals_uq").on(t.programId, t.testerId), index("tester_approvals_status_idx").on(t.programId, t.status), index("tester_approvals_tester_idx").on(t.testerId)],
);

export type User = typeof users.$inferSelect;
