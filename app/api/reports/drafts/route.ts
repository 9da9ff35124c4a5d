// GET /api/reports/drafts[?assembly=…]: the signed-in tester's unfinished field tests saved on the server.
import { z } from "zod";
import { listDrafts } from "@/lib/data/drafts";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const GET = apiRoute({ permission: "reports.file" }, async ({ actor, searchParams }) => {
  const assemblyId = parseOrThrow(z.coerce.number().int().positive().optional(), searchParams.get("assembly") || undefined);
  return { drafts: await listDrafts(actor, { assemblyId }) };
});
