import { datetime, index, int, mysqlEnum, mysqlTable, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { users } from "./users";

/** Metadata of an uploaded file; the bytes live under the data directory (lib/storage). */
export const attachments = mysqlTable(
  "attachments",
  {
    id: int({ unsigned: true }).autoincrement().primaryKey(),
    uploadedBy: int({ unsigned: true })
      .notNull()
      .references(() => users.id),
    purpose: mysqlEnum(["certification", "kit_verification", "inventory_import", "import_errors", "other"]).notNull(),
    originalName: varchar({ length: 255 }).notNull(),
    /** The type sniffed from the file's content, never the one the browser claimed. */
    contentType: varchar({ length: 100 }).notNull(),
    sizeBytes: int({ unsigned: true }).notNull(),
    sha256: varchar({ length: 64 }).notNull(),
    /** Opaque name under the storage root; never built from user input. */
    storageKey: varchar({ length: 100 }).notNull(),
    createdAt: datetime({ fsp: 3 }).notNull(),
  },
  (t) => [uniqueIndex("attachments_storage_key_uq").on(t.storageKey), index("attachments_uploader_idx").on(t.uploadedBy)],
);
