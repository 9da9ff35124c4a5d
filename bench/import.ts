/**
 * Benchmark of the inventory import: generates a 150,000-row CSV (100,000 invented sites with
 * their owners and assemblies), imports it into a scratch program through the same code the
 * import page uses, then imports it again (every row found unchanged). Prints the figures; the
 * target is under 60 s for the first run on this machine. Not a test: nothing here asserts.
 *
 *   DATA_DIR=.data DB_PORT=3307 bash scripts/with-db.sh bench/import.ts [--rows 150000] [--keep]
 */
import { performance } from "node:perf_hooks";
import type { Actor } from "@/lib/auth/permissions";


async function loadDataLayer() {
  const [drizzle, client, schema, attachmentsModule, fields, jobs] = await Promise.all([import("drizzle-orm"), import("@/db/client"), import("@/db/schema"), import("@/lib/data/attachments"), import("@/lib/data/import-fields"), import("@/lib/data/import-jobs")]);
  return { ...drizzle, ...client, ...schema, ...attachmentsModule, ...fields, ...jobs };
}
type DataLayer = Awaited<ReturnType<typeof loadDataLayer>>;
let d: DataLayer;

const args = process.argv.slice(2);
const ROWS = Number(args[args.indexOf("--rows") + 1]) || 150_000;
const KEEP = args.includes("--keep");

const streets = ["Thistlecombe Lane", "Bramblecote Road", "Quillmere Avenue", "Tansy Court", "Heronsgate Way", "Mallowbank Street", "Copperbeech Drive", "Saltmarsh Row"];
const makers = [
  { make: "Tallowmere", models: { RP: "TR-4", DC: "TD-2", PVB: "TV-1" } },
  { make: "Corvane", models: { RP: "CV-24", DC: "CV-12", PVB: "CV-7" } },
  { make: "Brindlewick", models: { RP: "BW-900", DC: "BW-500", PVB: "BW-100" } },
] as const;
const kinds = ["RP", "DC", "PVB"] as const;

function generateCsv(rows: number): string {
  const lines = ["Account,Site name,Service address,City,Hazard,Facility type,Owner,Owner email,Type,Manufacturer,Model,Size,Serial number,Location,Installed"];
  let site = 0;
  for (let i = 0; i < rows; i++) {
    // Two assemblies on every second site: 150,000 rows → 100,000 sites.
    if (i % 3 !== 2) site++;
    const kind = kinds[i % 3]!;
    const maker = makers[i % makers.length]!;
    const hazard = site % 2 === 0 ? "high" : "low";
    const year = 2010 + (i % 15);
    lines.push(
      [
        `BX${String(site).padStart(7, "0")}`,
        `Bench site ${site}`,
        `${(site % 900) + 10} ${streets[site % streets.length]}`,
        "Quillmere",
        hazard,
        kind === "PVB" ? "Lawn irrigation" : "Office building",
        `Owner ${site}`,
        `owner${site}@bench-owners.example`,
        kind,
        maker.make,
        maker.models[kind],
        kind === "RP" ? "1 in" : "3/4 in",
        `BX${String(i).padStart(8, "0")}`,
        kind === "PVB" ? "irrigation box by the drive" : "meter vault at the street",
        `${year}-0${(i % 9) + 1}-1${i % 10}`,
      ].join(","),
    );
  }
  return `${lines.join("\n")}\n`;
}

async function createScratchProgram(): Promise<{ programId: number; actor: Actor }> {
  const db = d.getDb();
  const stamp = Date.now().toString(36);
  const now = new Date();
  const [program] = await db
    .insert(d.programs)
    .values({ slug: `bench-${stamp}`, name: `Bench Import District ${stamp}`, shortName: "Bench", reportPrefix: `B${stamp.slice(-4).toUpperCase()}`, timezone: "Etc/GMT+6", contactEmail: "bench@bench.example", replyToEmail: "bench@bench.example", createdAt: now })
    .$returningId();
  const programId = program!.id;
  await db.insert(d.programSettings).values({ programId, ruleSetEdition: "published-current", updatedAt: now });
  const email = `bench-${stamp}@bench.example`;
  const [user] = await db.insert(d.users).values({ email, name: "Bench Inspector", role: "inspector", programId, status: "active", createdAt: now, updatedAt: now }).$returningId();
  return { programId, actor: { id: user!.id, role: "inspector", name: "Bench Inspector", email, programId, companyId: null, isBillingManager: false } };
}

