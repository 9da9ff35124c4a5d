/**
 * The staff pages' queries at the scale PRODUCT design targets: a scratch program with 150,000
 * assemblies and 1.5 million reports (2,000 of them waiting for review), built with
 * INSERT … SELECT from MariaDB's sequence engine. Prints each query's plan (EXPLAIN: the index
 * used and the rows examined) and its median time over 7 runs, times the data layer's own
 * functions (queue page, compliance picture, monthly chart, yearly summary, facts recompute),
 * then removes the scratch program. Not a test: nothing here asserts.
 *
 *   DATA_DIR=.data DB_PORT=3307 bash scripts/with-db.sh bench/inspector-queries.ts [--keep]
 */
import { performance } from "node:perf_hooks";
import type { Actor } from "@/lib/auth/permissions";


const KEEP = process.argv.includes("--keep");
const ASSEMBLIES = 150_000;
const REPORTS_PER_ASSEMBLY = 10;
const QUEUED = 2_000;

async function load() {
  const [drizzle, client, schema, queue, compliance, summary, facts, settings] = await Promise.all([
    import("drizzle-orm"),
    import("@/db/client"),
    import("@/db/schema"),
    import("@/lib/data/review-queue"),
    import("@/lib/data/compliance"),
    import("@/lib/data/summary"),
    import("@/lib/data/inventory-facts"),
    import("@/lib/programs/settings"),
  ]);
  return { ...drizzle, ...client, ...schema, queue, compliance, summary, facts, settings };
}
type Deps = Awaited<ReturnType<typeof load>>;

async function raw(d: Deps, sqlText: string, params: unknown[] = []): Promise<Record<string, unknown>[]> {
  const [rows] = await d.getPool().query(sqlText, params);
  return rows as Record<string, unknown>[];
}

async function median(work: () => Promise<unknown>, runs = 7): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const started = performance.now();
    await work();
    times.push(performance.now() - started);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)]!;
}

