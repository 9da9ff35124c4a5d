import { datetime, index, int, json, mysqlEnum, mysqlTable, text } from "drizzle-orm/mysql-core";
import { attachments } from "./files";
import { programs } from "./programs";
import { users } from "./users";

/** An inventory CSV import; progress is written as it runs so the page can show a bar. */
export const importJobs = mysqlTable(
  "import_jobs",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true })
      .notNull()
      .references(() => programs.id),
    createdBy: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    fileId: int({ unsigned: true })
      .notNull()
      .references(() => attachments.id),
    errorFileId: int({ unsigned: true }).references(() => attachments.id),
    mapping: json().notNull(),
    status: mysqlEnum(["running", "finished", "failed"]).notNull(),
    totalRows: int({ unsigned: true }).notNull().default(0),
    processedRows: int({ unsigned: true }).notNull().default(0),
    insertedRows: int({ unsigned: true }).notNull().default(0),
    updatedRows: int({ unsigned: true }).notNull().default(0),
    unchangedRows: int({ unsigned: true }).notNull().default(0),
    failedRows: int({ unsigned: true }).notNull().default(0),
    message: text(),
    startedAt: datetime({ fsp: 3 }).notNull(),
    finishedAt: datetime({ fsp: 3 }),
  },
  (t) => [index("import_jobs_program_idx").on(t.programId, t.startedAt)],
);
