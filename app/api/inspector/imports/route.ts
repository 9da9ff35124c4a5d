// POST /api/inspector/imports: checks an uploaded inventory CSV against the mapping and starts importing it; GET: recent imports.
import { after } from "next/server";
import { listImportJobs, startImport, startImportSchema } from "@/lib/data/import-jobs";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const runtime = "nodejs";

export const POST = apiRoute({ permission: "inventory.import", body: startImportSchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body }) => {
  const started = await startImport(actor, body);
  // The answer goes back at once; the rows are written after it, and the page polls the job.
  after(started.run);
  return jsonResponse({ jobId: started.jobId, totalRows: started.totalRows, emptyLines: started.emptyLines }, { status: 202 });
});

export const GET = apiRoute({ permission: "inventory.import" }, async ({ actor }) => ({ jobs: await listImportJobs(actor) }));
