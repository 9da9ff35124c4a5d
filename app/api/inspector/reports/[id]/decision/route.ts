// POST /api/inspector/reports/:id/decision: accept or return one report (409 when someone else decided it first).
import { z } from "zod";
import { decideReport, decisionSchema } from "@/lib/data/review-decisions";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const POST = apiRoute({ permission: "reports.review", body: decisionSchema, maxBodyBytes: 16 * 1024 }, async ({ actor, body, params }) => {
  const id = parseOrThrow(z.coerce.number().int().positive("No such report."), params.id);
  return decideReport(actor, id, body);
});
