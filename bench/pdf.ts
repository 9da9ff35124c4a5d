// The report PDF: render time and memory of a full field-test report (a failed RP, repaired and
// retested: the longest report there is) vs a one-line @react-pdf document, measured in the
// same process, alternating, after a warm-up. The report is read from the database exactly as
// GET /api/reports/:id/pdf reads it; only the rendering is timed. Prints one JSON line when
// run with --json (for npm run bench), a short table otherwise.
//
//   DATABASE_URL=…/zoneward_scale bash scripts/with-db.sh bench/pdf.ts   (npm run bench runs it)
import { createElement } from "react";
import { median, round } from "./lib/stats";

const RUNS = Number(process.env.BENCH_PDF_RUNS ?? 30);
const gc = (globalThis as { gc?: () => void }).gc;

async function main() {
  const [{ Document, Page, Text }, { getDb, closeDb }, { sql }, { getReportDetail }, { getReportProgramContact }, { renderPdf }, { ReportDocument }] = await Promise.all([
    import("@react-pdf/renderer"),
    import("@/db/client"),
    import("drizzle-orm"),
    import("@/lib/data/report-detail"),
    import("@/lib/data/tester-report-pdf"),
    import("@/lib/pdf/render"),
    import("@/lib/pdf/report-document"),
  ]);
  try {
    const [rows] = (await getDb().execute(
      sql`SELECT r.id, r.program_id AS programId FROM test_reports r WHERE r.assembly_kind = 'RP' AND r.was_repaired = 1 ORDER BY r.id DESC LIMIT 1`,
    )) as unknown as [{ id: number; programId: number }[]];
    const picked = rows[0];
    if (!picked) throw new Error("no repaired RP report in this database: run npm run seed:scale first");
    const [staff] = (await getDb().execute(sql`SELECT id, name, email FROM users WHERE role = 'inspector' AND program_id = ${picked.programId} LIMIT 1`)) as unknown as [{ id: number; name: string; email: string }[]];
    const inspector = staff[0];
    if (!inspector) throw new Error("no inspector in this database");
    const actor = { id: inspector.id, role: "inspector" as const, name: inspector.name, email: inspector.email, programId: picked.programId, companyId: null, isBillingManager: false };
    const report = await getReportDetail(actor, picked.id);
    const program = await getReportProgramContact(report.programId);

    const fullReport = () => createElement(ReportDocument, { report, program, generatedOn: "2026-12-01" });
    const oneLine = () => createElement(Document, null, createElement(Page, { size: "LETTER" }, createElement(Text, null, "One line.")));

    // Two passes. Time: renders back to back, as a running server does them, with the collector
    // left to itself. Memory: a full collection before each render, so the heap growth is the
    // render's own. A render right after a forced full collection is about twice as slow (the
    // collector's marking runs alongside it), so the memory pass's times are printed beside the
    // figure but are not the figure.
    type Sample = { ms: number; heapMb: number; bytes: number };
    const render = async (build: () => ReturnType<typeof createElement>, collectFirst: boolean): Promise<Sample> => {
      if (collectFirst) gc?.();
      const before = process.memoryUsage();
      const start = performance.now();
      const bytes = await renderPdf(build() as Parameters<typeof renderPdf>[0]);
      const ms = performance.now() - start;
      const after = process.memoryUsage();
      return { ms, heapMb: (after.heapUsed - before.heapUsed + after.arrayBuffers - before.arrayBuffers) / 1024 / 1024, bytes: bytes.length };
    };
    const pass = async (collectFirst: boolean) => {
      const report_: Sample[] = [];
      const line: Sample[] = [];
      for (let i = 0; i < RUNS; i++) {
        report_.push(await render(fullReport, collectFirst));
        line.push(await render(oneLine, collectFirst));
      }
      return { report_, line };
    };
    for (let i = 0; i < 5; i++) {
      await render(fullReport, false);
      await render(oneLine, false);
    }
    const timed = await pass(false);
    const measured = await pass(true);
    gc?.();
    const result = {
      reportId: picked.id,
      runs: RUNS,
      reportMs: round(median(timed.report_.map((r) => r.ms))),
      oneLineMs: round(median(timed.line.map((r) => r.ms))),
      ratio: 0,
      reportMsAfterFullGc: round(median(measured.report_.map((r) => r.ms))),
      reportHeapMb: round(median(measured.report_.map((r) => r.heapMb)), 2),
      oneLineHeapMb: round(median(measured.line.map((r) => r.heapMb)), 2),
      reportBytes: timed.report_[0]!.bytes,
      oneLineBytes: timed.line[0]!.bytes,
      rssMbAfter: round(process.memoryUsage().rss / 1024 / 1024),
      gcExposed: Boolean(gc),
    };
    result.ratio = round(result.reportMs / Math.max(result.oneLineMs, 0.01), 2);
    if (process.argv.includes("--json")) console.log(`BENCH_RESULT ${JSON.stringify(result)}`);
    else {
      console.log(`| document | median render | heap during render | size |`);
      console.log(`|---|---|---|---|`);
      console.log(`| field-test report (repaired RP, ${report.reportNumber}) | ${result.reportMs} ms (${result.reportMsAfterFullGc} ms right after a full collection) | ${result.reportHeapMb} MB | ${Math.round(result.reportBytes / 1024)} kB |`);
      console.log(`| one-line document | ${result.oneLineMs} ms | ${result.oneLineHeapMb} MB | ${Math.round(result.oneLineBytes / 1024)} kB |`);
      console.log(`report ÷ one line: ×${result.ratio}; RSS after ${RUNS * 4} renders ${result.rssMbAfter} MB`);
    }
  } finally {
    await closeDb();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
