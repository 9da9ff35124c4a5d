import { date, datetime, index, int, mysqlEnum, mysqlTable, smallint, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { assemblies, owners } from "./inventory";
import { programs } from "./programs";
import { users } from "./users";

export const noticeKinds = ["reminder", "overdue", "final", "repair_reminder"] as const;

/**
 * Every planned notice is written here before it is sent; the unique key
 * (assembly, kind, due cycle, recipient) is what makes a re-run send nothing twice.
 */
export const notices = mysqlTable(
  "notices",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    assemblyId: int({ unsigned: true })
      .notNull()
      .references(() => assemblies.id),
    kind: mysqlEnum(noticeKinds).notNull(),
    dueCycle: date({ mode: "string" }).notNull(),
    noticeKey: varchar({ length: 120 }).notNull(),
    ownerId: int({ unsigned: true }).references(() => owners.id),
    channel: mysqlEnum(["email", "letter"]).notNull(),
    recipientEmail: varchar({ length: 254 }),
    /** "withdrawn": recorded but no longer needed when its turn came (the assembly was tested, or a later stage took over). */
    status: mysqlEnum(["pending", "sent", "failed", "letter_ready", "letter_printed", "withdrawn"]).notNull().default("pending"),
    attempts: smallint({ unsigned: true }).notNull().default(0),
    nextAttemptAt: datetime({ fsp: 3 }),
    lastError: text(),
    messageId: varchar({ length: 120 }),
    /**
     * Set while the notice is part of a batch handed to the mail service: the batch's
     * idempotency key. A run that dies before the answer is recorded leaves it set, and the
     * next run sends the same batch under the same key, so the service delivers it once.
     */
    batchKey: varchar({ length: 64 }),
    plannedOn: date({ mode: "string" }).notNull(),
    sentAt: datetime({ fsp: 3 }),
    runId: int({ unsigned: true }),
    createdAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [
    uniqueIndex("notices_key_uq").on(t.noticeKey),
    index("notices_batch_idx").on(t.batchKey),
    index("notices_status_idx").on(t.programId, t.status, t.nextAttemptAt),
    index("notices_assembly_idx").on(t.assemblyId, t.dueCycle),
    index("notices_planned_idx").on(t.programId, t.plannedOn),
  ],
);

export const noticeRuns = mysqlTable(
  "notice_runs",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    runOn: date({ mode: "string" }).notNull(),
    startedBy: int({ unsigned: true }).references(() => users.id),
    trigger: mysqlEnum(["schedule", "button"]).notNull(),
    status: mysqlEnum(["running", "finished", "failed", "skipped"]).notNull(),
    planned: int({ unsigned: true }).notNull().default(0),
    sent: int({ unsigned: true }).notNull().default(0),
    failed: int({ unsigned: true }).notNull().default(0),
    letters: int({ unsigned: true }).notNull().default(0),
    total: int({ unsigned: true }).notNull().default(0),
    log: text(),
    /** The day's letters (a PDF in the file store), when the run produced any. */
    lettersStorageKey: varchar({ length: 100 }),
    startedAt: datetime({ fsp: 3 }).notNull(),
    finishedAt: datetime({ fsp: 3 }),
  },
  (t) => [index("notice_runs_program_idx").on(t.programId, t.startedAt)],
);

/** A named lease: whoever holds it (until it expires) is the only one running that job. */
export const jobLeases = mysqlTable("job_leases", {
  name: varchar({ length: 100 }).primaryKey(),
  holder: varchar({ length: 100 }).notNull(),
  expiresAt: datetime({ fsp: 3 }).notNull(),
});
