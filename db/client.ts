import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { getEnv } from "@/lib/env";
import * as schema from "./schema";

export type Database = MySql2Database<typeof schema>;
/** The transaction handle drizzle passes to db.transaction callbacks. */
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type Executor = Database | Transaction;

interface Cached {
  pool: mysql.Pool;
  db: Database;
}

// Cached on globalThis so hot reload in development does not open a new pool per edit.
const holder = globalThis as unknown as { __zonewardDb?: Cached };

export function createPool(url: string, connectionLimit: number): mysql.Pool {
  return mysql.createPool({
    uri: url,
    connectionLimit,
    timezone: "Z",
    dateStrings: ["DATE"],
    decimalNumbers: true,
    supportBigNumbers: true,
    charset: "utf8mb4_unicode_ci",
    waitForConnections: true,
    queueLimit: 500,
    connectTimeout: 5_000,
    enableKeepAlive: true,
    // No stack captured at every query's call site (an Error per query, a measurable share of a
    // busy request): drizzle's query errors name the statement, and async stack traces still
    // lead back to the caller.
    trace: false,
  });
}

export function createDatabase(pool: mysql.Pool): Database {
  return drizzle({ client: pool, schema, mode: "default", casing: "snake_case" });
}

function connect(): Cached {
  if (!holder.__zonewardDb) {
    const env = getEnv();
    const pool = createPool(env.DATABASE_URL, env.DB_POOL_SIZE);
    holder.__zonewardDb = { pool, db: createDatabase(pool) };
  }
  return holder.__zonewardDb;
}

export function getDb(): Database {
  return connect().db;
}

export function getPool(): mysql.Pool {
  return connect().pool;
}

export async function closeDb(): Promise<void> {
  const cached = holder.__zonewardDb;
  holder.__zonewardDb = undefined;
  if (cached) await cached.pool.end();
}

export { schema };
