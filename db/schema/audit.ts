import { bigint, datetime, index, int, json, mysqlTable, varchar } from "drizzle-orm/mysql-core";

/** Append-only: the data layer inserts and never updates or deletes a row here. */
export const auditLog = mysqlTable(
  "audit_log",
  {
    id: bigint({ mode: "number", unsigned: true }).autoincrement().primaryKey(),
    programId: int({ unsigned: true }),
    actorId: int({ unsigned: true }),
    action: varchar({ length: 80 }).notNull(),
    entityType: varchar({ length: 40 }).notNull(),
    entityId: varchar({ length: 40 }).notNull(),
    before: json(),
    after: json(),
    at: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [index("audit_program_at_idx").on(t.programId, t.at), index("audit_entity_idx").on(t.entityType, t.entityId), index("audit_actor_idx").on(t.actorId, t.at)],
);
