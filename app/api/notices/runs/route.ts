// GET /api/notices/runs: the program's latest notice runs; POST: the admin starts today's run (answers at once, the run continues in the background).
import { after } from "next/server";
import { z } from "zod";
import { listNoticeRuns, startNoticeRunFromButton } from "@/lib/data/notices-log";
import { apiRoute, jsonResponse } from "@/lib/http/route";

export const runtime = "nodejs";

export const GET = apiRoute({ permission: "notices.view" }, async ({ actor }) => ({ runs: await listNoticeRuns(actor) }));

export const POST = apiRoute({ permission: "notices.run", body: z.object({ confirm: z.literal(true, { error: "Confirm the run with confirm: true." }) }), maxBodyBytes: 1024 }, async ({ actor }) => {
  const run = await startNoticeRunFromButton(actor);
  after(() => run.execute());
  return jsonResponse({ ok: true, runId: run.runId }, { status: 202 });
});
