import "server-only";
import { getDb } from "@/db/client";

// Prepared statements of the hot paths, one per query shape: the SQL is built the first time a
// shape is asked for and reused after, with the values passed as placeholders. A statement
// belongs to the pool it was prepared on, so a new pool (tests, a restart of the client) starts
// afresh. Keys name the module and the shape, e.g. "queue.page|k||…".
const byPool = new WeakMap<object, Map<string, unknown>>();

export function prepared<T>(key: string, build: () => T): T {
  const db = getDb();
  let statements = byPool.get(db);
  if (!statements) {
    statements = new Map();
    byPool.set(db, statements);
  }
  let statement = statements.get(key) as T | undefined;
  if (statement === undefined) {
    statement = build();
    statements.set(key, statement);
  }
  return statement;
}
