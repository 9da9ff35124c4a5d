// Report submission under load: N testers at once, each filing its share of reports through
// POST /api/reports as the form does, then a check that every acknowledged submission is stored
// exactly once (and that replaying a submission stores nothing new). Afterwards the reports it
// filed are taken out again and the assemblies put back as they were, so the scale database is
// unchanged by the benchmark.
import { randomBytes } from "node:crypto";
import mysql from "mysql2/promise";
import { todayInZone } from "@/lib/programs/settings";
import { sessionCookie } from "./app-server";
import { percentile, round } from "./stats";

export interface SubmitFigures {
  submissions: number;
  testers: number;
  p50: number;
  p95: number;
  p99: number;
  perSecond: number;
  acknowledged: number;
  refused: Record<string, number>;
  storedOnce: number;
  duplicates: number;
  replaysStoredNothing: boolean;
}

type Row = Record<string, unknown>;

export async function benchSubmissions(options: {
  appUrl: string;
  databaseUrl: string;
  testers?: number;
  submissions?: number;
  /**
   * Unset: every tester files its share back to back (each waits for its last answer), so 50
   * testers keep 50 submissions in flight. Set: submissions arrive at this steady rate whatever
   * the answers, shared round the testers, and each latency counts from its due time.
   */
  ratePerSecond?: number;
}): Promise<SubmitFigures> {
  const testerCount = options.testers ?? 50;
  const total = options.submissions ?? 2000;
  const perTester = Math.ceil(total / testerCount);
  const c = await mysql.createConnection({ uri: options.databaseUrl, timezone: "Z", dateStrings: ["DATE"] });
  const started = new Date();
  try {
    const [testers] = (await c.query(
      `SELECT u.id, u.email, u.name, MIN(k.id) AS kitId FROM users u JOIN test_kits k ON k.tester_id = u.id
       WHERE u.role = 'tester' AND u.email LIKE 'tester%@scale.example' GROUP BY u.id ORDER BY u.id LIMIT ?`,
      [testerCount],
    )) as unknown as [{ id: number; email: string; name: string; kitId: number }[]];
    if (testers.length < testerCount) throw new Error(`the scale database has ${testers.length} testers with kits; ${testerCount} needed`);
    // Active RP assemblies whose last test is long enough ago that a test today is ordinary.
    const [targets] = (await c.query(`SELECT * FROM assemblies WHERE program_id = 1 AND kind = 'RP' AND status = 'active' ORDER BY id DESC LIMIT ?`, [total])) as unknown as [Row[]];
    if (targets.length < total) throw new Error(`the scale database has ${targets.length} active RP assemblies; ${total} needed`);
    const cookies = await Promise.all(testers.map((t) => sessionCookie(options.databaseUrl, t.email)));
    // "Today" is the program's date, as the server checks it.
    const [[program]] = (await c.query(`SELECT timezone FROM programs WHERE id = 1`)) as unknown as [[{ timezone: string }]];
    const today = todayInZone(program.timezone);

    const latencies: number[] = [];
    const refused: Record<string, number> = {};
    const acknowledgedKeys: string[] = [];
    const bodies: { cookie: string; body: string }[] = [];
    const submitOne = async (t: number, i: number, assembly: Row, dueAt: number) => {
      const tester = testers[t]!;
      const key = randomBytes(16).toString("hex");
      const body = JSON.stringify({
        idempotencyKey: key,
        assemblyId: assembly.id,
        kitId: tester.kitId,
        testedOn: today,
        testedTime: `${String(7 + (i % 10)).padStart(2, "0")}:${String((i * 7) % 60).padStart(2, "0")}`,
        reason: "annual",
        installation: "existing",
        orientationApproved: true,
        reliefPortAirGapOk: true,
        unit: "psid",
        linePressure: 60 + (i % 20),
        initial: { reliefValveOpeningPoint: 2.4 + (i % 10) / 10, check1Differential: 5.8 + (t % 10) / 10, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true },
        repairs: [],
        retest: null,
        remarks: "",
        attestation: { name: tester.name, confirmed: true },
      });
      const response = await fetch(`${options.appUrl}/api/reports`, { method: "POST", headers: { cookie: cookies[t]!, "content-type": "application/json", origin: options.appUrl }, body });
      await response.arrayBuffer();
      latencies.push(performance.now() - dueAt);
      if (response.status === 201) {
        acknowledgedKeys.push(key);
        if (bodies.length < 100) bodies.push({ cookie: cookies[t]!, body });
      } else refused[String(response.status)] = (refused[String(response.status)] ?? 0) + 1;
    };
    const wallStart = performance.now();
    if (options.ratePerSecond) {
      const intervalMs = 1000 / options.ratePerSecond;
      const inFlight: Promise<void>[] = [];
      for (let k = 0; k < total; k++) {
        const dueAt = wallStart + k * intervalMs;
        const wait = dueAt - performance.now();
        if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
        inFlight.push(submitOne(k % testerCount, Math.floor(k / testerCount), targets[k]!, dueAt));
      }
      await Promise.all(inFlight);
    } else {
      await Promise.all(
        testers.map(async (_tester, t) => {
          for (let i = 0; i < perTester; i++) {
            const assembly = targets[t * perTester + i];
            if (!assembly) return;
            await submitOne(t, i, assembly, performance.now());
          }
        }),
      );
    }
    const wallSeconds = (performance.now() - wallStart) / 1000;

    const countStored = async () => {
      const [[row]] = (await c.query(`SELECT COUNT(*) AS n, COUNT(DISTINCT idempotency_key) AS keys_ FROM test_reports WHERE idempotency_key IN (?)`, [acknowledgedKeys.length ? acknowledgedKeys : ["-"]])) as unknown as [[{ n: number; keys_: number }]];
      return { rows: Number(row.n), keys: Number(row.keys_) };
    };
    const stored = await countStored();
    // The same submissions again, as a retrying phone would send them: answered, stored nothing.
    for (const { cookie, body } of bodies) {
      await (await fetch(`${options.appUrl}/api/reports`, { method: "POST", headers: { cookie, "content-type": "application/json", origin: options.appUrl }, body })).arrayBuffer();
    }
    const afterReplay = await countStored();

    await restore(c, targets, acknowledgedKeys, testers.map((t) => t.id), started);
    return {
      submissions: latencies.length,
      testers: testers.length,
      p50: round(percentile(latencies, 50)),
      p95: round(percentile(latencies, 95)),
      p99: round(percentile(latencies, 99)),
      perSecond: round(latencies.length / wallSeconds),
      acknowledged: acknowledgedKeys.length,
      refused,
      storedOnce: stored.keys,
      duplicates: stored.rows - stored.keys,
      replaysStoredNothing: afterReplay.rows === stored.rows,
    };
  } finally {
    await c.end();
  }
}