async function importOnce(actor: Actor, bytes: Uint8Array, header: string[]): Promise<{ seconds: number; job: Awaited<ReturnType<DataLayer["getImportJob"]>> }> {
  const file = await d.saveUpload(actor, { purpose: "inventory_import", fileName: "bench-inventory.csv", bytes, maxBytes: 60 * 1024 * 1024 });
  const started = performance.now();
  const job = await d.startImport(actor, { fileId: file.id, mapping: d.guessMapping(header) });
  await job.run();
  const seconds = (performance.now() - started) / 1000;
  return { seconds, job: await d.getImportJob(actor, job.jobId) };
}

async function removeScratchProgram(programId: number, userId: number): Promise<void> {
  const db = d.getDb();
  const siteIds = (await db.select({ id: d.sites.id }).from(d.sites).where(d.eq(d.sites.programId, programId))).map((s) => s.id);
  for (let i = 0; i < siteIds.length; i += 5000) await db.delete(d.siteOwners).where(d.inArray(d.siteOwners.siteId, siteIds.slice(i, i + 5000)));
  await db.delete(d.assemblies).where(d.eq(d.assemblies.programId, programId));
  await db.delete(d.owners).where(d.eq(d.owners.programId, programId));
  await db.delete(d.sites).where(d.eq(d.sites.programId, programId));
  await db.delete(d.auditLog).where(d.eq(d.auditLog.programId, programId));
  const files = await db.select({ fileId: d.importJobs.fileId, errorFileId: d.importJobs.errorFileId }).from(d.importJobs).where(d.eq(d.importJobs.programId, programId));
  await db.delete(d.importJobs).where(d.eq(d.importJobs.programId, programId));
  const fileIds = files.flatMap((f) => [f.fileId, f.errorFileId]).filter((id): id is number => id !== null);
  if (fileIds.length) await db.delete(d.attachments).where(d.inArray(d.attachments.id, fileIds));
  await db.delete(d.attachments).where(d.eq(d.attachments.uploadedBy, userId));
  await db.delete(d.users).where(d.eq(d.users.id, userId));
  await db.delete(d.programSettings).where(d.eq(d.programSettings.programId, programId));
  await db.delete(d.programs).where(d.eq(d.programs.id, programId));
}

async function main() {
  d = await loadDataLayer();
  const generated = performance.now();
  const csv = generateCsv(ROWS);
  const bytes = new TextEncoder().encode(csv);
  console.log(`[bench:import] generated ${ROWS.toLocaleString("en-US")} rows, ${(bytes.length / 1024 / 1024).toFixed(1)} MB, in ${((performance.now() - generated) / 1000).toFixed(1)} s`);
  const { programId, actor } = await createScratchProgram();
  const header = csv.slice(0, csv.indexOf("\n")).split(",");
  try {
    const first = await importOnce(actor, bytes, header);
    console.log(`[bench:import] first import:  ${first.seconds.toFixed(1)} s — ${first.job.insertedRows} new, ${first.job.updatedRows} updated, ${first.job.unchangedRows} unchanged, ${first.job.failedRows} failed (target < 60 s: ${first.seconds < 60 ? "met" : "NOT met"})`);
    const [counts] = (await d.getDb().execute(d.sql`SELECT (SELECT COUNT(*) FROM sites WHERE program_id = ${programId}) AS sites, (SELECT COUNT(*) FROM assemblies WHERE program_id = ${programId}) AS assemblies, (SELECT COUNT(*) FROM owners WHERE program_id = ${programId}) AS owners`)) as unknown as [{ sites: number; assemblies: number; owners: number }[]];
    console.log(`[bench:import] in the database: ${counts[0]?.sites} sites, ${counts[0]?.assemblies} assemblies, ${counts[0]?.owners} owners`);
    const second = await importOnce(actor, bytes, header);
    console.log(`[bench:import] same file again: ${second.seconds.toFixed(1)} s — ${second.job.insertedRows} new, ${second.job.updatedRows} updated, ${second.job.unchangedRows} unchanged (no duplicates expected)`);
    console.log(`BENCH_RESULT ${JSON.stringify({ rows: ROWS, firstSeconds: first.seconds, inserted: first.job.insertedRows, failed: first.job.failedRows, againSeconds: second.seconds, againInserted: second.job.insertedRows, sites: Number(counts[0]?.sites), assemblies: Number(counts[0]?.assemblies) })}`);
  } finally {
    if (KEEP) console.log(`[bench:import] kept scratch program ${programId}`);
    else await removeScratchProgram(programId, actor.id);
    await d.closeDb();
  }
}

main().catch(async (error: unknown) => {
  console.error(error);
  await d?.closeDb();
  process.exit(1);
});