async function build(d: Deps): Promise<{ programId: number; testerId: number; actor: Actor; today: string }> {
  const stamp = Date.now().toString(36);
  const now = new Date();
  const db = d.getDb();
  const [program] = await db.insert(d.programs).values({ slug: `scale-${stamp}`, name: `Scale Test District ${stamp}`, shortName: "Scale", reportPrefix: `S${stamp.slice(-4).toUpperCase()}`, timezone: "Etc/GMT+6", contactEmail: "scale@scale.example", replyToEmail: "scale@scale.example", createdAt: now }).$returningId();
  const programId = program!.id;
  await db.insert(d.programSettings).values({ programId, ruleSetEdition: "published-current", updatedAt: now });
  const [user] = await db.insert(d.users).values({ email: `scale-${stamp}@scale.example`, name: "Scale Inspector", role: "inspector", programId, status: "active", createdAt: now, updatedAt: now }).$returningId();
  const [tester] = await db.insert(d.users).values({ email: `scale-tester-${stamp}@scale.example`, name: "Scale Tester", role: "tester", status: "active", createdAt: now, updatedAt: now }).$returningId();
  const today = d.settings.todayInZone("Etc/GMT+6");
  const t0 = performance.now();
  // 100,000 sites, 150,000 assemblies (1.5 per site); facts spread over the compliance states.
  await raw(d, `INSERT INTO sites (program_id, account_number, name, address_line1, city, hazard, facility_type, created_at, updated_at)
    SELECT ?, CONCAT('SC', LPAD(seq, 7, '0')), CONCAT('Scale site ', seq), CONCAT(seq MOD 900 + 10, ' Thistlecombe Lane'), 'Quillmere', ELT(1 + seq MOD 3, 'low', 'high', 'low'), ELT(1 + seq MOD 4, 'Office building', 'Restaurant', 'Lawn irrigation', 'Laundry'), NOW(3), NOW(3)
    FROM seq_1_to_100000`, [programId]);
  const [{ first }] = (await raw(d, "SELECT MIN(id) AS first FROM sites WHERE program_id = ?", [programId])) as [{ first: number }];
  await raw(d, `INSERT INTO assemblies (program_id, site_id, kind, make, model, serial, location, hazard, installed_on, status, base_state, last_tested_on, last_outcome, last_passed_on, next_due_on, repair_due_on, created_at, updated_at)
    SELECT ?, ? + (seq - 1) DIV 3 * 2 + (seq - 1) MOD 3 DIV 2, ELT(1 + seq MOD 4, 'RP', 'DC', 'PVB', 'RP'), 'Tallowmere', 'TR-4', CONCAT('SC', seq), 'meter vault', ELT(1 + seq MOD 3, 'low', 'high', 'low'), DATE_SUB(?, INTERVAL 3000 DAY),
      IF(seq MOD 97 = 0, 'removed', 'active'), IF(seq MOD 97 = 0, 'inactive', IF(seq MOD 41 = 0, 'failed', 'active')),
      DATE_SUB(?, INTERVAL seq MOD 400 DAY), IF(seq MOD 41 = 0, 'fail', 'pass'), DATE_SUB(?, INTERVAL seq MOD 400 DAY),
      IF(seq MOD 97 = 0, NULL, DATE_ADD(DATE_SUB(?, INTERVAL seq MOD 400 DAY), INTERVAL 365 DAY)), IF(seq MOD 41 = 0, DATE_ADD(DATE_SUB(?, INTERVAL seq MOD 400 DAY), INTERVAL 14 DAY), NULL), NOW(3), NOW(3)
    FROM seq_1_to_${ASSEMBLIES}`, [programId, first, today, today, today, today, today]);
  const [{ firstAssembly }] = (await raw(d, "SELECT MIN(id) AS firstAssembly FROM assemblies WHERE program_id = ?", [programId])) as [{ firstAssembly: number }];
  console.log(`[bench:inspector] 100,000 sites and ${ASSEMBLIES.toLocaleString("en-US")} assemblies in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  // 1.5 million reports: ten years of one yearly test per assembly, the newest 2,000 waiting.
  const t1 = performance.now();
  const grade = JSON.stringify({ v: 1, outcome: "pass", passedAfterRepair: false, initial: { o: "pass", f: [["rp.relief.min", 1, 2.5, "≥ 2.0 psid"]] } });
  const snapshot = JSON.stringify({ kind: "RP", make: "Tallowmere", model: "TR-4", size: "1 in", serial: "SC", location: "meter vault", hazard: "low", siteName: "Scale site", address: "1 Thistlecombe Lane, Quillmere", accountNumber: "SC" });
  const testerSnapshot = JSON.stringify({ name: "Scale Tester", company: null, certifyingBody: "Board", certificationNumber: "BT-1", certificationExpiresOn: "2099-01-01" });
  for (let year = 0; year < REPORTS_PER_ASSEMBLY; year++) {
    await raw(d, `INSERT INTO test_reports (program_id, report_number, revision, assembly_id, tester_id, status, assembly_kind, tested_at, tested_on, reason, unit, rule_set_edition, assembly_snapshot, tester_snapshot, initial_outcome, final_outcome, was_repaired, grade, validity, signals, warning_count, is_clean, fingerprint, attested_name, attested_at, submitted_at, idempotency_key, verification_code, created_at, updated_at)
      SELECT ?, CONCAT(?, '-', ?, '-', seq), 1, ? + seq - 1, ?, IF(? = 0 AND seq <= ?, 'queued', 'accepted'), 'RP', DATE_SUB(?, INTERVAL (? * 365 + seq MOD 365) DAY), DATE_SUB(?, INTERVAL (? * 365 + seq MOD 365) DAY), 'annual', 'psid', 'published-current', ?, ?,
        IF(seq MOD 13 = 0, 'fail', 'pass'), IF(seq MOD 41 = 0, 'fail', 'pass'), 0, ?, '[]', '[]', 0, IF(seq MOD 41 = 0, 0, 1), 'v1|rp|2.5', 'Scale Tester', NOW(3),
        DATE_SUB(NOW(3), INTERVAL (? * 365 + seq MOD 365) DAY), CONCAT('scale-', ?, '-', seq), CONCAT(?, 'v', seq), NOW(3), NOW(3)
      FROM seq_1_to_${ASSEMBLIES}`, [programId, `S${stamp.slice(-4)}`, year, firstAssembly, tester!.id, year, QUEUED, today, year, today, year, snapshot, testerSnapshot, grade, year, `${stamp}-${year}`, `${stamp}${year}`]);
  }
  console.log(`[bench:inspector] ${(ASSEMBLIES * REPORTS_PER_ASSEMBLY).toLocaleString("en-US")} reports in ${((performance.now() - t1) / 1000).toFixed(1)} s`);
  await raw(d, "ANALYZE TABLE test_reports, assemblies, sites");
  return { programId, testerId: tester!.id, today, actor: { id: user!.id, role: "inspector", name: "Scale Inspector", email: `scale-${stamp}@scale.example`, programId, companyId: null, isBillingManager: false } };
}

async function explain(d: Deps, label: string, sqlText: string, params: unknown[]): Promise<void> {
  const plan = await raw(d, `EXPLAIN ${sqlText}`, params);
  const ms = await median(() => raw(d, sqlText, params));
  const text = (value: unknown) => (typeof value === "string" || typeof value === "number" ? String(value) : "");
  const steps = plan.map((p) => `${text(p.table)}: ${text(p.type)} on ${text(p.key) || "no index"} (~${text(p.rows)} rows${p.Extra ? `; ${text(p.Extra)}` : ""})`).join(" | ");
  console.log(`[bench:inspector] ${label}: ${ms.toFixed(1)} ms — ${steps}`);
}

async function remove(d: Deps, programId: number, testerId: number): Promise<void> {
  const t = performance.now();
  for (const table of ["test_reports", "assemblies", "sites", "audit_log", "program_settings"]) {
    for (;;) {
      const [result] = (await d.getPool().query(`DELETE FROM ${table} WHERE program_id = ? LIMIT 50000`, [programId])) as unknown as [{ affectedRows: number }];
      if (result.affectedRows === 0) break;
    }
  }
  await raw(d, "DELETE FROM users WHERE program_id = ? OR id = ?", [programId, testerId]);
  await raw(d, "DELETE FROM programs WHERE id = ?", [programId]);
  console.log(`[bench:inspector] scratch program removed in ${((performance.now() - t) / 1000).toFixed(1)} s`);
}

async function main() {
  const d = await load();
  const { programId, testerId, actor, today } = await build(d);
  try {
    const p = programId;
    const dueSoon = d.settings.todayInZone("Etc/GMT+6");
    await explain(d, "queue page (oldest first, 25 rows)", "SELECT r.id FROM test_reports r JOIN assemblies a ON a.id = r.assembly_id WHERE r.program_id = ? AND r.status = 'queued' ORDER BY r.submitted_at, r.id LIMIT 26", [p]);
    await explain(d, "queue, next page by cursor", "SELECT r.id FROM test_reports r JOIN assemblies a ON a.id = r.assembly_id WHERE r.program_id = ? AND r.status = 'queued' AND (r.submitted_at > NOW(3) - INTERVAL 400 DAY OR (r.submitted_at = NOW(3) - INTERVAL 400 DAY AND r.id > 0)) ORDER BY r.submitted_at, r.id LIMIT 26", [p]);
    await explain(d, "queue count", "SELECT COUNT(*) FROM test_reports WHERE program_id = ? AND status = 'queued'", [p]);
    await explain(d, "compliance: overdue count", "SELECT COUNT(*) FROM assemblies WHERE program_id = ? AND base_state = 'active' AND next_due_on < ?", [p, today]);
    await explain(d, "compliance: repair overdue count", "SELECT COUNT(*) FROM assemblies WHERE program_id = ? AND base_state = 'failed' AND repair_due_on < ?", [p, today]);
    await explain(d, "compliance: due soon count", "SELECT COUNT(*) FROM assemblies WHERE program_id = ? AND base_state = 'active' AND next_due_on BETWEEN ? AND DATE_ADD(?, INTERVAL 30 DAY)", [p, dueSoon, dueSoon]);
    await explain(d, "overdue list page", "SELECT a.id FROM assemblies a JOIN sites s ON s.id = a.site_id WHERE a.program_id = ? AND a.base_state = 'active' AND a.next_due_on < ? ORDER BY a.next_due_on, a.id LIMIT 51", [p, today]);
    await explain(d, "tests per month, 24 months", "SELECT DATE_FORMAT(tested_on, '%Y-%m') m, COUNT(*), SUM(final_outcome = 'pass' AND status <> 'returned'), SUM(initial_outcome = 'fail') FROM test_reports WHERE program_id = ? AND tested_on >= DATE_SUB(?, INTERVAL 24 MONTH) AND tested_on <= ? AND status <> 'superseded' GROUP BY m", [p, today, today]);

    const queueMs = await median(() => d.queue.listReviewQueue(actor, { sort: "oldest", limit: 25 }));
    const filteredMs = await median(() => d.queue.listReviewQueue(actor, { sort: "oldest", limit: 25, kind: "DC", grade: "pass", flags: "clean" }));
    const countsMs = await median(() => d.compliance.getComplianceCounts(actor));
    const monthsMs = await median(() => d.compliance.getMonthlyTests(actor), 3);
    const listMs = await median(() => d.compliance.listOverdueAssemblies(actor, { list: "overdue" }));
    console.log(`[bench:inspector] data layer: queue page ${queueMs.toFixed(1)} ms, filtered queue page ${filteredMs.toFixed(1)} ms, compliance counts (7 states) ${countsMs.toFixed(1)} ms, tests per month ${monthsMs.toFixed(0)} ms, overdue list ${listMs.toFixed(1)} ms`);
    const year = Number(today.slice(0, 4)) - 1;
    const summaryStarted = performance.now();
    const summary = await d.summary.getYearlySummary(actor, year);
    console.log(`[bench:inspector] yearly summary ${year}: ${((performance.now() - summaryStarted) / 1000).toFixed(1)} s for ${summary.totals.inService.toLocaleString("en-US")} assemblies in service`);
    const recompute = await d.facts.recomputeProgramFacts(programId);
    console.log(`[bench:inspector] recomputing every assembly's facts: ${recompute.assemblies.toLocaleString("en-US")} assemblies in ${(recompute.milliseconds / 1000).toFixed(1)} s (${recompute.changed.toLocaleString("en-US")} changed)`);
  } finally {
    if (KEEP) console.log(`[bench:inspector] kept scratch program ${programId}`);
    else await remove(d, programId, testerId);
    await d.closeDb();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
