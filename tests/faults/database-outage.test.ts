// The database goes away under a steady stream of submissions and comes back: requests during
// the outage fail cleanly (503 with a retry message), the app recovers by itself, and every
// acknowledged submission is stored exactly once with nothing half written.
import { and, inArray, sql } from "drizzle-orm";
import { afterAll, describe, expect, test } from "vitest";
import { reportReadings, testReports } from "@/db/schema";
import { closeTestDb, testDb } from "../helpers/db";
import { isDatabaseServerAvailable, startDatabaseServer, stopDatabaseServer } from "../helpers/database-server";
import { api, as } from "../helpers/http";
import { createAssembly, createTester, rpSubmission } from "../integration/tester-fixtures";

afterAll(closeTestDb);

interface Outcome {
  key: string;
  statuses: number[];
  reportId: number | null;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe.runIf(isDatabaseServerAvailable())("a database outage during submissions", () => {
  test("fails cleanly, recovers by itself, loses nothing and duplicates nothing", async () => {
    const testers = await Promise.all([0, 1, 2, 3].map(() => createTester({ programIds: [1] })));
    const sessions = await Promise.all(testers.map((t) => as(t.email)));
    const perTester = 12;
    const assembliesByTester = await Promise.all(testers.map(() => Promise.all(Array.from({ length: perTester }, () => createAssembly({ programId: 1 })))));
    // The pool's connections to the test database itself also go; let it reconnect later.
    await closeTestDb();

    let outageSeen503 = 0;
    let retryMessage = "";
    const outcomes: Outcome[] = [];
    let isDown = false;

    const submitter = async (index: number) => {
      const tester = testers[index]!;
      for (const assembly of assembliesByTester[index]!) {
        const body = rpSubmission({ assemblyId: assembly.id, kitId: tester.kitId, testerName: tester.name });
        const outcome: Outcome = { key: body.idempotencyKey, statuses: [], reportId: null };
        outcomes.push(outcome);
        // Like the form: retry the same submission (same key) until it is acknowledged.
        for (let attempt = 0; attempt < 60 && outcome.reportId === null; attempt++) {
          const response = await sessions[index]!.post("/api/reports", body).timeout(15_000).catch(() => null);
          outcome.statuses.push(response?.status ?? 0);
          if (response && (response.status === 200 || response.status === 201)) outcome.reportId = Number(response.body.id ?? response.body.reportId);
          else {
            if (response?.status === 503) {
              outageSeen503 += 1;
              retryMessage = String(response.body.error ?? "");
              expect(response.headers["retry-after"]).toBeDefined();
            } else if (response) expect(response.status, JSON.stringify(response.body)).toBe(503);
            await sleep(isDown ? 400 : 150);
          }
        }
        await sleep(120);
      }
    };

    const load = Promise.all(testers.map((_, i) => submitter(i)));
    await sleep(1500);
    isDown = true;
    await stopDatabaseServer();
    await sleep(3000);
    const duringOutage = await api().get("/api/health");
    expect(duringOutage.status).toBe(503);
    await startDatabaseServer();
    isDown = false;
    const backAt = Date.now();
    let recoveredAfterMs = -1;
    for (let i = 0; i < 100; i++) {
      const health = await api().get("/api/health");
      if (health.status === 200) {
        recoveredAfterMs = Date.now() - backAt;
        break;
      }
      await sleep(200);
    }
    expect(recoveredAfterMs, "the app answers again within seconds of the database").toBeGreaterThanOrEqual(0);
    expect(recoveredAfterMs).toBeLessThan(20_000);
    await load;

    expect(outageSeen503, "some submissions met the outage").toBeGreaterThan(0);
    expect(retryMessage).toMatch(/try again/i);
    expect(outcomes.every((o) => o.reportId !== null), "every submission was acknowledged in the end").toBe(true);

    const db = testDb();
    const keys = outcomes.map((o) => o.key);
    const stored = await db.select({ id: testReports.id, key: testReports.idempotencyKey }).from(testReports).where(and(inArray(testReports.idempotencyKey, keys), inArray(testReports.testerId, testers.map((t) => t.id))));
    expect(stored.length, "each acknowledged submission is stored exactly once").toBe(keys.length);
    expect(new Set(stored.map((s) => s.key)).size).toBe(keys.length);
    for (const o of outcomes) expect(stored.find((s) => s.key === o.key)?.id).toBe(o.reportId);
    const [withoutReadings] = await db
      .select({ n: sql<number>`COUNT(*)` })
      .from(testReports)
      .where(and(inArray(testReports.id, stored.map((s) => s.id)), sql`NOT EXISTS (SELECT 1 FROM ${reportReadings} WHERE ${reportReadings.reportId} = ${testReports.id} AND ${reportReadings.phase} = 'initial')`));
    expect(Number(withoutReadings!.n), "no report is half written").toBe(0);
  }, 180_000);
});
