// The same query issued directly with mysql2 by N concurrent clients for a fixed time: the
// floor the HTTP figure is compared with ("vs"), measured in the same run.
import mysql from "mysql2/promise";
import { median, percentile, round } from "./stats";

export interface DirectFigures {
  p50: number;
  p95: number;
  p99: number;
  queriesPerSecond: number;
}

export async function benchDirect(options: { databaseUrl: string; sql: string; params?: unknown[]; connections?: number; seconds?: number; runs?: number; multiStatement?: boolean }): Promise<DirectFigures> {
  const connections = options.connections ?? 32;
  const pool = mysql.createPool({ uri: options.databaseUrl, connectionLimit: connections, timezone: "Z", dateStrings: ["DATE"], multipleStatements: options.multiStatement ?? false });
  const runs: DirectFigures[] = [];
  try {
    for (let run = 0; run < (options.runs ?? 3); run++) {
      const latencies: number[] = [];
      const deadline = performance.now() + (options.seconds ?? 8) * 1000;
      await Promise.all(
        Array.from({ length: connections }, async () => {
          while (performance.now() < deadline) {
            const start = performance.now();
            await pool.query(options.sql, options.params);
            latencies.push(performance.now() - start);
          }
        }),
      );
      runs.push({ p50: percentile(latencies, 50), p95: percentile(latencies, 95), p99: percentile(latencies, 99), queriesPerSecond: latencies.length / (options.seconds ?? 8) });
    }
  } finally {
    await pool.end();
  }
  return { p50: round(median(runs.map((r) => r.p50)), 2), p95: round(median(runs.map((r) => r.p95)), 2), p99: round(median(runs.map((r) => r.p99)), 2), queriesPerSecond: round(median(runs.map((r) => r.queriesPerSecond))) };
}