/** Takes out what the benchmark filed and puts the assemblies' rows back as they were. */
async function restore(c: mysql.Connection, assemblies: Row[], keys: string[], testerIds: number[], since: Date): Promise<void> {
  const [reportRows] = (await c.query(`SELECT id FROM test_reports WHERE idempotency_key IN (?)`, [keys.length ? keys : ["-"]])) as unknown as [{ id: number }[]];
  const ids = reportRows.map((r) => r.id);
  await c.beginTransaction();
  try {
    if (ids.length) {
      const [refs] = (await c.query(
        `SELECT TABLE_NAME AS t, COLUMN_NAME AS col FROM information_schema.KEY_COLUMN_USAGE WHERE TABLE_SCHEMA = DATABASE() AND REFERENCED_TABLE_NAME = 'test_reports'`,
      )) as unknown as [{ t: string; col: string }[]];
      for (const ref of refs.filter((r) => r.t !== "test_reports")) await c.query(`DELETE FROM \`${ref.t}\` WHERE \`${ref.col}\` IN (?)`, [ids]);
      await c.query(`DELETE FROM test_reports WHERE id IN (?)`, [ids]);
    }
    await c.query(`DELETE FROM audit_log WHERE actor_id IN (?) AND at >= ?`, [testerIds, since]);
    for (const row of assemblies) {
      const { id, ...rest } = row;
      await c.query(`UPDATE assemblies SET ? WHERE id = ?`, [rest, id]);
    }
    await c.commit();
  } catch (error) {
    await c.rollback();
    throw error;
  }
}
