// POST /api/fees/reports/:id/waive: the program admin waives an owed fee with a reason; the report goes to review.
import { z } from "zod";
import { feeReasonSchema, waiveReportFee } from "@/lib/data/fees-admin";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const runtime = "nodejs";

export const POST = apiRoute({ permission: "fees.manage", body: feeReasonSchema }, async ({ actor, params, body }) => {
  return waiveReportFee(actor, parseOrThrow(z.coerce.number().int().positive(), params.id), body.reason);
});
