// POST /api/fees/reports/:id/refund: the program admin refunds a paid fee through the payments service.
import { z } from "zod";
import { feeReasonSchema, refundReportFee } from "@/lib/data/fees-admin";
import { apiRoute, parseOrThrow } from "@/lib/http/route";

export const runtime = "nodejs";

export const POST = apiRoute({ permission: "fees.manage", body: feeReasonSchema }, async ({ actor, params, body }) => {
  return refundReportFee(actor, parseOrThrow(z.coerce.number().int().positive(), params.id), body.reason);
});
